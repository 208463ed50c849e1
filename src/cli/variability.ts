/** `tilth variability`: how variable one nutrient is across the field, whether the sampling can map it, the low spots. */
import type { Command } from 'commander';
import { UserError } from '../errors.js';
import type { Analyte, FieldInputs, Grid } from '../types.js';
import type { Warning } from '../errors.js';
import { addInputOptions, inputOptionsFrom, loadInputs } from './inputs.js';
import {
  CAUTION,
  checkOutputDir,
  info,
  numberOption,
  out,
  printWarnings,
  readInput,
  writeOutputDir,
} from './util.js';
import { tablesFromOption } from './plan.js';
import { checkBoundaryVertices, checkLags } from './safety/budgets.js';
import { readinessProblems } from './safety/readiness.js';
import { parsePlan } from '../agronomy/index.js';
import { fieldGrid, gridWarnings, nutrientSurface } from '../surface/index.js';
import {
  analyzeVariability,
  sampleMapSvg,
  semivariogramSvg,
  variabilityText,
  chanceBelowMap,
  chanceMapSvg,
  chanceSummary,
  type ChanceMap,
  type FitMethod,
  type Threshold,
  type VariabilityReport,
} from '../variability/index.js';

const NUTRIENTS: Record<string, Analyte> = {
  s: 'so4_s',
  so4_s: 'so4_s',
  sulphur: 'so4_s',
  sulfur: 'so4_s',
  sulphate: 'so4_s',
  sulfate: 'so4_s',
  n: 'no3_n',
  no3_n: 'no3_n',
  nitrate: 'no3_n',
  p: 'p',
  phosphorus: 'p',
  k: 'k',
  potassium: 'k',
  om: 'om',
  ph: 'ph',
};

/** Parses --nutrient: S, N, P, K, OM, pH (or tilth's analyte names). */
export function parseNutrient(v: string): Analyte {
  const a = NUTRIENTS[v.trim().toLowerCase()];
  if (!a)
    throw new UserError(
      `option --nutrient: "${v}" is not a nutrient tilth knows. Fix: give one of S, N, P, K, OM, pH.`,
    );
  return a;
}

/** JSON with non-finite numbers as null. */
function toJson(v: unknown): string {
  return JSON.stringify(v, (_k, x) => (typeof x === 'number' && !Number.isFinite(x) ? null : x), 2);
}

/** `tilth variability` and its options. */
export function register(program: Command): void {
  declareOptions(addInputOptions(program.command('variability'))).action(async (o) => {
    const nutrient = parseNutrient(o.nutrient);
    const { threshold, sFloor, sFloorSource } = thresholdAndFloor(o, nutrient);
    const study = studyOptions(o);
    const inputFiles = [o.samples, o.boundary, o.zones, o.plan, o.tables].filter((f): f is string => !!f);
    if (o.out) checkOutputDir(o.out, { force: Boolean(o.force), inputs: inputFiles });
    const cell = numberOption('--cell', o.cell, { min: 0.5, max: 1000 })!;
    const inputs = await loadInputs(inputOptionsFrom(o));
    refuseUnfit(inputs, nutrient, o.samples, o.boundary, study.cutoff, study.width);
    const surf = o.surface !== false ? studySurface(inputs, nutrient, cell) : undefined;
    const report = analyzeVariability(
      inputs.samples,
      inputs.field,
      { nutrient, threshold, sFloor, sFloorSource, transform: o.log ? 'log' : 'none', ...study },
      surf
        ? { values: surf.values, fraction: surf.grid.fraction, cell: surf.grid.cell, note: surf.note }
        : undefined,
    );
    report.warnings.push(...(surf?.warnings ?? []));
    const chance =
      surf && report.threshold
        ? chanceBelowMap(
            inputs.samples,
            nutrient,
            surf.grid,
            { ...report.threshold, unit: report.unit },
            {
              log: o.log,
              fit: study.fit,
            },
          )
        : null;
    if (chance) report.chance = chanceSummary(chance);
    const warnings = [...inputs.warnings, ...report.warnings];
    if (o.out)
      writeCharts(o.out, report, inputs, surf, chance, warnings, { force: Boolean(o.force), inputFiles });
    if (o.json) {
      out(toJson({ ...report, warnings }));
      printWarnings(inputs.warnings);
    } else {
      printWarnings(inputs.warnings);
      out(variabilityText(report));
    }
  });
}

