/**
 * Test support for the zone tests: fields in metres and grids over them (mask = centre inside,
 * fraction = exact share inside from polyclip-ts on the cells the boundary crosses).
 */
import * as polyclip from 'polyclip-ts';
import type { Field, Grid, RingsPart } from '../../src/types.js';
import { partsArea, partsBbox, pointInParts, ringArea } from '../../src/geo/area.js';
import { utmZoneFor } from '../../src/geo/utm.js';
import { boundaryCells } from '../../src/zones/index.js';

/** UTM 13N origin near the prairies (coordinates are metres). */
export const X0 = 400000,
  Y0 = 5700000;

export function ring(pts: [number, number][], ccw: boolean): Float64Array {
  const flat = [...pts, pts[0]].flatMap(([x, y]) => [x, y]);
  let r = Float64Array.from(flat);
  if (ringArea(r) > 0 !== ccw) r = Float64Array.from([...pts, pts[0]].reverse().flatMap(([x, y]) => [x, y]));
  return r;
}

/** A Field from parts in metres (planar area as its area; lonlat left empty). */
export function fieldFromParts(parts: RingsPart[], name = 'test'): Field {
  return {
    name,
    lonlat: [],
    parts,
    utm: utmZoneFor(-105, 51.5),
    areaM2: partsArea(parts),
    bbox: partsBbox(parts),
  };
}

export function gridFor(field: Field, cell: number): Grid {
  const [x0, y0, x1, y1] = field.bbox;
  const xmin = Math.floor(x0 / cell) * cell,
    ymax = Math.ceil(y1 / cell) * cell;
  const cols = Math.ceil((x1 - xmin) / cell),
    rows = Math.ceil((ymax - y0) / cell);
  const mask = new Uint8Array(cols * rows),
    fraction = new Float32Array(cols * rows);
  const frame = { xmin, ymax, cell, cols, rows };
  const band = boundaryCells(field.parts, frame);
  const geom = field.parts.map((p) =>
    [p.exterior, ...p.holes].map((r) => {
      const o: [number, number][] = [];
      for (let i = 0; i < r.length; i += 2) o.push([r[i] - xmin, r[i + 1] - ymax]);
      return o;
    }),
  );
  for (let r = 0; r < rows; r++)
    for (let c = 0; c < cols; c++) {
      const i = r * cols + c;
      const cx = xmin + (c + 0.5) * cell,
        cy = ymax - (r + 0.5) * cell;
      const inside = pointInParts(field.parts, cx, cy);
      mask[i] = inside ? 1 : 0;
      if (!band[i]) {
        fraction[i] = inside ? 1 : 0;
        continue;
      }
      const lx = c * cell,
        ly = -r * cell;
      const sq: [number, number][][] = [
        [
          [lx, ly - cell],
          [lx + cell, ly - cell],
          [lx + cell, ly],
          [lx, ly],
          [lx, ly - cell],
        ],
      ];
      const res = polyclip.intersection(sq as polyclip.Geom, geom as polyclip.Geom) as [number, number][][][];
      let a = 0;
      for (const poly of res)
        poly.forEach((rr, k) => {
          const f = Float64Array.from(rr.flat());
          a += k === 0 ? Math.abs(ringArea(f)) : -Math.abs(ringArea(f));
        });
      fraction[i] = Math.min(1, a / (cell * cell));
    }
  return { xmin, ymax, cell, cols, rows, mask, fraction };
}
