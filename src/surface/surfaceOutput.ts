/**
 * What `tilth surface` reports besides the grid itself: the chance grids of a kriged surface (by file suffix),
 * the result as JSON for scripts, and as text (cross-validation table, the choice, what was written).
 * Pure: the command reads the tables and writes the files.
 */
import type { Tables } from '../agronomy/tables.js';
import { UserError, type Warning } from '../errors.js';
import type { PMethod } from '../types.js';
import { chanceSpec } from '../variability/chance.js';
import { ANALYTE_LABEL } from '../vocabulary.js';
import { kName, type NutrientSurface } from './nutrientSurface.js';
import { chanceBelow, classProbabilities } from './probability.js';

/**
 * The chance grids (and the kriging variance) of a kriged surface, by file suffix; a warning instead when the
 * surface was not kriged. Tables are asked for only when there is something to compute.
 * @param s the surface (`nutrientSurface` with method kriging or auto)
 * @param crop the crop whose classes or S low level the maps use (`--crop`, default canola)
 * @param tables gives the tables in force (read lazily)
 * @param pMethod the samples' P method
 * @param warnings the warning list the "no chance maps" warning goes to
 * @throws UserError when the crop is not in the tables
 * @example chanceGrids(s, 'canola', () => defaultTables(), 'olsen', warnings).get('variance')
 */
export function chanceGrids(
  s: NutrientSurface,
  crop: string,
  tables: () => Tables,
  pMethod: PMethod,
  warnings: Warning[],
): Map<string, ArrayLike<number>> {
  const grids = new Map<string, ArrayLike<number>>();
  if (!s.krigedMean || !s.variance || !s.kriging) {
    warnings.push({
      code: 'surface-no-chance-maps',
      message: `${ANALYTE_LABEL[s.analyte]}: no chance maps: they need the kriging variance, and this surface is ${s.method}. Use --method kriging (or auto when kriging wins).`,
    });
    return grids;
  }
  const t = tables();
  const cropTable = t.crops[crop];
  if (!cropTable)
    throw new UserError(
      `option --crop: "${crop}" is not in the tables. Fix: give one of ${Object.keys(t.crops).join(', ')}.`,
      { value: crop },
    );
  const cells = { mean: s.krigedMean, variance: s.variance, transform: s.kriging.transform };
  grids.set('variance', s.variance);
  const spec = chanceSpec(s.analyte, cropTable, t, pMethod);
  if (spec.kind === 'below') grids.set(`chance-below-${spec.threshold}`, chanceBelow(cells, spec.threshold));
  if (spec.kind === 'classes') {
    const r = classProbabilities(cells, spec.classes);
    grids.set('response-chance', r.expected);
    spec.classes.names.forEach((name, c) =>
      grids.set(`class-${name.replace(/[^A-Za-z0-9]+/g, '-')}`, r.probability[c]),
    );
  }
  return grids;
}

/**
 * Decimals a chance grid is written with: the variance as the surface (`decimals`), chances at least 4.
 * @example chanceDecimals('response-chance', 3) // 4
 */
export function chanceDecimals(suffix: string, decimals: number | undefined): number | undefined {
  return suffix === 'variance' ? decimals : Math.max(decimals ?? 3, 4);
}

/**
 * The result for scripts (`--json`): choice, grid, cross-validation table, kriging model, warnings. Non-finite
 * numbers are written as null (NaN) or "all" (an unlimited neighbour count).
 * @example JSON.parse(surfaceJson(s, 'p.asc', 32613, [])).method // 'idw'
 */
export function surfaceJson(s: NutrientSurface, file: string, epsg: number, warnings: unknown[]): string {
  const g = s.grid;
  const result = {
    nutrient: s.analyte,
    unit: ANALYTE_LABEL[s.analyte],
    file,
    epsg,
    grid: { xmin: g.xmin, ymax: g.ymax, cell: g.cell, cols: g.cols, rows: g.rows },
    method: s.method,
    power: s.power,
    neighbours: s.neighbours,
    choice: s.choice,
    samplesUsed: s.samplesUsed,
    min: s.min,
    max: s.max,
    crossValidation:
      s.cv?.table.map((r) => ({ ...r, method: r.method ?? 'idw', chosen: r === s.cv!.best })) ?? null,
    kriging: s.kriging
      ? {
          model: s.kriging.model,
          refused: s.kriging.refused,
          transform: s.kriging.transform,
          neighbours: s.kriging.neighbours,
          modelText: s.kriging.modelText,
          modelSource: s.kriging.modelSource,
        }
      : null,
    warnings,
  };
  return JSON.stringify(
    result,
    (_k, v) => (typeof v === 'number' && !Number.isFinite(v) ? (Number.isNaN(v) ? null : 'all') : v),
    2,
  );
}

/**
 * The lines after the cross-validation table: the choice, and what was written.
 * @example surfaceDoneText(s, 'p.asc', 5, 32613) // ['P (ppm): ...', 'wrote p.asc (162 x 162 cells ...']
 */
export function surfaceDoneText(s: NutrientSurface, file: string, cell: number, epsg: number): string[] {
  const g = s.grid;
  return [
    `${ANALYTE_LABEL[s.analyte]}: ${s.choice}.`,
    `wrote ${file} (${g.cols} x ${g.rows} cells of ${cell} m, EPSG:${epsg}) and its .prj; values ${round(s.min)} to ${round(s.max)} from ${s.samplesUsed} samples.`,
  ];
}

/**
 * The cross-validation table as aligned text, the chosen row marked with "*" (MSSE for kriging).
 * @example cvText(s).split('\n')[0] // 'leave-one-out cross-validation, P (ppm) (62 samples)'
 */
export function cvText(s: NutrientSurface): string {
  if (!s.cv) return `${ANALYTE_LABEL[s.analyte]}: no cross-validation table (${s.choice}).`;
  const lines = [
    `leave-one-out cross-validation, ${ANALYTE_LABEL[s.analyte]} (${s.samplesUsed} samples)`,
    '  method    power  neighbours        RMSE         MAE        bias     n        MSSE',
  ];
  for (const r of s.cv.table) {
    const mark = r === s.cv.best ? '*' : ' ';
    const krig = r.method === 'kriging';
    lines.push(
      `${mark} ${(krig ? 'kriging' : 'idw').padEnd(7)}  ${(krig ? '-' : String(r.power)).padStart(5)}  ${kName(r.neighbours).padStart(10)}  ${f(r.rmse)}  ${f(r.mae)}  ${f(r.bias)}  ${String(r.n).padStart(4)}  ${krig ? f(r.msse ?? NaN) : ''}`.trimEnd(),
    );
  }
  if (s.kriging?.model)
    lines.push(
      `  kriging model: ${s.kriging.modelText}; ${s.kriging.modelSource}. MSSE = mean(error^2 / kriging variance), near 1 when the variances fit.`,
    );
  return lines.join('\n');
}

function f(v: number): string {
  return (Number.isFinite(v) ? v.toPrecision(5) : 'n/a').padStart(10);
}

function round(v: number): number {
  return Math.round(v * 1000) / 1000;
}
