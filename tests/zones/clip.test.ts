import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  boundaryCells,
  clipParts,
  clipPartsPolyclip,
  labelComponents,
  traceZones,
} from '../../src/zones/index.js';
import * as polyclip from 'polyclip-ts';
import { partsArea, ringArea } from '../../src/geo/area.js';
import { fieldFromParts, gridFor, ring, X0, Y0 } from './fixtures.js';
import { tierRuns } from '../helpers/runs.js';

const starField = (radii: number[], holeR: number | null) => {
  const pts = radii.map((r, i) => {
    const t = (2 * Math.PI * i) / radii.length;
    return [X0 + 100.37 + 90 * r * Math.cos(t), Y0 + 95.11 + 90 * r * Math.sin(t)] as [number, number];
  });
  const holes = holeR
    ? [
        ring(
          [
            [X0 + 100, Y0 + 90],
            [X0 + 100 + holeR, Y0 + 90],
            [X0 + 100, Y0 + 90 + holeR],
          ],
          false,
        ),
      ]
    : [];
  return fieldFromParts([{ exterior: ring(pts, true), holes }]);
};

describe('clipping to the boundary', () => {
  it('JTS and polyclip-ts (two independent overlay engines) give the same clipped areas', () => {
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: 0.5, max: 1, noNaN: true }), { minLength: 7, maxLength: 7 }),
        fc.option(fc.double({ min: 5, max: 30, noNaN: true }), { nil: null }),
        fc.integer({ min: 1, max: 1e6 }),
        (radii, holeR, seed) => {
          const field = starField(radii, holeR);
          const grid = gridFor(field, 6);
          let s = seed;
          const cls = new Int16Array(grid.cols * grid.rows);
          for (let i = 0; i < cls.length; i++) {
            s = (s * 1103515245 + 12345) & 0x7fffffff;
            cls[i] = ((i % grid.cols) >> 3) + ((s >> 10) % 7 === 0 ? 1 : 0);
          }
          const { label, count } = labelComponents(cls, grid.cols, grid.rows);
          const traced = traceZones(label, count, grid);
          let total = 0;
          for (const parts of traced) {
            const a = partsArea(clipParts(parts, field.parts, grid.xmin, grid.ymax));
            const b = partsArea(clipPartsPolyclip(parts, field.parts, grid.xmin, grid.ymax));
            expect(Math.abs(a - b)).toBeLessThan(1e-6 * Math.max(1, b));
            total += a;
          }
          expect(Math.abs(total - field.areaM2)).toBeLessThan(1e-6 * field.areaM2);
        },
      ),
      { numRuns: tierRuns(6) },
    );
  });

  it('boundaryCells marks every cell the boundary cuts (oracle: each cell square clipped by polyclip-ts)', () => {
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: 0.5, max: 1, noNaN: true }), { minLength: 6, maxLength: 6 }),
        fc.constantFrom(7, 9.5, 13),
        (radii, cell) => {
          const field = starField(radii, 12);
          const grid = gridFor(field, cell);
          const band = boundaryCells(field.parts, grid);
          const geom = field.parts.map((p) =>
            [p.exterior, ...p.holes].map((r) => {
              const o: [number, number][] = [];
              for (let i = 0; i < r.length; i += 2) o.push([r[i] - grid.xmin, r[i + 1] - grid.ymax]);
              return o;
            }),
          );
          for (let r = 0; r < grid.rows; r++)
            for (let c = 0; c < grid.cols; c++) {
              const x = c * cell,
                y = -r * cell;
              const sq = [
                [
                  [x, y - cell],
                  [x + cell, y - cell],
                  [x + cell, y],
                  [x, y],
                  [x, y - cell],
                ],
              ];
              const res = polyclip.intersection(sq as polyclip.Geom, geom as polyclip.Geom) as [
                number,
                number,
              ][][][];
              const a =
                res.reduce(
                  (t, poly) =>
                    t +
                    poly.reduce(
                      (u, rr, k) => u + (k === 0 ? 1 : -1) * Math.abs(ringArea(Float64Array.from(rr.flat()))),
                      0,
                    ),
                  0,
                ) /
                (cell * cell);
              if (a > 1e-9 && a < 1 - 1e-9) expect(band[r * grid.cols + c]).toBe(1);
            }
        },
      ),
      { numRuns: tierRuns(6) },
    );
  });
});
