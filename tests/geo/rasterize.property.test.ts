/**
 * The scanline rasterizer (src/geo/rasterize.ts) against a brute-force oracle: each cell centre tested
 * against every polygon with @turf/boolean-point-in-polygon (an outside implementation).
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { booleanPointInPolygon } from '@turf/turf';
import { rasterizeLonLat, type LonLatFrame } from '../../src/geo/rasterize.js';

/** A star-shaped ring around (cx, cy): angles sorted, radii random, so it never crosses itself. */
const star = (cx: number, cy: number, radii: number[]): number[][] => {
  const ring = radii.map((r, i) => {
    const a = (2 * Math.PI * i) / radii.length;
    return [cx + r * Math.cos(a), cy + r * Math.sin(a)];
  });
  return [...ring, ring[0]];
};

describe('rasterizeLonLat', () => {
  it('gives each cell the polygon holding its centre (turf point-in-polygon oracle), holes included', () => {
    fc.assert(
      fc.property(
        fc.array(
          fc.record({
            cx: fc.double({ min: 1, max: 9, noNaN: true }),
            cy: fc.double({ min: 1, max: 9, noNaN: true }),
            radii: fc.array(fc.double({ min: 0.3, max: 3, noNaN: true }), { minLength: 3, maxLength: 12 }),
            hole: fc.boolean(),
          }),
          { minLength: 1, maxLength: 3 },
        ),
        fc.integer({ min: 3, max: 25 }),
        fc.integer({ min: 3, max: 25 }),
        (shapes, cols, rows) => {
          const polys = shapes.map((s) => {
            const outer = star(s.cx, s.cy, s.radii);
            return s.hole
              ? [
                  [
                    outer,
                    star(
                      s.cx,
                      s.cy,
                      s.radii.map(() => 0.1),
                    ).reverse(),
                  ],
                ]
              : [[outer]];
          });
          const f: LonLatFrame = { south: 0, west: 0, cellNorth: 10 / rows, cellEast: 10 / cols, cols, rows };
          const got = rasterizeLonLat(polys, f);
          for (let r = 0; r < rows; r++)
            for (let c = 0; c < cols; c++) {
              const pt = [(c + 0.5) * f.cellEast, (r + 0.5) * f.cellNorth];
              let want = -1;
              polys.forEach((p, i) => {
                if (booleanPointInPolygon(pt, { type: 'MultiPolygon', coordinates: p })) want = i;
              });
              // a centre exactly on an edge may go either way; skip those (measure zero for random shapes)
              if (got[r * cols + c] !== want) {
                const onEdge = polys.some(
                  (p) =>
                    booleanPointInPolygon(pt, { type: 'MultiPolygon', coordinates: p }) !==
                    booleanPointInPolygon(
                      pt,
                      { type: 'MultiPolygon', coordinates: p },
                      { ignoreBoundary: true },
                    ),
                );
                expect(onEdge).toBe(true);
              }
            }
        },
      ),
      { numRuns: 200, seed: 13 },
    );
  });
});
