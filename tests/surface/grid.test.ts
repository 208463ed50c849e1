/**
 * Field grid: centre mask against turf's booleanPointInPolygon, edge fractions against polyclip-ts
 * intersection areas (both outside libraries), and the area identity sum(fraction * cell^2) = field area.
 */
import * as turf from '@turf/turf';
import fc from 'fast-check';
import * as polyclip from 'polyclip-ts';
import { describe, expect, it } from 'vitest';
import { fieldGrid, gridWarnings } from '../../src/surface/grid.js';
import { orient } from '../../src/geo/field.js';
import { isUserError } from '../../src/errors.js';
import type { RingsPart } from '../../src/types.js';

const OX = 512345.25,
  OY = 5678901.75; // UTM-sized offsets, like a real field

/** A star-shaped (hence simple) ring around (cx, cy) from radii at sorted angles. */
function star(cx: number, cy: number, radii: number[], ccw: boolean): Float64Array {
  const n = radii.length,
    pts: number[] = [];
  for (let i = 0; i < n; i++) {
    const a = (2 * Math.PI * i) / n;
    pts.push(cx + radii[i] * Math.cos(a), cy + radii[i] * Math.sin(a));
  }
  pts.push(pts[0], pts[1]);
  return orient(new Float64Array(pts), ccw);
}

function toCoords(r: Float64Array): [number, number][] {
  const out: [number, number][] = [];
  for (let i = 0; i < r.length; i += 2) out.push([r[i], r[i + 1]]);
  return out;
}

function polyArea(mp: polyclip.Geom extends never ? never : number[][][][]): number {
  let a = 0;
  for (const poly of mp)
    poly.forEach((ring, k) => {
      let s = 0;
      for (let i = 0; i + 1 < ring.length; i++)
        s += ring[i][0] * ring[i + 1][1] - ring[i + 1][0] * ring[i][1];
      a += (k === 0 ? 1 : -1) * Math.abs(s / 2);
    });
  return a;
}

const fieldArb = fc.record({
  outer: fc.array(fc.double({ min: 150, max: 400, noNaN: true }), { minLength: 5, maxLength: 14 }),
  hole: fc.array(fc.double({ min: 20, max: 60, noNaN: true }), { minLength: 3, maxLength: 8 }),
  cell: fc.constantFrom(20, 33.3, 50, 77),
});

describe('fieldGrid', () => {
  it('mask = cell centre inside (turf booleanPointInPolygon), fraction = clipped area (polyclip-ts), areas add up', () => {
    fc.assert(
      fc.property(fieldArb, ({ outer, hole, cell }) => {
        // coordinates relative to the offsets for the outside libraries (they work in plain numbers)
        const ext = star(0, 0, outer, true),
          h = star(5, -3, hole, false);
        const parts: RingsPart[] = [
          {
            exterior: ext.map((v, i) => v + (i % 2 ? OY : OX)),
            holes: [h.map((v, i) => v + (i % 2 ? OY : OX))],
          },
        ];
        const g = fieldGrid({ parts, name: 't' }, cell);
        const poly = turf.polygon([toCoords(ext), toCoords(h)]);
        const clipPoly: polyclip.Geom = [toCoords(ext), toCoords(h)];
        let total = 0;
        for (let r = 0; r < g.rows; r++)
          for (let c = 0; c < g.cols; c++) {
            const i = r * g.cols + c;
            const x0 = g.xmin - OX + c * cell,
              y1 = g.ymax - OY - r * cell;
            const inside = turf.booleanPointInPolygon([x0 + cell / 2, y1 - cell / 2], poly, {
              ignoreBoundary: false,
            });
            expect(g.mask[i], `cell ${c},${r} centre`).toBe(inside ? 1 : 0);
            total += g.fraction[i] * cell * cell;
            // polyclip on every partial cell and every 7th other cell (it is slow)
            if (g.fraction[i] === 1 || g.fraction[i] === 0) {
              if (i % 7) continue;
            }
            const sq: polyclip.Geom = [
              [
                [x0, y1 - cell],
                [x0 + cell, y1 - cell],
                [x0 + cell, y1],
                [x0, y1],
                [x0, y1 - cell],
              ],
            ];
            const clipped = polyArea(polyclip.intersection(clipPoly, sq) as number[][][][]) / (cell * cell);
            expect(
              Math.abs(g.fraction[i] - clipped),
              `cell ${c},${r} fraction ${g.fraction[i]} vs ${clipped}`,
            ).toBeLessThan(1e-6);
          }
        // planar area from the shoelace formula on the rings (surveyor's formula)
        const area = polyArea([[toCoords(ext), toCoords(h)]]);
        expect(Math.abs(total - area) / area).toBeLessThan(1e-6);
      }),
      { numRuns: 12, seed: 3 },
    );
  });

  it('covers the boundary with whole cells snapped to the cell size', () => {
    const ext = star(OX, OY, [300, 250, 310, 280, 260], true);
    const g = fieldGrid({ parts: [{ exterior: ext, holes: [] }], name: 't' }, 10);
    expect(g.xmin % 10).toBe(0);
    expect(g.ymax % 10).toBe(0);
    let x0 = Infinity,
      x1 = -Infinity,
      y0 = Infinity,
      y1 = -Infinity;
    for (let i = 0; i < ext.length; i += 2) {
      x0 = Math.min(x0, ext[i]);
      x1 = Math.max(x1, ext[i]);
      y0 = Math.min(y0, ext[i + 1]);
      y1 = Math.max(y1, ext[i + 1]);
    }
    expect(g.xmin).toBeLessThanOrEqual(x0);
    expect(g.xmin + g.cols * 10).toBeGreaterThanOrEqual(x1);
    expect(g.ymax).toBeGreaterThanOrEqual(y1);
    expect(g.ymax - g.rows * 10).toBeLessThanOrEqual(y0);
    expect(g.xmin + (g.cols - 1) * 10).toBeLessThan(x1);
  });

  it('refuses more than 50 million cells and names the cell size that fits', () => {
    // a 1 mile section (1609.344 m, US survey foot aside) at 0.2 m = 8047^2 = 64.8 M cells
    const s = 1609.344;
    const ext = orient(new Float64Array([OX, OY, OX + s, OY, OX + s, OY + s, OX, OY + s, OX, OY]), true);
    let err: unknown;
    try {
      fieldGrid({ parts: [{ exterior: ext, holes: [] }], name: 'section' }, 0.2);
    } catch (e) {
      err = e;
    }
    expect(isUserError(err)).toBe(true);
    expect(String((err as Error).message)).toMatch(/more than the 50,000,000 allowed.*at least 0\.2\d* m/);
    // 1 m cells: 2.6 M cells, accepted
    expect(fieldGrid({ parts: [{ exterior: ext, holes: [] }], name: 'section' }, 1).cols).toBe(1610);
  });

  it('a field smaller than one cell gets one or a few partial cells and a warning', () => {
    const ext = orient(
      new Float64Array([OX + 1, OY + 1, OX + 4, OY + 1, OX + 4, OY + 3, OX + 1, OY + 1]),
      true,
    );
    const g = fieldGrid({ parts: [{ exterior: ext, holes: [] }], name: 'tiny' }, 10);
    let s = 0;
    for (const f of g.fraction) s += f;
    expect(s * 100).toBeCloseTo(3, 6); // triangle 3 x 2 / 2 = 3 m2
    expect(gridWarnings(g, 'tiny')[0].message).toMatch(/smaller than one 10 m cell/);
  });
});
