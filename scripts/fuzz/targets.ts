/**
 * What the fuzzer runs: every reader and command stage, in process, on mutated copies of the demo inputs and
 * of test fixtures. A target returns how the run ended; a thrown error that is not a UserError is a crash.
 */
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { unzipSync, zipSync } from 'fflate';
import { defaultTables, decide, parsePlan, parseSoilSpec } from '../../src/agronomy/index.js';
import { checkPrescription, readLayer } from '../../src/check/index.js';
import { loadInputs } from '../../src/cli/inputs.js';
import { inspectInputs } from '../../src/stats/inspect.js';
import { fieldGrid, nutrientSurface } from '../../src/surface/index.js';
import { many, mutateBytes, mutateJson, mutateText } from './mutate.js';
import { rng, type Rng } from './rng.js';
import { taskDataRun } from './taskdata.js';

const ROOT = join(import.meta.dirname, '..', '..');
const Q = join(ROOT, 'sample-fields', 'quarter');
const SHP = join(ROOT, 'tests', 'fixtures', 'shp');
const CHK = join(ROOT, 'tests', 'fixtures', 'check');
const CASES = join(ROOT, 'tests', 'check', 'fixtures');
const XLSX = ['29-xlsx-typed-cells.xlsx', '30-xlsx-second-sheet.xlsx', '31-xlsx-units-row-cm.xlsx'];
const read = (p: string) => readFileSync(p);
const text = (p: string) => readFileSync(p, 'utf8');

/** How a run ended: accepted (result produced), refused (UserError), failed (a check reported failure). */
export type Outcome = 'accepted' | 'refused' | 'failed';
/** A run's result; `mustRefuse` marks an input that is known to be unusable (accepting it is a defect). */
export interface RunResult {
  outcome: Outcome;
  mustRefuse?: string;
}
export interface Target {
  name: string;
  weight: number;
  run(r: Rng, dir: string): Promise<RunResult>;
}

/** After inputs load: inspect always, a coarse surface sometimes (the stages that allocate per cell). */
async function afterLoad(r: Rng, samples: string, boundary: string): Promise<RunResult> {
  const inp = await loadInputs({ samples, boundary });
  inspectInputs(inp);
  if (r.chance(0.2)) {
    const grid = fieldGrid(inp.field, r.pick([10, 20, 40]));
    nutrientSurface(inp.samples, r.pick(['p', 'k', 'no3_n', 'so4_s'] as const), grid, inp.zones);
  }
  return { outcome: 'accepted' };
}

/** A boundary whose one coordinate is made unusable: must be refused. */
function brokenBoundary(r: Rng): string {
  const doc = JSON.parse(text(join(Q, 'boundary.geojson')));
  const g = doc.features?.[0]?.geometry ?? doc.geometry ?? doc;
  const ring = (g.type === 'Polygon' ? g.coordinates : g.coordinates[0])[0];
  ring[r.int(ring.length)][r.int(2)] = r.pick(['NaN', 'x', null, '1e999']);
  return JSON.stringify(doc)
    .replace(/"NaN"/g, 'NaN')
    .replace(/"1e999"/g, '1e999');
}

/** A target that damages the quarter's samples `file` with `mutate` and loads it with the quarter's boundary. */
function samplesTarget(
  name: string,
  weight: number,
  file: string,
  mutate: (r: Rng, text: string) => string,
): Target {
  return {
    name,
    weight,
    async run(r, dir) {
      const p = join(dir, file);
      writeFileSync(p, many(r, text(join(Q, file)), mutate));
      return afterLoad(r, p, join(Q, 'boundary.geojson'));
    },
  };
}

