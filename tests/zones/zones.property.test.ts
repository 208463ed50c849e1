/**
 * Invariants of makeZones over random fields (polygons with holes, several parts) and random class
 * rasters: zones do not overlap, their union is the field within 0.01 % of its area, every zone is valid
 * (turf booleanValid, an independent OGC validity check), every sample point lies in exactly one zone.
 * Overlap and union areas are measured with polyclip-ts, independently of the tracer.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import * as turf from '@turf/turf';
import * as polyclip from 'polyclip-ts';
import type { RingsPart } from '../../src/types.js';
import { labelComponents, makeZones, pointInRing, robust, traceZones } from '../../src/zones/index.js';
import { partsArea } from '../../src/geo/area.js';
import { fieldFromParts, gridFor, ring, X0, Y0 } from './fixtures.js';
import { tierRuns } from '../helpers/runs.js';

const local = (parts: RingsPart[]) =>
  parts.map((p) =>
    [p.exterior, ...p.holes].map((r) => {
      const o: [number, number][] = [];
      for (let i = 0; i < r.length; i += 2) o.push([r[i] - X0, r[i + 1] - Y0]);
      return o;
    }),
  );
const geomArea = (g: [number, number][][][]) =>
  g.reduce(
    (s, poly) =>
      s +
      poly.reduce((t, r, k) => {
        const a = shoelace(r);
        return t + (k === 0 ? a : -a);
      }, 0),
    0,
  );
function shoelace(r: [number, number][]): number {
  let s = 0;
  for (let i = 0; i + 1 < r.length; i++) s += r[i][0] * r[i + 1][1] - r[i + 1][0] * r[i][1];
  return Math.abs(s) / 2;
}
const inParts = (parts: RingsPart[], x: number, y: number) =>
  parts.some((p) => pointInRing(p.exterior, x, y) && !p.holes.some((h) => pointInRing(h, x, y)));

/** A random star-shaped polygon around (cx, cy) with radii in [rmin, rmax]. */
const star = (n: number) =>
  fc.array(fc.double({ min: 0.55, max: 1, noNaN: true }), { minLength: n, maxLength: n });

const fieldArb = fc.record({
  outer: star(9),
  hole: fc.option(star(5), { nil: undefined }),
  second: fc.boolean(),
  cell: fc.constantFrom(4, 5, 7.3),
  seed: fc.integer({ min: 1, max: 1e6 }),
  classes: fc.integer({ min: 1, max: 6 }),
  method: fc.constantFrom('equal', 'quantile', 'jenks', 'kmeans' as const),
  minArea: fc.constantFrom(0, 300, 2000),
  iters: fc.integer({ min: 0, max: 2 }),
  simplify: fc.constantFrom(0, 1, 1.5, 3),
  minDiff: fc.option(fc.constantFrom(5, 10, 25), { nil: undefined }),
});

/** A judge like the rate judge: a zone's "rate" is its mean rounded to a step of 5; apart when rates differ by minDiff. */
const stepJudge = (minDiff: number) => ({
  layers: [] as Float64Array[],
  profile: (m: Float64Array) => Math.round(m[0] / 5) * 5,
  compare: (a: number, b: number) => ({
    apart: Math.abs(a - b) >= minDiff,
    score: Math.abs(a - b),
    why: Math.abs(a - b) >= minDiff ? `differs by ${Math.abs(a - b)}` : null,
  }),
});

function makeField(a: { outer: number[]; hole?: number[]; second: boolean }) {
  const starRing = (radii: number[], cx: number, cy: number, R: number, ccw: boolean) =>
    ring(
      radii.map((r, i) => {
        const t = (2 * Math.PI * i) / radii.length;
        return [cx + R * r * Math.cos(t), cy + R * r * Math.sin(t)] as [number, number];
      }),
      ccw,
    );
  const parts: RingsPart[] = [
    {
      exterior: starRing(a.outer, X0 + 150.3, Y0 + 140.7, 140, true),
      holes: a.hole ? [starRing(a.hole, X0 + 150.3, Y0 + 140.7, 30, false)] : [],
    },
  ];
  if (a.second)
    parts.push({ exterior: starRing(a.outer.slice(0, 6), X0 + 380, Y0 + 90, 50, true), holes: [] });
  return fieldFromParts(parts);
}

function noise(seed: number, cols: number, rows: number, fraction: Float32Array): Float64Array {
  let s = seed >>> 0;
  const rnd = () => {
    s = (s * 1664525 + 1013904223) >>> 0;
    return s / 4294967296;
  };
  const v = new Float64Array(cols * rows);
  const f1 = 0.05 + rnd() * 0.3,
    f2 = 0.05 + rnd() * 0.3,
    amp = rnd() * 30;
  for (let r = 0; r < rows; r++)
    for (let c = 0; c < cols; c++) {
      const i = r * cols + c;
      v[i] = fraction[i] > 0 ? 50 + 40 * Math.sin(c * f1 + seed) * Math.cos(r * f2) + amp * rnd() : NaN;
    }
  return v;
}

