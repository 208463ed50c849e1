/** `tilth check FILE`: will this prescription load and apply as meant? (see src/check) */
import type { Command } from 'commander';
import { readdirSync, statSync } from 'node:fs';
import { basename, dirname, join } from 'node:path';
import {
  checkPrescription,
  readLayer,
  DEFAULT_TRANSITION_S,
  type CheckLayer,
  type CheckReport,
} from '../check/index.js';
import { isTaskDataXml, layersFromTaskDataFiles } from '../check/taskdata.js';
import { readZip, TASKDATA_ZIP_LIMITS } from '../io/zip.js';
import { lengthOption, numberOption, out, readInput, speedOption } from './util.js';
import { checkOrder } from './safety/budgets.js';

/** Reads FILE and, for a .shp, the files of its set beside it (same base name, any letter case). */
export async function loadLayer(path: string, what: string): Promise<CheckLayer> {
  const name = basename(path);
  const files: Record<string, Uint8Array> = { [name]: readInput(path, what) };
  if (/\.shp$/i.test(name)) {
    const base = name.slice(0, -4).toLowerCase();
    const dir = dirname(path);
    let entries: string[] = [];
    try {
      entries = readdirSync(dir);
    } catch {
      /* readInput already proved the file is there */
    }
    for (const e of entries) {
      if (
        e !== name &&
        e.toLowerCase().startsWith(base + '.') &&
        /\.(shx|dbf|prj|cpg)$/i.test(e) &&
        e.length === base.length + 4
      )
        files[e] = readInput(join(dir, e), what);
    }
  }
  return readLayer(files, name);
}

/**
 * ISO 11783-10 task data: a TASKDATA folder, a TASKDATA.XML (its grid and external files read from beside
 * it) or a zip holding one: one layer per task and product. Null when `path` is none of these.
 */
function loadTaskData(path: string): CheckLayer[] | null {
  let dir: string | null = null;
  try {
    if (statSync(path).isDirectory()) dir = path;
  } catch {
    /* readInput below names the missing file */
  }
  if (dir === null && isTaskDataXml(path)) dir = dirname(path);
  if (dir !== null) {
    const files: Record<string, Uint8Array> = {};
    for (const e of readdirSync(dir))
      if (/\.(xml|bin)$/i.test(e)) files[e] = readInput(join(dir, e), 'task data');
    const xml = Object.keys(files).find(isTaskDataXml);
    if (!xml) return null;
    return layersFromTaskDataFiles(files, join(dir, xml));
  }
  if (/\.zip$/i.test(path)) {
    const bytes = readInput(path, 'prescription');
    if (!Object.keys(readZip(bytes, path, TASKDATA_ZIP_LIMITS)).some(isTaskDataXml)) return null;
    return layersFromTaskDataFiles({ [path]: bytes }, path);
  }
  return null;
}

const MARK = { pass: 'PASS', warn: 'WARN', fail: 'FAIL', skip: 'SKIP' } as const;

export function register(program: Command): void {
  program
    .command('check')
    .description(
      'Check a prescription (.geojson, .shp or .zip, from tilth or any program) before it goes to the field: coordinate system, valid zones, ' +
        'overlaps, gaps and parts outside the boundary, numeric rate column, machine rate range, zones too small for the speed, total product. ' +
        'Exits 0 when nothing fails, 1 when a check fails, 2 when the file cannot be read.',
    )
    .argument(
      '<file>',
      'prescription: .geojson, .shp (with .shx/.dbf/.prj/.cpg beside it), .zip, or ISO 11783-10 task data (TASKDATA.XML, a TASKDATA folder or a zip holding one)',
    )
    .option(
      '--boundary <file>',
      'field boundary (.geojson, .shp or .zip): enables the gap and outside checks',
    )
    .option(
      '--rate-field <name>',
      'rate column (default: columns ending in _lbac, _kgha, _galac or _lha; else the only numeric column)',
    )
    .option('--min <rate>', "machine's lowest rate above 0 (0 = off always passes); no default")
    .option('--max <rate>', "machine's highest rate; no default")
    .option(
      '--speed <speed>',
      'travel speed with its unit, e.g. 13km/h or 8mph (a plain number is km/h): flags zones too short to reach their rate; no default',
    )
    .option(
      '--swath <width>',
      'swath width with its unit, e.g. 18m or 60ft (a plain number is m): also flags zones smaller than one rate change x swath',
    )
    .option(
      '--transition <s>',
      `seconds the controller needs to reach a new rate (common practice 3-5 s)`,
      String(DEFAULT_TRANSITION_S),
    )
    .option('--strict', 'refuse a shapefile without .prj instead of reading it as WGS 84')
    .option('--json', 'print the report as JSON for scripts')
    .addHelpText(
      'after',
      '\nExamples:\n  tilth check out/shapefiles/rx_side_band.zip --boundary boundary.geojson --min 40 --max 250 --speed 8mph --swath 60ft\n' +
        '  tilth check rx.shp --rate-field N_RATE --strict --json\n' +
        '  tilth check out/taskdata.zip --boundary boundary.geojson --max 250   (task data: one report per task and product, rates in kg/ha or L/ha)',
    )
    .action(async (file: string, o) => {
      const min = numberOption('--min', o.min, { min: 0 });
      const max = numberOption('--max', o.max, { min: 0 });
      checkOrder('--min', min, '--max', max);
      const speed = speedOption('--speed', o.speed, [0.1, 100]);
      const swath = lengthOption('--swath', o.swath, [0.1, 200]);
      const transitionS = numberOption('--transition', o.transition, { min: 0, max: 60 });
      const taskLayers = loadTaskData(file);
      const layers = taskLayers ?? [await loadLayer(file, 'prescription')];
      const boundary = o.boundary ? await loadLayer(o.boundary, 'boundary') : undefined;
      const reports: CheckReport[] = layers.map((layer) =>
        checkPrescription(layer, {
          boundary,
          rateField: o.rateField,
          min,
          max,
          speed,
          swath,
          transitionS,
          strict: !!o.strict,
        }),
      );
      const ok = reports.every((r) => r.ok);
      if (o.json) out(JSON.stringify(taskLayers ? { file, ok, reports } : reports[0], null, 2));
      else
        for (const r of reports) {
          out(`tilth check ${r.file}`);
          for (const l of r.lines) out(`${MARK[l.status]}  ${l.check.padEnd(10)} ${l.message}`);
          out(
            r.ok
              ? 'result: nothing failed'
              : `result: ${r.lines.filter((l) => l.status === 'fail').length} check(s) failed`,
          );
        }
      if (!ok) process.exitCode = 1;
    });
}