export const TARGETS: Target[] = [
  samplesTarget('csv-samples', 4, 'samples.csv', mutateText),
  samplesTarget('geojson-samples', 3, 'samples.geojson', mutateJson),
  {
    name: 'geojson-boundary',
    weight: 3,
    async run(r, dir) {
      const p = join(dir, 'boundary.geojson');
      const must = r.chance(0.15);
      writeFileSync(p, must ? brokenBoundary(r) : many(r, text(join(Q, 'boundary.geojson')), mutateJson));
      const res = await afterLoad(r, join(Q, 'samples.csv'), p);
      return must ? { ...res, mustRefuse: 'a boundary coordinate that is not a finite number' } : res;
    },
  },
  {
    name: 'shapefile-samples',
    weight: 3,
    async run(r, dir) {
      return shapefileRun(r, dir, 'samples');
    },
  },
  {
    name: 'shapefile-boundary',
    weight: 3,
    async run(r, dir) {
      return shapefileRun(r, dir, 'boundary');
    },
  },
  {
    name: 'zip-samples',
    weight: 2,
    async run(r, dir) {
      const p = join(dir, 'samples.zip');
      writeFileSync(p, many(r, new Uint8Array(read(join(SHP, 'samples.zip'))), mutateBytes));
      return afterLoad(r, p, join(Q, 'boundary.geojson'));
    },
  },
  {
    name: 'zip-bomb',
    weight: 0.3,
    async run(r, dir) {
      const p = join(dir, r.chance(0.5) ? 'samples.zip' : 'boundary.zip');
      writeFileSync(p, bomb(r));
      const isSamples = p.endsWith('samples.zip');
      const res = await afterLoad(
        r,
        isSamples ? p : join(Q, 'samples.csv'),
        isSamples ? join(Q, 'boundary.geojson') : p,
      );
      return { ...res, mustRefuse: 'a zip that unpacks to far more than any input' };
    },
  },
  {
    name: 'xlsx-samples',
    weight: 2,
    async run(r, dir) {
      // unpack the workbook, damage one part (the sheet's XML as text, or any part's bytes), pack it again
      const parts = unzipSync(new Uint8Array(read(join(ROOT, 'tests', 'fixtures', 'labs', r.pick(XLSX)))));
      const names = Object.keys(parts);
      const k = r.chance(0.6)
        ? (names.find((n) => /sheet1\.xml$|sharedStrings/.test(n)) ?? r.pick(names))
        : r.pick(names);
      parts[k] = <Uint8Array<ArrayBuffer>>(
        (r.chance(0.7)
          ? new TextEncoder().encode(many(r, new TextDecoder().decode(parts[k]), mutateText))
          : many(r, parts[k]!, mutateBytes))
      );
      const p = join(dir, 'samples.xlsx');
      writeFileSync(p, r.chance(0.1) ? many(r, zipSync(parts), mutateBytes) : zipSync(parts));
      return afterLoad(r, p, join(Q, 'boundary.geojson'));
    },
  },
  {
    name: 'check-geojson',
    weight: 3,
    async run(r, dir) {
      const [name, path] = r.pick([
        ['good.geojson', join(CHK, 'good.geojson')],
        ['gap.geojson', join(CASES, 'boundary', 'in', 'fail-gap.geojson')],
        ['overlap.geojson', join(CASES, 'overlap', 'in', 'fail-overlap.geojson')],
        ['outside.geojson', join(CASES, 'boundary', 'in', 'fail-outside.geojson')],
      ]);
      const bytes = new TextEncoder().encode(many(r, text(path), mutateJson));
      const layer = await readLayer({ [name]: bytes }, name);
      const boundary = r.chance(0.5)
        ? await readLayer({ 'b.geojson': read(join(CHK, 'boundary.geojson')) }, 'b.geojson')
        : undefined;
      return {
        outcome: checkPrescription(layer, {
          boundary,
          min: r.chance(0.3) ? 10 : undefined,
          max: r.chance(0.3) ? 300 : undefined,
          speedKmh: r.chance(0.3) ? 12 : undefined,
        }).ok
          ? 'accepted'
          : 'failed',
      };
    },
  },
  {
    name: 'check-shapefile',
    weight: 3,
    async run(r, dir) {
      const files: Record<string, Uint8Array> = {};
      for (const e of ['shp', 'shx', 'dbf', 'prj'])
        files[`b.${e}`] = new Uint8Array(read(join(SHP, `boundary.${e}`)));
      const k = `b.${r.pick(['shp', 'shx', 'dbf', 'dbf', 'prj'])}`;
      files[k] = many(r, files[k]!, mutateBytes);
      const layer = await readLayer(files, 'b.shp');
      return { outcome: checkPrescription(layer).ok ? 'accepted' : 'failed' };
    },
  },
  {
    name: 'check-zip',
    weight: 1,
    async run(r) {
      const files: Record<string, Uint8Array> = {};
      for (const e of ['shp', 'shx', 'dbf', 'prj'])
        files[`b.${e}`] = new Uint8Array(read(join(SHP, `boundary.${e}`)));
      const z = many(r, zipSync(files), mutateBytes);
      const layer = await readLayer({ 'b.zip': z }, 'b.zip');
      return { outcome: checkPrescription(layer).ok ? 'accepted' : 'failed' };
    },
  },
  {
    name: 'check-taskdata',
    weight: 3,
    async run(r) {
      return taskDataRun(r);
    },
  },
  {
    name: 'plan-yaml',
    weight: 3,
    async run(r) {
      const tables = defaultTables();
      const plan = parsePlan(many(r, text(join(Q, 'plan.yaml')), mutateText), 'plan.yaml', tables);
      decide(parseSoilSpec('no3=25,p=8,k=140,s=12,om=4,ph=7'), plan, tables);
      return { outcome: 'accepted' };
    },
  },
  {
    name: 'soil-spec',
    weight: 2,
    async run(r) {
      const tables = defaultTables();
      const plan = parsePlan(text(join(Q, 'plan.yaml')), 'plan.yaml', tables);
      decide(
        parseSoilSpec(many(r, 'no3=25,p=8,k=140,s=12,om=4,ph=7,texture=medium', mutateText)),
        plan,
        tables,
      );
      return { outcome: 'accepted' };
    },
  },
];

