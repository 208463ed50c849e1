/**
 * The report's rasters: soil-test maps and response-chance class maps, drawn at display resolution (a fine grid
 * shown coarser by a whole factor; the prescription itself is unchanged).
 */
import { kClass, pClass, type pClassTable } from '../agronomy/interpret.js';
import type { CropTable, Tables } from '../agronomy/tables.js';
import { classify } from '../zones/classify.js';
import type { ReportInput } from '../report/types.js';
import type { PMethod } from '../types.js';
import type { Prescription } from './types.js';

type PClasses = ReturnType<typeof pClassTable>;

/**
 * Report rasters are drawn at display resolution: at most this many cells per side (a map is 700 px wide);
 * finer grids are shown coarser by a whole factor (see `coarsen`), and the map's legend says so.
 */
export const REPORT_MAX_SIDE = 300;

/** The whole factor that brings a grid to at most {@link REPORT_MAX_SIDE} cells per side (1 when it fits). */
export function displayFactor(g: { cols: number; rows: number }): number {
  return Math.max(1, Math.ceil(Math.max(g.cols, g.rows) / REPORT_MAX_SIDE));
}

/**
 * A grid coarsened by a whole factor for display: each new cell takes the value of the original cell at its
 * centre (nearest, so class rasters keep their classes). A 1 m grid on a section (2.6 million cells) is shown
 * at 6 m; the prescription itself is unchanged. `cells` lists the original cells shown (null at factor 1).
 */
export function coarsen(
  g: { xmin: number; ymax: number; cell: number; cols: number; rows: number },
  factor: number,
) {
  if (factor <= 1) return { grid: g, pick: (v: ArrayLike<number>) => v, cells: null };
  const cols = Math.ceil(g.cols / factor),
    rows = Math.ceil(g.rows / factor);
  const grid = { xmin: g.xmin, ymax: g.ymax, cell: g.cell * factor, cols, rows };
  const idx = new Int32Array(cols * rows);
  for (let r = 0; r < rows; r++) {
    const rr = Math.min(g.rows - 1, r * factor + (factor >> 1));
    for (let c = 0; c < cols; c++)
      idx[r * cols + c] = rr * g.cols + Math.min(g.cols - 1, c * factor + (factor >> 1));
  }
  const pick = (v: ArrayLike<number>): Float64Array => {
    const out = new Float64Array(idx.length);
    for (let i = 0; i < idx.length; i++) out[i] = v[idx[i]];
    return out;
  };
  return { grid, pick, cells: idx };
}

/** The prescription's grid as the report shows it: coarsened when fine, with the note the legends carry. */
export interface ReportView {
  grid: { xmin: number; ymax: number; cell: number; cols: number; rows: number };
  pick: (v: ArrayLike<number>) => ArrayLike<number>;
  note: string[] | undefined;
  /** the display factor (1: full resolution) */
  factor: number;
  /** the original cells shown (null: all of them) */
  cells: Int32Array | null;
}

/**
 * The display view of a prescription's grid (see {@link coarsen}).
 * @example reportView(rx).note // undefined when the grid is shown at full resolution
 */
export function reportView(rx: Prescription): ReportView {
  return gridView(rx.grid);
}

/**
 * The display view of a grid (see {@link reportView}): what the report shows of a prescription on this grid.
 * @example gridView(rx.grid).factor // 6 for a 1 m section
 */
export function gridView(
  grid: Pick<Prescription['grid'], 'xmin' | 'ymax' | 'cell' | 'cols' | 'rows'>,
): ReportView {
  const factor = displayFactor(grid);
  const view = coarsen(
    { xmin: grid.xmin, ymax: grid.ymax, cell: grid.cell, cols: grid.cols, rows: grid.rows },
    factor,
  );
  const g = view.grid;
  const note =
    factor > 1
      ? [
          `Shown at ${g.cell} m cells for display: each takes the value of the ${grid.cell} m cell at its centre (nearest); the prescription uses ${grid.cell} m cells.`,
        ]
      : undefined;
  return { grid: g, pick: view.pick, note, factor, cells: view.cells };
}

