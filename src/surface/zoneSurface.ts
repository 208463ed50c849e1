/**
 * Zone-composite samples: each zone's cells take its sample's value; no interpolation across zone edges.
 */
import type { Warning } from '../errors.js';
import type { Grid, RingsPart } from '../types.js';
import { coverage } from './grid.js';

/**
 * Values for a grid from zone polygons and one value per zone. A cell belongs to the zone that covers
 * the largest share of it (exact areas, so a cell on a zone edge goes to its main zone); a field cell that
 * no zone covers takes the value of the nearest zone (a warning says how many).
 * @param grid the field grid (values are computed where fraction > 0)
 * @param zones per zone: key, parts in metres and value (NaN = no value; such zones are left out, with a warning)
 * @param label nutrient name for messages
 * @example zoneSurface(grid, [{ key: 'A', parts, value: 12 }], 'P (ppm)')
 */
export function zoneSurface(
  grid: Grid,
  zones: { key: string; parts: RingsPart[]; value: number }[],
  label: string,
): { values: Float64Array; zoneOf: Int32Array; warnings: Warning[] } {
  const N = grid.cols * grid.rows;
  const values = new Float64Array(N).fill(NaN);
  const zoneOf = new Int32Array(N).fill(-1);
  const bestCov = new Float32Array(N);
  const warnings: Warning[] = [];
  const used = zones.map((z, i) => ({ ...z, i })).filter((z) => Number.isFinite(z.value));
  const unused = zones.filter((z) => !Number.isFinite(z.value)).map((z) => z.key);
  if (unused.length) {
    warnings.push({
      code: 'surface-zone-no-value',
      message: `${label}: zone${unused.length > 1 ? 's' : ''} ${unused.join(', ')} ha${unused.length > 1 ? 've' : 's'} no sample value; their cells take the nearest zone's value.`,
      field: label,
      where: unused.join(', '),
    });
  }
  for (const z of used) {
    const cov = coverage(z.parts, grid);
    for (let i = 0; i < N; i++) {
      const a = Math.abs(cov[i]);
      if (a > 1e-12 && a > bestCov[i]) {
        bestCov[i] = a;
        zoneOf[i] = z.i;
      }
    }
  }
  let orphans = 0;
  for (let i = 0; i < N; i++) {
    if (!(grid.fraction[i] > 0)) {
      zoneOf[i] = -1;
      continue;
    }
    if (zoneOf[i] < 0 && used.length) {
      // slivers of rounding size between the field and zone outlines are filled without a warning
      if (grid.fraction[i] > 1e-6) orphans++;
      const x = grid.xmin + ((i % grid.cols) + 0.5) * grid.cell,
        y = grid.ymax - (Math.floor(i / grid.cols) + 0.5) * grid.cell;
      let best = Infinity;
      for (const z of used) {
        const d = distToParts(z.parts, x, y);
        if (d < best) {
          best = d;
          zoneOf[i] = z.i;
        }
      }
    }
    if (zoneOf[i] >= 0) values[i] = zones[zoneOf[i]].value;
  }
  if (orphans) {
    warnings.push({
      code: 'surface-outside-zones',
      message: `${label}: ${orphans} field cell${orphans > 1 ? 's are' : ' is'} in no sample zone and take${orphans > 1 ? '' : 's'} the nearest zone's value. Check that the zone polygons cover the field.`,
      field: label,
    });
  }
  return { values, zoneOf, warnings };
}

/** Distance from a point to the nearest ring edge of the parts (0 is never returned for inside points: callers use it for outside points). */
function distToParts(parts: RingsPart[], x: number, y: number): number {
  let best = Infinity;
  for (const p of parts) {
    for (const r of [p.exterior, ...p.holes]) {
      const n = r.length >> 1;
      for (let i = 0, j = n - 1; i < n; j = i++) {
        const ax = r[2 * j],
          ay = r[2 * j + 1],
          bx = r[2 * i],
          by = r[2 * i + 1];
        const dx = bx - ax,
          dy = by - ay;
        const L = dx * dx + dy * dy;
        const t = L > 0 ? Math.max(0, Math.min(1, ((x - ax) * dx + (y - ay) * dy) / L)) : 0;
        const ex = ax + t * dx - x,
          ey = ay + t * dy - y;
        best = Math.min(best, ex * ex + ey * ey);
      }
    }
  }
  return Math.sqrt(best);
}
