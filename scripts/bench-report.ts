/**
 * Benchmark of the report renderer: median of 5 renders of the demo report with its rasters resampled
 * to 2 m cells (a 160 ac quarter: ~160 000 cells per surface, 6 surfaces and a response raster).
 *   npx tsx scripts/bench-report.ts
 */
import { renderReport } from '../src/report/index.js';
import { demoInputAt } from '../tests/helpers/report-fixture.js';

const input = demoInputAt(2);
const g = input.surfaces[0]!.raster.grid;
const times: number[] = [];
let size = 0;
renderReport(input); // warm-up
for (let i = 0; i < 5; i++) {
  const t = performance.now();
  size = renderReport(input).length;
  times.push(performance.now() - t);
}
times.sort((a, b) => a - b);
console.log(
  JSON.stringify({
    bench: 'renderReport, demo quarter at 2 m',
    cells: g.cols * g.rows,
    rasters: input.surfaces.length + input.response.filter((r) => r.raster).length,
    medianMs: Math.round(times[2]!),
    htmlBytes: size,
    node: process.version,
  }),
);
