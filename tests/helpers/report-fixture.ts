/** The invented demo ReportInput (tests/fixtures/report/demo-input.json, made by make-demo.ts) and variants. */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { parseReportInput } from '../../src/report/serialize.js';
import type { ReportInput, ReportRaster } from '../../src/report/types.js';
import { ROOT } from './cli.js';

export const DEMO_INPUT_PATH = join(ROOT, 'tests', 'fixtures', 'report', 'demo-input.json');

/** A fresh copy of the demo input (10 m cells). */
export function demoInput(): ReportInput {
  return parseReportInput(readFileSync(DEMO_INPUT_PATH, 'utf8'), DEMO_INPUT_PATH);
}

/**
 * The demo input with every raster resampled to `cell` metres (nearest cell, plus a small smooth
 * wobble so class edges are not aligned to the coarse grid), as a 2 m grid on a 160 ac field would be.
 */
export function demoInputAt(cell: number): ReportInput {
  const inp = demoInput();
  const resample = (r: ReportRaster, wobble: number): ReportRaster => {
    const g = r.grid;
    const cols = Math.ceil((g.cols * g.cell) / cell),
      rows = Math.ceil((g.rows * g.cell) / cell);
    const v = new Float64Array(cols * rows);
    for (let y = 0; y < rows; y++)
      for (let x = 0; x < cols; x++) {
        const c = Math.min(g.cols - 1, Math.floor(((x + 0.5) * cell) / g.cell));
        const rr = Math.min(g.rows - 1, Math.floor(((y + 0.5) * cell) / g.cell));
        const base = r.values[rr * g.cols + c]!;
        v[y * cols + x] = base + wobble * Math.sin(x / 7) * Math.cos(y / 9);
      }
    return { grid: { ...g, cell, cols, rows }, values: v };
  };
  for (const s of inp.surfaces) s.raster = resample(s.raster, 0.5);
  for (const r of inp.response) if (r.raster) r.raster = resample(r.raster, 0);
  return inp;
}