/** The command's description, options and help text. */
function declareOptions(cmd: Command): Command {
  return cmd
    .description(
      'Within-field variability of one nutrient (sulphate-S by default): statistics, semivariogram and fitted models, spatial dependence, sampling advice, low spots.',
    )
    .option('--nutrient <name>', 'S, N, P, K, OM or pH', 'S')
    .option(
      '--plan <file>',
      'plan file (see `tilth plan init`): its crop and S strategy set the S threshold and floor from the tables (default: canola)',
    )
    .option('--tables <file>', 'your edited tables (see `tilth tables`)')
    .option(
      '--threshold <value>',
      "low means below this, in the nutrient's unit (default: S the crop's s_low_below_lb from the tables, 20 lb S/ac for canola; P at or below 10 ppm Olsen / 17 ppm Kelowna; K the crop's k_critical_ppm, 125 for every crop; none for N, OM, pH)",
    )
    .option(
      '--s-floor <lb/ac>',
      "sulphate-S the plan applies regardless of the test, lb S/ac (default: the crop's s_floor_lb from the tables, 10 for canola, common practice; 0 when the plan's S strategy is none)",
    )
    .option(
      '--cell <metres>',
      'cell size of the interpolated surface (IDW, power and neighbours by cross-validation, as `tilth surface`) used for the share of area below the threshold and the map, and of the chance map (ordinary kriging)',
      '10',
    )
    .option('--no-surface', 'skip the interpolated surface and the chance map (samples only)')
    .option(
      '--fit-method <n>',
      'model fit weights: 7 = N_j/h_j^2 (default, as gstat), 2 = N_j/gamma(h_j)^2 (Cressie)',
      '7',
    )
    .option('--log', 'semivariogram of the natural logarithm of the values (for strongly skewed data)')
    .option(
      '--cutoff <m>',
      "largest pair distance, metres (default a third of the samples' bounding-box diagonal)",
    )
    .option('--width <m>', 'lag width, metres (default cutoff / 15)')
    .option(
      '--out <dir>',
      'write a folder with the charts (<nutrient>-semivariogram.svg, <nutrient>-map.svg, and with a threshold <nutrient>-chance-below-<threshold>.svg: the chance below it from kriging, or why there is none) and variability.json',
    )
    .option('--force', 'replace an earlier tilth --out folder (never one holding other files)')
    .option('--json', 'print JSON for scripts')
    .addHelpText(
      'after',
      `
Example:
  tilth variability --samples sample-fields/quarter/samples.geojson --boundary sample-fields/quarter/boundary.geojson --nutrient S --out s-charts
  tilth variability --samples sample-fields/quarter/samples.csv --boundary sample-fields/quarter/boundary.geojson --nutrient P --json

Defaults, all editable: threshold as above (sources in docs/variability.md); S floor 10 lb S/ac; model weights N_j/h_j^2;
a lag with fewer than 30 pairs is flagged (common practice); sampling is judged against half the effective range
(common practice). Dependence classes: Cambardella et al. 1994. The chance below the threshold comes from ordinary
kriging (the surface stage's model, 16 neighbours) and assumes a Gaussian error with the kriging variance (docs/surface.md);
without 30 samples, or with a pure-nugget or trending semivariogram, kriging is refused and the text says why.

${CAUTION}`,
    );
}

/** The threshold and the S floor: the options, else the plan's crop in the tables (canola without --plan). */
function thresholdAndFloor(
  o: Record<string, string | undefined>,
  nutrient: Analyte,
): { threshold: number | Threshold | undefined; sFloor?: number; sFloorSource?: string } {
  const tables = tablesFromOption(o.tables);
  const plan = o.plan ? parsePlan(readInput(o.plan, 'plan').toString('utf8'), o.plan, tables) : null;
  const cropName = plan?.crop ?? 'canola';
  const crop = tables.crops[cropName];
  const from = `${o.tables ? o.tables : 'default tables'}, ${cropName}${plan ? ` (plan ${o.plan})` : ' (no --plan: canola assumed)'}`;
  let threshold: number | Threshold | undefined = numberOption('--threshold', o.threshold);
  if (threshold === undefined && crop && nutrient === 'so4_s')
    threshold = {
      value: crop.s_low_below_lb.value,
      unit: 'lb S/ac 0-24 in',
      source: `${from}: ${crop.s_low_below_lb.source}`,
    };
  if (threshold === undefined && crop && nutrient === 'k')
    threshold = {
      value: crop.k_critical_ppm.value,
      unit: 'ppm K 0-6 in',
      source: `${from}: ${crop.k_critical_ppm.source}`,
    };
  let sFloor = numberOption('--s-floor', o.sFloor, { min: 0 });
  let sFloorSource = sFloor === undefined ? undefined : '--s-floor';
  if (sFloor === undefined && crop) {
    const none = plan?.strategy.s.method === 'none';
    sFloor = none ? 0 : crop.s_floor_lb.value;
    sFloorSource = none ? `plan ${o.plan}: S strategy none` : `${from}: ${crop.s_floor_lb.source}`;
  }
  return { threshold, sFloor, sFloorSource };
}

