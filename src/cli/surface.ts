/** `tilth surface`: one nutrient's interpolated map as an Esri ASCII grid (.asc + .prj), and the cross-validation table. */
import { existsSync } from 'node:fs';
import { checkBoundaryVertices, checkOrder } from './safety/budgets.js';
import { readinessProblems } from './safety/readiness.js';
import type { Command } from 'commander';
import { prjText } from '../geo/crs.js';
import { UserError } from '../errors.js';
import {
  analyteFromName,
  fieldGrid,
  formatAsc,
  gridWarnings,
  nutrientSurface,
  SURFACE_METHODS,
  type SurfaceMethod,
} from '../surface/index.js';
import {
  chanceDecimals,
  chanceGrids,
  cvText,
  surfaceDoneText,
  surfaceJson,
} from '../surface/surfaceOutput.js';
import { addInputOptions, inputOptionsFrom, loadInputs } from './inputs.js';
import { addThreadsOption, surfaceThreads } from './threads.js';
import { checkOutputFile, info, numberOption, out, printWarnings, writeOutputFile } from './util.js';

/** An Esri ASCII grid starts with its ncols line; a .prj tilth writes is a projected WKT. */
const ASC_OURS = (h: string) => /^\s*ncols\s/i.test(h);
const PRJ_OURS = (h: string) => /^PROJCS\["WGS_1984_UTM_Zone_\d+[NS]"/.test(h);

export function register(program: Command): void {
  addThreadsOption(addInputOptions(program.command('surface')))
    .description(
      "Map one soil-test nutrient over the field by inverse-distance weighting (power and neighbours chosen by cross-validation unless given) or ordinary kriging, and write an Esri ASCII grid (.asc with .prj) in the field's UTM zone.",
    )
    .requiredOption(
      '--nutrient <name>',
      'no3_n (or n, nitrate), p, k, so4_s (or s, sulphate, sulfate), om, ph',
    )
    .requiredOption('--out <file.asc>', 'output grid; the .prj is written beside it')
    .option('--cell <metres>', 'cell size in metres', '5')
    .option(
      '--method <idw|kriging|auto>',
      'idw (inverse distance), kriging (ordinary kriging with the semivariogram model fitted as `tilth variability` fits it; refused with the reason when the fit is unusable), or auto (the lowest leave-one-out RMSE of the IDW candidates and kriging)',
      'idw',
    )
    .option('--kriging-neighbours <k>', 'nearest samples per cell for kriging', '16')
    .option(
      '--log',
      'krige the natural logarithm of the values (skewed data) and back-transform to the lognormal mean (docs/surface.md)',
    )
    .option(
      '--chance-maps',
      "with kriging, also write beside --out: <name>-variance.asc (kriging variance), and for P and K <name>-response-chance.asc (expected chance of a yield response) and <name>-class-<class>.asc (chance of each response class), for sulphate-S <name>-chance-below-<t>.asc (chance below the crop's low level); Gaussian assumption, docs/surface.md",
    )
    .option('--crop <name>', 'crop whose classes and S low level the chance maps use', 'canola')
    .option('--tables <file>', 'your edited tables (see `tilth tables`) for the chance maps')
    .option(
      '--power <p|auto>',
      'IDW distance power, or auto (lowest cross-validation RMSE of 1, 1.5, 2, 3)',
      'auto',
    )
    .option(
      '--neighbours <k|all|auto>',
      'nearest samples per cell, all, or auto (lowest RMSE of 8, 12, 16, all)',
      'auto',
    )
    .option('--radius <metres>', 'use only samples within this distance (default: no limit)')
    .option('--min-neighbours <n>', 'leave a cell empty when fewer samples are within --radius', '1')
    .option('--decimals <n>', 'decimals written in the grid', '3')
    .option(
      '--force',
      'replace an existing .asc/.prj that tilth cannot recognise as its own grid (never an input file)',
    )
    .option('--json', 'print the result (choice, cross-validation table, warnings) as JSON on stdout')
    .addHelpText(
      'after',
      '\nExample:\n  tilth surface --samples sample-fields/quarter/samples.geojson --boundary sample-fields/quarter/boundary.geojson \\\n' +
        '    --nutrient p --cell 5 --power auto --neighbours 12 --out p.asc\n' +
        '  tilth surface --samples sample-fields/quarter/samples.csv --boundary sample-fields/quarter/boundary.geojson \\\n' +
        '    --nutrient s --method auto --out s.asc\n' +
        '  tilth surface --samples sample-fields/zoned/samples.geojson --boundary sample-fields/zoned/boundary.geojson \\\n' +
        '    --zones sample-fields/zoned/zones.geojson --nutrient s --out s.asc\n\n' +
        'Values are in canonical units: nitrate-N and sulphate-S lb/ac 0-24 in, P and K ppm, OM %, pH.\n' +
        'Cells whose area is partly inside the field get values (so zones cover the field); others are NODATA (-9999).',
    )
    .action(runSurface);
}

/** The command's options, as commander gives them. */
interface SurfaceFlags {
  [flag: string]: unknown;
  nutrient: string;
  out: string;
  cell: string;
  method: string;
  krigingNeighbours: string;
  log?: boolean;
  chanceMaps?: boolean;
  crop: string;
  tables?: string;
  power: string;
  neighbours: string;
  radius?: string;
  minNeighbours?: string;
  decimals?: string;
  threads?: string;
  force?: boolean;
  json?: boolean;
  samples: string;
  boundary: string;
  zones?: string;
}

/** The flags checked and turned into numbers (exit 2 naming the flag when one is not usable). */
function surfaceSettings(o: SurfaceFlags) {
  const analyte = analyteFromName(o.nutrient);
  const cell = numberOption('--cell', o.cell, { min: 0.1, max: 1000 })!;
  const power = o.power === 'auto' ? 'auto' : numberOption('--power', o.power, { min: 0.1, max: 10 })!;
  const nb = String(o.neighbours).toLowerCase();
  const neighbours =
    nb === 'auto'
      ? 'auto'
      : nb === 'all'
        ? Infinity
        : numberOption('--neighbours', o.neighbours, { min: 1, max: 100_000, integer: true })!;
  const radius = numberOption('--radius', o.radius, { min: 0.01, max: 1e6 });
  const minNeighbours = numberOption('--min-neighbours', o.minNeighbours, {
    min: 1,
    max: 100_000,
    integer: true,
  });
  if (typeof neighbours === 'number')
    checkOrder('--min-neighbours', minNeighbours, '--neighbours', neighbours);
  const method = String(o.method).toLowerCase();
  if (!SURFACE_METHODS.includes(method as SurfaceMethod))
    throw new UserError(`option --method: "${o.method}" is not a method. Fix: give idw, kriging or auto.`, {
      value: o.method,
    });
  const kNeighbours = numberOption('--kriging-neighbours', o.krigingNeighbours, {
    min: 1,
    integer: true,
  })!;
  const decimals = numberOption('--decimals', o.decimals, { min: 0, max: 12, integer: true });
  const threads = surfaceThreads(o.threads);
  if (!/\.asc$/i.test(o.out))
    throw new UserError(
      `--out "${o.out}": the output is an Esri ASCII grid. Fix: give a file name ending in .asc.`,
      { file: o.out },
    );
  return {
    analyte,
    cell,
    power,
    neighbours,
    radius,
    minNeighbours,
    method,
    kNeighbours,
    decimals,
    threads,
  } as const;
}

async function runSurface(o: SurfaceFlags): Promise<void> {
  const set = surfaceSettings(o);
  const inputFiles = [o.samples, o.boundary, o.zones].filter((f): f is string => !!f);
  const prjPath = o.out.replace(/\.asc$/i, '.prj');
  const shpBeside = /\.asc$/i.test(o.out) && existsSync(o.out.replace(/\.asc$/i, '.shp'));
  const prjOurs = (h: string) => !shpBeside && PRJ_OURS(h); // a .prj beside a .shp belongs to that shapefile
  const fileOpts = { inputs: inputFiles, force: Boolean(o.force) };
  checkOutputFile(o.out, { ...fileOpts, ours: ASC_OURS });
  checkOutputFile(prjPath, { ...fileOpts, ours: prjOurs });
  const inputs = await loadInputs(inputOptionsFrom(o));
  checkBoundaryVertices(inputs.field, o.boundary);
  const problems = readinessProblems(inputs, set.analyte, o.samples);
  if (problems.length) throw new UserError(`cannot map these inputs:\n  ${problems.join('\n  ')}`);
  const { minNeighbours } = set;
  if (minNeighbours !== undefined && minNeighbours > inputs.samples.ids.length) {
    throw new UserError(
      `option --min-neighbours ${minNeighbours}: the samples file has ${inputs.samples.ids.length} samples, so every cell would be empty. Fix: give --min-neighbours ${Math.min(3, inputs.samples.ids.length)} or leave it out.`,
    );
  }
  const grid = fieldGrid(inputs.field, set.cell);
  const s = nutrientSurface(inputs.samples, set.analyte, grid, inputs.zones, {
    power: set.power,
    neighbours: set.neighbours,
    radius: set.radius,
    minNeighbours,
    method: set.method as SurfaceMethod,
    kriging: { neighbours: set.kNeighbours, log: Boolean(o.log) },
    threads: set.threads,
  });
  const warnings = [...inputs.warnings, ...gridWarnings(grid, inputs.field.name), ...s.warnings];
  writeOutputFile(o.out, formatAsc(grid, s.values, { decimals: set.decimals }), {
    ...fileOpts,
    ours: ASC_OURS,
  });
  writeOutputFile(prjPath, prjText(inputs.field.utm), { ...fileOpts, ours: prjOurs });
  // the tables (and their parser) load only for chance maps
  const tablesFrom = o.chanceMaps ? (await import('./plan.js')).tablesFromOption : null;
  const extra = tablesFrom
    ? chanceGrids(s, o.crop, () => tablesFrom(o.tables), inputs.samples.pMethod, warnings)
    : new Map<string, ArrayLike<number>>();
  for (const [suffix, values] of extra) {
    const file = o.out.replace(/\.asc$/i, `-${suffix}.asc`);
    const decimals = chanceDecimals(suffix, set.decimals);
    writeOutputFile(file, formatAsc(grid, values as Float64Array, { decimals }), {
      ...fileOpts,
      ours: ASC_OURS,
    });
    if (!o.json) info(`wrote ${file}`);
  }
  if (o.json) return out(surfaceJson(s, o.out, inputs.field.utm.epsg, warnings));
  printWarnings(warnings);
  if (s.cv) out(cvText(s));
  for (const line of surfaceDoneText(s, o.out, set.cell, inputs.field.utm.epsg)) info(line);
}