type FieldCase = {
  outer: number[];
  hole?: number[];
  second: boolean;
  cell: number;
  seed: number;
  classes: number;
  method: 'equal' | 'quantile' | 'jenks' | 'kmeans';
  minArea: number;
  iters: number;
  simplify: number;
  minDiff?: number;
};

/**
 * Zones of a random field checked against every invariant: valid, no overlaps, union = field, each sample
 * (`pts`: fractions of the field's bounding box) in exactly one zone, no zone under the minimum unless isolated.
 */
function checkZones(a: FieldCase, pts: [number, number][]): void {
  const field = makeField(a);
  const grid = gridFor(field, a.cell);
  const v = noise(a.seed, grid.cols, grid.rows, grid.fraction);
  const judge = a.minDiff === undefined ? undefined : { ...stepJudge(a.minDiff), layers: [v] };
  const zs = makeZones(grid, v, field, {
    method: a.method,
    classes: a.classes,
    minAreaM2: a.minArea,
    majorityIterations: a.iters,
    lonlat: false,
    simplifyCells: a.simplify,
    judge,
  });
  expect(zs.zones.length).toBeGreaterThan(0);
  if (judge) {
    // no two neighbouring zones (sharing a cell edge) whose rates differ by less than the minimum difference
    for (let r = 0; r < grid.rows; r++)
      for (let c = 0; c < grid.cols; c++) {
        const i = r * grid.cols + c,
          p = zs.zoneOfCell[i];
        for (const j of [c + 1 < grid.cols ? i + 1 : -1, r + 1 < grid.rows ? i + grid.cols : -1]) {
          const q = j >= 0 ? zs.zoneOfCell[j] : -1;
          if (p >= 0 && q >= 0 && p !== q && zs.classOfCell[i] !== zs.classOfCell[j])
            expect(
              Math.abs((zs.profiles![p] as number) - (zs.profiles![q] as number)),
            ).toBeGreaterThanOrEqual(a.minDiff!);
        }
      }
    // a zone's rate is its rate class's: the area-weighted mean over every cell of the class's zones, rounded
    const sum = new Map<number, [number, number]>();
    for (let i = 0; i < v.length; i++) {
      const z = zs.zoneOfCell[i];
      if (z < 0 || v[i] !== v[i]) continue;
      const k = zs.zones[z].cls,
        acc = sum.get(k) ?? [0, 0];
      acc[0] += v[i] * grid.fraction[i];
      acc[1] += grid.fraction[i];
      sum.set(k, acc);
    }
    zs.zones.forEach((z, k) => {
      const [sv, sw] = sum.get(z.cls)!;
      expect(zs.profiles![k]).toBe(Math.round(sv / sw / 5) * 5);
    });
  }
  // without a judge the classes are the classifier's; with one, rate classes (each zone its pooled mean's rate)
  if (!judge) expect(zs.classCount).toBeLessThanOrEqual(a.classes);
  else expect(zs.classCount).toBe(new Set(zs.zones.map((z) => z.cls)).size);
  // validity (turf booleanValid, local coordinates)
  // turf booleanValid per polygon; the parts of one zone may touch at a point (valid in OGC simple features,
  // but turf's MultiPolygon check reports a point touch as a crossing), so parts are checked for overlap by area.
  // GDAL's ST_IsValid (GEOS) checks the whole MultiPolygons in gdal.tool.test.ts.
  for (const z of zs.zones) {
    const polys = local(z.parts);
    for (const poly of polys) expect(turf.booleanValid(turf.polygon(poly))).toBe(true);
    for (let i = 0; i < polys.length; i++)
      for (let j = i + 1; j < polys.length; j++) {
        const inter = robust(() =>
          polyclip.intersection(polys[i] as polyclip.Geom, polys[j] as polyclip.Geom),
        ) as [number, number][][][];
        expect(geomArea(inter)).toBeLessThan(1e-9);
      }
  }
  // coverage: the sum of zone areas and the area of their union both equal the field's
  const sum = zs.zones.reduce((s, z) => s + z.areaM2, 0);
  expect(Math.abs(sum - field.areaM2)).toBeLessThan(1e-4 * field.areaM2);
  const uni = robust(() =>
    polyclip.union(
      local(zs.zones[0].parts) as polyclip.Geom,
      ...zs.zones.slice(1).map((z) => local(z.parts) as polyclip.Geom),
    ),
  );
  expect(Math.abs(geomArea(uni as [number, number][][][]) - field.areaM2)).toBeLessThan(1e-4 * field.areaM2);
  // no overlaps: union area equals the sum of areas (any overlap makes the sum larger)
  expect(sum - geomArea(uni as [number, number][][][])).toBeLessThan(1e-6 * field.areaM2);
  // samples inside the field: exactly one zone each
  const [x0, y0, x1, y1] = field.bbox;
  for (const [u, w] of pts) {
    const x = x0 + u * (x1 - x0),
      y = y0 + w * (y1 - y0);
    if (!inParts(field.parts, x, y)) continue;
    const hits = zs.zones.filter((z) => inParts(z.parts, x, y)).length;
    expect(hits).toBe(1);
  }
  // every cell with a share of the field has a zone, and smoothing leaves each zone at least half its area from
  // cells: edges move between neighbours, never a whole zone (or most of it) across the field boundary
  const cellArea = new Float64Array(zs.zones.length);
  for (let i = 0; i < grid.fraction.length; i++) {
    if (!(grid.fraction[i] > 0)) continue;
    expect(zs.zoneOfCell[i]).toBeGreaterThanOrEqual(0);
    cellArea[zs.zoneOfCell[i]] += grid.fraction[i] * a.cell * a.cell;
  }
  zs.zones.forEach((z, k) => expect(z.areaM2).toBeGreaterThanOrEqual(0.5 * cellArea[k] * (1 - 1e-6)));
  // zones below the minimum remain only when they have no neighbour (an isolated field part)
  const small = zs.zones.filter((z) => z.areaM2 < a.minArea - 1e-6);
  expect(small.length).toBeLessThanOrEqual(field.parts.length);
}