/** The semivariogram options: fit method (7 or 2), cutoff and width (above 0). */
function studyOptions(o: Record<string, string | undefined>): {
  fit: { method: FitMethod };
  cutoff?: number;
  width?: number;
} {
  const method = numberOption('--fit-method', o.fitMethod, { integer: true });
  if (method !== 7 && method !== 2)
    throw new UserError(
      `option --fit-method: "${o.fitMethod}" is not supported. Fix: give 7 (N_j/h_j^2) or 2 (Cressie).`,
    );
  const cutoff = numberOption('--cutoff', o.cutoff, { min: 0, max: 1e6 });
  const width = numberOption('--width', o.width, { min: 0, max: 1e6 });
  if (cutoff === 0 || width === 0)
    throw new UserError(
      'options --cutoff and --width must be above 0. Fix: give a distance in metres, e.g. --cutoff 400.',
    );
  return { fit: { method }, cutoff, width };
}

/** The study's surface: the surface stage's IDW (or zone composites) on `cell` metres, as `tilth surface`. */
interface StudySurface {
  grid: Grid;
  values: Float64Array;
  note: string;
  label: string;
  warnings: Warning[];
}

function studySurface(inputs: FieldInputs, nutrient: Analyte, cell: number): StudySurface {
  const grid = fieldGrid(inputs.field, cell);
  const s = nutrientSurface(inputs.samples, nutrient, grid, inputs.zones);
  return {
    grid,
    values: s.values,
    note: `${cell} m cells; ${s.choice}`,
    label: s.method === 'zones' ? 'zone sample value' : 'interpolated (IDW)',
    warnings: [...gridWarnings(grid, inputs.field.name), ...s.warnings],
  };
}

/** The --out folder: semivariogram and map charts, variability.json. */
function writeCharts(
  dir: string,
  report: VariabilityReport,
  inputs: FieldInputs,
  surf: StudySurface | undefined,
  chance: ChanceMap | null,
  warnings: Warning[],
  opts: { force: boolean; inputFiles: string[] },
): void {
  const stem = report.nutrient;
  const sv = semivariogramSvg({
    semivariogram: report.semivariogram,
    fits: report.fits,
    best: report.best,
    label: report.label,
    unit: report.unit,
    transform: report.transform,
  });
  const map = sampleMapSvg({
    parts: inputs.field.parts,
    utm: inputs.field.utm,
    xy: inputs.samples.xy,
    values: inputs.samples.values[report.nutrient],
    ids: inputs.samples.ids,
    label: report.label,
    unit: report.unit,
    threshold: report.threshold?.value ?? null,
    thresholdInclusive: report.threshold?.inclusive,
    surface: surf ? { grid: surf.grid, values: surf.values, label: surf.label } : undefined,
  });
  const files = new Map<string, string>([
    [`${stem}-semivariogram.svg`, sv],
    [`${stem}-map.svg`, map],
    ['variability.json', toJson({ ...report, warnings }) + '\n'],
  ]);
  if (chance && surf)
    files.set(
      `${stem}-chance-below-${chance.threshold}.svg`,
      chanceMapSvg({
        parts: inputs.field.parts,
        utm: inputs.field.utm,
        xy: inputs.samples.xy,
        values: inputs.samples.values[report.nutrient],
        label: report.label,
        grid: surf.grid,
        map: chance,
      }),
    );
  writeOutputDir(dir, files, { force: opts.force, inputs: opts.inputFiles });
  info(`wrote ${dir}/: ${[...files.keys()].join(', ')}`);
}

/** Refuses, before the work, inputs no variability can be judged from, and lag or pair counts over the budget. */
function refuseUnfit(
  inputs: FieldInputs,
  nutrient: Analyte,
  samplesFile: string,
  boundaryFile: string,
  cutoff?: number,
  width?: number,
): void {
  checkBoundaryVertices(inputs.field, boundaryFile);
  const problems = readinessProblems(inputs, nutrient, samplesFile);
  if (problems.length)
    throw new UserError(`cannot judge the variability of these inputs:\n  ${problems.join('\n  ')}`);
  checkLags(inputs.samples.xy, cutoff, width);
}
