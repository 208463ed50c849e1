/**
 * Seeded benchmark of the variability stage: semivariogram (all pairs) + three model fits.
 * Run: npx tsx scripts/bench-variability.ts   (figures go in docs/variability.md)
 */
import { semivariogram, fitModels } from '../src/variability/index.js';

function lcg(seed: number) {
  let s = seed;
  return () => (s = (s * 16807) % 2147483647) / 2147483647;
}

for (const n of [60, 250, 1000, 4000]) {
  const rnd = lcg(42);
  const xy = new Float64Array(2 * n);
  const z = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    xy[2 * i] = rnd() * 800;
    xy[2 * i + 1] = rnd() * 800;
    z[i] = 20 + 10 * Math.sin(xy[2 * i] / 150) + 5 * rnd();
  }
  const reps = n <= 250 ? 50 : n <= 1000 ? 10 : 3;
  semivariogram(xy, z); // warm up
  let t0 = performance.now();
  let v = semivariogram(xy, z);
  for (let r = 1; r < reps; r++) v = semivariogram(xy, z);
  const tv = (performance.now() - t0) / reps;
  t0 = performance.now();
  for (let r = 0; r < reps; r++) fitModels(v);
  const tf = (performance.now() - t0) / reps;
  console.log(`n=${n}: semivariogram ${tv.toFixed(2)} ms, three fits ${tf.toFixed(2)} ms`);
}
