/**
 * Shared-arc simplification (src/zones/arcs.ts, simplify.ts) over random zone rasters, checked with outside
 * geometry code: every smoothed zone is a valid polygon (turf booleanValid), the union of the zones (polyclip-ts)
 * is the raster's rectangle and their areas add up to it (no gap, no overlap), and no vertex moves further
 * than the tolerance from the staircase it replaces (each vertex kept is one of the staircase's corners).
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import * as turf from '@turf/turf';
import * as polyclip from 'polyclip-ts';
import {
  arcsToParts,
  labelComponents,
  makeZones,
  ringsVertexCount,
  robust,
  simplifyArcs,
  traceZones,
  zoneArcs,
} from '../../src/zones/index.js';
import { partsArea } from '../../src/geo/area.js';
import type { RingsPart } from '../../src/types.js';
import { fieldFromParts, gridFor, ring, X0, Y0 } from './fixtures.js';
import { tierRuns } from '../helpers/runs.js';

const geom = (parts: RingsPart[]) =>
  parts.map((p) =>
    [p.exterior, ...p.holes].map((r) => {
      const o: [number, number][] = [];
      for (let i = 0; i < r.length; i += 2) o.push([r[i], r[i + 1]]);
      return o;
    }),
  );
const area = (g: [number, number][][][]) =>
  g.reduce(
    (s, poly) =>
      s +
      poly.reduce((t, r, k) => {
        let a = 0;
        for (let i = 0; i + 1 < r.length; i++) a += r[i][0] * r[i + 1][1] - r[i + 1][0] * r[i][1];
        return t + (k === 0 ? 1 : -1) * Math.abs(a / 2);
      }, 0),
    0,
  );

/** A class raster: smooth waves (long borders) plus a share of noise (speckle, corner contacts, islands). */
function raster(cols: number, rows: number, seed: number, k: number, noise: number): Int16Array {
  let s = seed >>> 0;
  const rnd = () => {
    s = (s * 1664525 + 1013904223) >>> 0;
    return s / 4294967296;
  };
  const f1 = 0.05 + rnd() * 0.4,
    f2 = 0.05 + rnd() * 0.4,
    ph = rnd() * 6;
  const out = new Int16Array(cols * rows);
  for (let r = 0; r < rows; r++)
    for (let c = 0; c < cols; c++) {
      const v = (Math.sin(c * f1 + ph) * Math.cos(r * f2) + 1) / 2;
      out[r * cols + c] = rnd() < noise ? Math.floor(rnd() * k) : Math.min(k - 1, Math.floor(v * k));
    }
  return out;
}