describe('makeZones invariants (fast-check)', () => {
  it('zones are valid, do not overlap, cover the field, and each sample lies in exactly one', () => {
    fc.assert(
      fc.property(
        fieldArb,
        fc.array(
          fc.tuple(fc.double({ min: 0, max: 1, noNaN: true }), fc.double({ min: 0, max: 1, noNaN: true })),
          { minLength: 20, maxLength: 20 },
        ),
        (a, pts) => checkZones(a, pts),
      ),
      { numRuns: tierRuns(15), seed: 20261202 },
    ); // fixed seed so CI is repeatable
  });

  it('regression: a thin zone along the field edge is not smoothed away (3-cell tolerance)', () => {
    // fast-check's shrunk counterexample (seed -99315317): a 2-cell zone on the west edge holds a third of a
    // cell of the field; smoothing its border to 3 cells put its polygon wholly outside the boundary, so after
    // clipping the zone, and with it a rate class, was gone and its cells had no zone
    checkZones(
      {
        outer: [
          0.55, 0.55, 0.7264456298238889, 0.9619771562761349, 0.724401012264093, 0.5518706599596876, 0.55,
          0.55, 0.55,
        ],
        hole: undefined,
        second: false,
        cell: 4,
        seed: 999994,
        classes: 4,
        method: 'equal',
        minArea: 0,
        iters: 1,
        simplify: 3,
        minDiff: 5,
      },
      Array.from({ length: 20 }, () => [0, 0] as [number, number]),
    );
  });

  it('regression: a hole touching its exterior keeps the touch as a vertex of both rings (3-cell tolerance)', () => {
    // counterexample from seed 429 (shrunk greedily, turf booleanValid as the oracle): a small zone inside zone 1
    // touches zone 1's exterior at a junction node; smoothing made the exterior run straight through that node,
    // the node was dropped as a straight-on vertex, and after clipping the hole's vertex sat a hair outside the
    // exterior's edge (GEOS: self-intersection at 171.4, 212.3)
    checkZones(
      {
        outer: [
          0.55, 0.55, 0.8359548432705255, 0.9787698501137609, 0.5911474971712468, 0.7357710485492489, 0.55,
          0.55, 0.9999999999999992,
        ],
        hole: undefined,
        second: false,
        cell: 7.3,
        seed: 574453,
        classes: 3,
        method: 'equal',
        minArea: 0,
        iters: 0,
        simplify: 3,
        minDiff: undefined,
      },
      Array.from({ length: 20 }, (_, i) => [(i % 5) / 4, Math.floor(i / 5) / 3] as [number, number]),
    );
  });

  it('tracing random noise rasters (many corner-only contacts) gives valid zones with the cell-count area', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 2, max: 14 }),
        fc.integer({ min: 2, max: 14 }),
        fc.integer({ min: 1, max: 1e6 }),
        fc.integer({ min: 2, max: 3 }),
        (cols, rows, seed, k) => {
          let s = seed;
          const cls = new Int16Array(cols * rows);
          for (let i = 0; i < cls.length; i++) {
            s = (s * 1103515245 + 12345) & 0x7fffffff;
            cls[i] = ((s >> 8) % (k + 1)) - 1;
          } // -1 = no zone
          const { label, count } = labelComponents(cls, cols, rows);
          const traced = traceZones(label, count, { xmin: 0, ymax: 0, cell: 1, cols, rows });
          const cells = new Float64Array(count);
          for (const l of label) if (l >= 0) cells[l]++;
          for (let z = 0; z < count; z++) {
            expect(partsArea(traced[z])).toBeCloseTo(cells[z], 9);
            const g = traced[z].map((p) =>
              [p.exterior, ...p.holes].map((r) => {
                const o: number[][] = [];
                for (let i = 0; i < r.length; i += 2) o.push([r[i], r[i + 1]]);
                return o;
              }),
            );
            expect(turf.booleanValid(turf.multiPolygon(g))).toBe(true);
            // every cell centre of the zone is inside its polygon, every other centre outside
            for (let r = 0; r < rows; r++)
              for (let c = 0; c < cols; c++)
                expect(inParts(traced[z], c + 0.5, -r - 0.5)).toBe(label[r * cols + c] === z);
          }
        },
      ),
      { numRuns: tierRuns(150) },
    );
  });
});
