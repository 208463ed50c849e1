/**
 * ISO 11783-10 task data in the fuzz corpus: tilth's own TASKDATA (treatment zone polygons, and a type-2 grid
 * with its GRDnnnnn.bin files), written from the demo quarter by the same code `tilth build` runs, then damaged
 * and read the way `tilth check` reads it (a TASKDATA folder, or a zip holding one) and checked.
 */
import { createHash } from 'node:crypto';
import { existsSync, mkdirSync, readdirSync, readFileSync, renameSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { zipSync } from 'fflate';
import { defaultTables, parsePlan } from '../../src/agronomy/index.js';
import { checkPrescription, readLayer } from '../../src/check/index.js';
import { layersFromTaskDataFiles } from '../../src/check/taskdata.js';
import { loadInputs } from '../../src/cli/inputs.js';
import { buildPrescription } from '../../src/prescription/index.js';
import { prescriptionTaskDataFiles } from '../../src/prescription/taskdata.js';
import { many, mutateBytes, mutateText, NASTY_NUMBERS, NASTY_STRINGS } from './mutate.js';
import type { Rng } from './rng.js';
import type { RunResult } from './targets.js';

const ROOT = join(import.meta.dirname, '..', '..');
const Q = join(ROOT, 'sample-fields', 'quarter');
/** The code that writes task data: the corpus is made again whenever it changes. */
const WRITERS = ['src/io/isoxml/write.ts', 'src/io/isoxml/grid.ts', 'src/prescription/taskdata.ts'];

function corpusDir(): string {
  const h = createHash('sha256');
  for (const f of WRITERS) h.update(readFileSync(join(ROOT, f)));
  return join(tmpdir(), `tilth-fuzz-taskdata-${h.digest('hex').slice(0, 10)}`);
}

/**
 * Writes the corpus once per version of the writers (the demo quarter built in process, zones and grid task data);
 * run.ts calls it before the runs, outside the hang bound.
 */
export async function ensureTaskData(): Promise<void> {
  const dir = corpusDir();
  if (existsSync(dir)) return;
  const tables = defaultTables();
  const plan = parsePlan(readFileSync(join(Q, 'plan.yaml'), 'utf8'), 'plan.yaml', tables);
  const inputs = await loadInputs({
    samples: join(Q, 'samples.csv'),
    boundary: join(Q, 'boundary.geojson'),
  });
  const rx = buildPrescription(inputs, plan, tables, { cell: 10 });
  const tmp = `${dir}.${process.pid}`;
  for (const [kind, opts] of [
    ['zones', {}],
    ['grid', { grid: true, gridCellM: 20 }],
  ] as const) {
    mkdirSync(join(tmp, kind), { recursive: true });
    for (const [name, bytes] of Object.entries(prescriptionTaskDataFiles(rx, tables, opts)))
      writeFileSync(join(tmp, kind, name), bytes);
  }
  try {
    renameSync(tmp, dir);
  } catch {
    rmSync(tmp, { recursive: true, force: true }); // another fuzz run made it first
  }
}

const cache = new Map<string, Record<string, Uint8Array>>();
function corpus(kind: 'zones' | 'grid'): Record<string, Uint8Array> {
  let files = cache.get(kind);
  if (!files) {
    const d = join(corpusDir(), kind);
    files = Object.fromEntries(readdirSync(d).map((n) => [n, new Uint8Array(readFileSync(join(d, n)))]));
    cache.set(kind, files);
  }
  return files;
}

/** Attribute values, elements and lines of XML: an attribute replaced by a hostile value, an element cut or doubled. */
export function mutateXml(r: Rng, xml: string): string {
  const op = r.int(5);
  if (op === 0 || op === 1) {
    const attrs = [...xml.matchAll(/ ([A-Za-z]+)="([^"]*)"/g)];
    if (!attrs.length) return mutateText(r, xml);
    const m = r.pick(attrs);
    const v = op === 0 ? r.pick(NASTY_NUMBERS) : r.pick(NASTY_STRINGS).replace(/"/g, '&quot;');
    const start = m.index! + m[0].indexOf('"') + 1;
    return xml.slice(0, start) + v + xml.slice(start + m[2]!.length);
  }
  if (op === 2) {
    // an element (one line, or a block from its opening to its closing tag) deleted or doubled
    const lines = xml.split('\n');
    const i = r.int(lines.length);
    const tag = /^\s*<([A-Z]{3})[ >]/.exec(lines[i]!)?.[1];
    let j = i;
    if (tag && !lines[i]!.trimEnd().endsWith('/>'))
      while (j < lines.length - 1 && !lines[j]!.includes(`</${tag}>`)) j++;
    const block = lines.slice(i, j + 1);
    lines.splice(i, j + 1 - i, ...(r.chance(0.5) ? [] : [...block, ...block]));
    return lines.join('\n');
  }
  return mutateText(r, xml);
}

/** How the damaged set reaches the reader: the folder's files, or a zip of them (itself damaged sometimes). */
function damaged(
  r: Rng,
  kind: 'zones' | 'grid',
): { files: Record<string, Uint8Array>; main: string; cut: boolean } {
  const files = { ...corpus(kind) };
  const bins = Object.keys(files).filter((n) => /\.bin$/i.test(n));
  let cut = false;
  if (bins.length && r.chance(0.35)) {
    const b = r.pick(bins);
    const before = files[b]!.length;
    files[b] = many(r, files[b]!, mutateBytes);
    cut = files[b]!.length !== before;
  } else {
    const x = new TextDecoder().decode(files['TASKDATA.XML']);
    files['TASKDATA.XML'] = new TextEncoder().encode(
      r.chance(0.85)
        ? many(r, x, mutateXml)
        : new TextDecoder().decode(many(r, files['TASKDATA.XML']!, mutateBytes)),
    );
  }
  if (r.chance(0.7)) return { files, main: 'TASKDATA.XML', cut };
  const entries = Object.fromEntries(Object.entries(files).map(([k, v]) => [`TASKDATA/${k}`, v]));
  // a damaged zip may garble the XML too: only a cut grid beside an intact XML must be refused
  if (r.chance(0.3))
    return {
      files: { 'taskdata.zip': many(r, zipSync(entries), mutateBytes) },
      main: 'taskdata.zip',
      cut: false,
    };
  return { files: { 'taskdata.zip': zipSync(entries) }, main: 'taskdata.zip', cut };
}

/**
 * One run: damaged task data read as `tilth check` reads it, every layer checked (sometimes against the boundary,
 * with machine limits). A grid file whose length was changed while its XML was not must be refused: a cut grid
 * would otherwise put rates on the wrong cells.
 */
export async function taskDataRun(r: Rng): Promise<RunResult> {
  const kind = r.pick(['zones', 'grid'] as const);
  const { files, main, cut } = damaged(r, kind);
  const layers = layersFromTaskDataFiles(files, main);
  const boundary = r.chance(0.5)
    ? await readLayer({ 'b.geojson': readFileSync(join(Q, 'boundary.geojson')) }, 'b.geojson')
    : undefined;
  const ok = layers
    .map((layer) =>
      checkPrescription(layer, {
        boundary,
        min: r.chance(0.3) ? 10 : undefined,
        max: r.chance(0.3) ? 300 : undefined,
        speedKmh: r.chance(0.3) ? 12 : undefined,
      }),
    )
    .every((c) => c.ok);
  const res: RunResult = { outcome: ok ? 'accepted' : 'failed' };
  return cut ? { ...res, mustRefuse: 'a grid file cut or lengthened' } : res;
}
