/**
 * Seeded benchmark of the input stage: ring-crossing check vs @turf/kinks on large boundaries, and
 * loading the demo quarter (CSV) through readInputs and prepareInputs. Run: npx tsx scripts/bench-inputs.ts
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { kinks, polygon } from '@turf/turf';
import { findCrossing } from '../src/validate/crossings.js';
import { prepareInputs } from '../src/validate/inputs.js';
import { readInputs } from '../src/io/inputs.js';

function ring(n: number, seed: number): number[][] {
  let a = seed;
  const rnd = () => (a = (a * 1664525 + 1013904223) >>> 0) / 4294967296;
  const pts: number[][] = [];
  for (let i = 0; i < n; i++) {
    const t = (2 * Math.PI * i) / n;
    const r = 800 * (1 + 0.02 * rnd());
    pts.push([500000 + r * Math.cos(t), 5800000 + r * Math.sin(t)]);
  }
  pts.push(pts[0]);
  return pts;
}
function time(f: () => unknown, reps: number): number {
  const t0 = performance.now();
  for (let i = 0; i < reps; i++) f();
  return (performance.now() - t0) / reps;
}
for (const n of [1000, 10000]) {
  const r = ring(n, 42);
  const flat = new Float64Array(r.flat());
  const ours = time(() => findCrossing([flat]), 5);
  const turf = n <= 10000 ? time(() => kinks(polygon([r])), 1) : NaN;
  console.log(
    `boundary of ${n} vertices: findCrossing ${ours.toFixed(1)} ms, @turf/kinks ${turf.toFixed(1)} ms`,
  );
}
const root = join(import.meta.dirname, '..');
const f = (p: string) => ({ name: p, bytes: readFileSync(join(root, p)) });
const s = f('sample-fields/quarter/samples.csv'),
  b = f('sample-fields/quarter/boundary.geojson');
const load = async () => prepareInputs(await readInputs({ samples: s, boundary: b }));
await load();
const t0 = performance.now();
for (let i = 0; i < 50; i++) await load();
console.log(
  `readInputs + prepareInputs, demo quarter (62 samples, CSV): ${((performance.now() - t0) / 50).toFixed(2)} ms`,
);