/** One map per soil-test surface, P classed by its response classes, the others by quantiles of the cells shown. */
export function reportSurfaces(
  rx: Prescription,
  view: ReportView,
  pClasses: PClasses,
): ReportInput['surfaces'] {
  const { grid: g, note } = view;
  const shownFraction = view.pick(rx.grid.fraction);
  return rx.surfaces.map((s) => {
    let breaks: number[];
    if (s.analyte === 'p') breaks = pClasses.map((c) => c.below_ppm).filter((b): b is number => b !== null);
    else {
      // quantiles of the cells shown (all cells when the grid is shown at full resolution)
      const c = classify(view.pick(s.values), {
        method: 'quantile',
        classes: 5,
        weights: shownFraction,
        step: 0,
      });
      breaks = c.breaks.slice(1, -1);
    }
    return {
      nutrient: s.analyte,
      raster: { grid: g, values: view.pick(s.values), notes: note },
      breaks,
      method:
        s.method === 'idw'
          ? `IDW power ${s.power}, ${Number.isFinite(s.neighbours) ? s.neighbours : 'all'} neighbours`
          : s.method === 'zones'
            ? 'zone composites'
            : 'one sample',
    };
  });
}

/** Response-chance class maps: P by its classes for the samples' method, K by the crop's K classes. */
export function responseMaps(
  rx: Prescription,
  view: ReportView,
  tables: Tables,
  crop: CropTable | undefined,
  pClasses: PClasses,
  pMethod: PMethod,
  kFactor: number,
): ReportInput['response'] {
  const { grid: g, note } = view;
  const response: ReportInput['response'] = [];
  const pS = rx.surfaces.find((s) => s.analyte === 'p');
  if (pS) {
    // classes only for the cells the map shows (the same cells `coarsen` picks)
    const shown = view.pick(pS.values);
    const vals = new Float64Array(shown.length).fill(NaN);
    // classes in order of increasing chance: reverse the table (lowest test = highest chance)
    const order = pClasses
      .map((_, i) => i)
      .sort((a, b) => pClasses[a].response_probability - pClasses[b].response_probability);
    const rank = new Map(order.map((ci, r) => [pClasses[ci].name, r]));
    for (let i = 0; i < vals.length; i++) {
      const c = pClass(shown[i], pMethod, tables, kFactor);
      if (c) vals[i] = rank.get(c.name)!;
    }
    response.push({
      nutrient: 'p',
      classes: order.map((ci) => ({
        label: `${pClasses[ci].name}: about ${Math.round(pClasses[ci].response_probability * 100)} % chance${pMethod === 'kelowna' ? ` (Kelowna factor ${kFactor})` : ''}`,
      })),
      raster: { grid: g, values: vals, notes: note },
      source: pClasses[0].source,
    });
  }
  const kS = rx.surfaces.find((s) => s.analyte === 'k');
  if (kS && crop) {
    const kClasses = tables.k_classes[crop.k_class_group] ?? [];
    const order = kClasses
      .map((_, i) => i)
      .sort((a, b) => kClasses[a]!.response_probability - kClasses[b]!.response_probability);
    const rank = new Map(order.map((ci, r) => [kClasses[ci]!.name, r]));
    const shown = view.pick(kS.values);
    const vals = new Float64Array(shown.length).fill(NaN);
    for (let i = 0; i < vals.length; i++) {
      const c = kClass(shown[i], crop, tables);
      if (c) vals[i] = rank.get(c.name)!;
    }
    response.push({
      nutrient: 'k',
      classes: order.map((ci) => ({
        label: `${kClasses[ci]!.name}: about ${Math.round(kClasses[ci]!.response_probability * 100)} % chance, ${kClasses[ci]!.k2o_lb} lb K2O`,
      })),
      raster: { grid: g, values: vals, notes: note },
      source: kClasses[0]?.source ?? crop.k_critical_ppm.source,
    });
  }
  return response;
}