describe('simplifying shared arcs', () => {
  it('keeps a planar partition: valid zones, union = the raster, areas add up, vertices within the tolerance', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 3, max: 40 }),
        fc.integer({ min: 3, max: 40 }),
        fc.integer({ min: 1, max: 1e6 }),
        fc.integer({ min: 2, max: 4 }),
        fc.constantFrom(0, 0.02, 0.2),
        fc.constantFrom(1, 1.5, 2.5, 4),
        (cols, rows, seed, k, noise, tol) => {
          const { label, count } = labelComponents(raster(cols, rows, seed, k, noise), cols, rows);
          const frame = { xmin: 0, ymax: 0, cell: 1, cols, rows };
          const a = zoneArcs(label, count, frame);
          // the staircase rebuilt from the arcs is the tracer's output
          const stair = arcsToParts(a, simplifyArcs(a, 0), frame),
            traced = traceZones(label, count, frame);
          for (let z = 0; z < count; z++) expect(partsArea(stair[z])).toBeCloseTo(partsArea(traced[z]), 9);
          const smooth = simplifyArcs(a, tol);
          expect(ringsVertexCount(a, smooth)).toBeLessThanOrEqual(ringsVertexCount(a, simplifyArcs(a, 0)));
          const parts = arcsToParts(a, smooth, frame);
          let sum = 0;
          for (let z = 0; z < count; z++) {
            expect(parts[z].length).toBeGreaterThan(0);
            for (const poly of geom(parts[z])) expect(turf.booleanValid(turf.polygon(poly))).toBe(true);
            sum += partsArea(parts[z]);
          }
          expect(sum).toBeCloseTo(cols * rows, 6);
          const uni = robust(() =>
            polyclip.union(
              geom(parts[0]) as polyclip.Geom,
              ...parts.slice(1).map((p) => geom(p) as polyclip.Geom),
            ),
          ) as [number, number][][][];
          expect(area(uni)).toBeCloseTo(cols * rows, 6);
          // every staircase corner lies within the tolerance of its smoothed arc (distance to the nearest segment)
          const W = cols + 1,
            xy = (key: number) => [key % W, Math.floor(key / W)];
          a.arcs.forEach((orig, q) => {
            const segs = smooth[q];
            for (const key of orig) {
              const [px, py] = xy(key);
              let best = Infinity;
              for (let t = 0; t + 1 < segs.length; t++) {
                const [ax, ay] = xy(segs[t]),
                  [bx, by] = xy(segs[t + 1]);
                const dx = bx - ax,
                  dy = by - ay,
                  L = dx * dx + dy * dy;
                const u = L > 0 ? Math.max(0, Math.min(1, ((px - ax) * dx + (py - ay) * dy) / L)) : 0;
                best = Math.min(best, Math.hypot(ax + u * dx - px, ay + u * dy - py));
              }
              if (segs.length > 1) expect(best).toBeLessThanOrEqual(tol + 1e-9);
            }
          });
        },
      ),
      { numRuns: tierRuns(120) },
    );
  });
});

describe('smoothing in makeZones', () => {
  it('rate classes of several zones do not change the smoothing (each zone is judged by its own area)', () => {
    // five wavy stripes, classes A B A B A: with a judge, the three A stripes form one rate class and the two B
    // stripes another. Smoothing keeps a zone's staircase only if it would lose half its own area, so the zones
    // must come out exactly as without a judge (a zone judged by its rate class's pooled area kept its staircase)
    const W0 = 250,
      H0 = 120,
      cell = 2;
    const field = fieldFromParts([
      {
        exterior: ring(
          [
            [X0, Y0],
            [X0 + W0, Y0],
            [X0 + W0, Y0 + H0],
            [X0, Y0 + H0],
          ],
          true,
        ),
        holes: [],
      },
    ]);
    const grid = gridFor(field, cell);
    const classOf = new Int16Array(grid.cols * grid.rows);
    const value = new Float64Array(grid.cols * grid.rows);
    for (let r = 0; r < grid.rows; r++)
      for (let c = 0; c < grid.cols; c++) {
        const x = (c + 0.5) * cell + 9 * Math.sin((r * cell) / 11),
          stripe = Math.max(0, Math.min(4, Math.floor(x / 50)));
        classOf[r * grid.cols + c] = stripe % 2;
        value[r * grid.cols + c] = stripe % 2 ? 50 : 10;
      }
    const judge = {
      layers: [value],
      profile: (m: Float64Array) => m[0],
      compare: (a: number, b: number) => ({ apart: Math.abs(a - b) >= 5, score: Math.abs(a - b), why: null }),
    };
    const opts = { minAreaM2: 0, majorityIterations: 0, lonlat: false, simplifyCells: 2 };
    const plain = makeZones(grid, { classOf }, field, opts);
    const rated = makeZones(grid, { classOf }, field, { ...opts, judge });
    expect(plain.zones.length).toBe(5);
    expect(rated.counts.rateClasses).toBe(2);
    expect(rated.vertices).toEqual(plain.vertices);
    expect(rated.vertices.simplified).toBeLessThan(rated.vertices.traced / 2);
    rated.zones.forEach((z, k) => expect(partsArea(z.parts)).toBeCloseTo(partsArea(plain.zones[k].parts), 6));
  });
});