async function shapefileRun(r: Rng, dir: string, which: 'samples' | 'boundary'): Promise<RunResult> {
  const d = join(dir, 'shp');
  mkdirSync(d, { recursive: true });
  const exts = ['shp', 'shx', 'dbf', 'prj'];
  const victim = r.pick(['shp', 'shx', 'dbf', 'dbf', 'prj']);
  for (const e of exts) {
    const b = new Uint8Array(read(join(SHP, `${which}.${e}`)));
    writeFileSync(join(d, `${which}.${e}`), e === victim ? many(r, b, mutateBytes) : b);
  }
  const p = join(d, `${which}.shp`);
  return which === 'samples'
    ? afterLoad(r, p, join(Q, 'boundary.geojson'))
    : afterLoad(r, join(Q, 'samples.csv'), p);
}

const BOMB = join(tmpdir(), 'tilth-fuzz-bomb-300m.zip');
let bombCache: Uint8Array | undefined;

/** Makes the zip bomb once (300 MiB of zeros, about 300 KiB packed) and keeps it on disk; run.ts calls it before the runs, outside the hang bound. */
export function ensureBomb(): void {
  if (!existsSync(BOMB))
    writeFileSync(BOMB, zipSync({ 'samples.shp': new Uint8Array(300 * 1024 * 1024) }, { level: 1 }));
}

/** The zip bomb; half the time its headers lie about the size. */
function bomb(r: Rng): Uint8Array {
  bombCache ??= new Uint8Array(readFileSync(BOMB));
  return r.chance(0.5) ? lyingSizes(bombCache.slice()) : bombCache;
}

/** Sets the unpacked size in the local and central headers to 100 bytes. */
export function lyingSizes(z: Uint8Array): Uint8Array {
  const dv = new DataView(z.buffer, z.byteOffset, z.byteLength);
  dv.setUint32(22, 100, true); // the first local header is at 0
  for (let i = z.length - 22; i >= 0; i--) {
    if (dv.getUint32(i, true) !== 0x06054b50) continue; // end of central directory
    const cd = dv.getUint32(i + 16, true);
    if (dv.getUint32(cd, true) === 0x02014b50) dv.setUint32(cd + 24, 100, true);
    break;
  }
  return z;
}

/** Chooses the target of a seed by weight, from the seed alone (so a seed always reruns the same case). */
export function targetOf(seed: number, only?: string[]): Target {
  const list = only?.length ? TARGETS.filter((t) => only.includes(t.name)) : TARGETS;
  const r = rng(seed ^ 0x5bd1e995);
  let x = r.next() * list.reduce((s, t) => s + t.weight, 0);
  for (const t of list) if ((x -= t.weight) < 0) return t;
  return list[list.length - 1]!;
}
