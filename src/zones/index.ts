/**
 * Management zones: rate classes -> cleaned class raster -> traced polygons clipped to the field.
 * Pure functions on flat typed arrays; see docs/zones.md for the method.
 */
import type { Field, Grid, RingsPart, Warning } from '../types.js';
import { partsArea } from '../geo/area.js';
import { projector as makeProjector, type Projector } from '../geo/utm.js';
import { M2_PER_AC } from '../units/index.js';
import { classify, type Classes, type ClassifyOptions } from './classify.js';
import { fillUnclassed, majorityFilter, mergeSmallZones, type Merged } from './clean.js';
import { mergeGraph, mergeRegions, type RegionJudge } from './regions.js';
import { toLonLat, zonePolygons, type ZoneVertices } from './polygons.js';

export { classify, classifyVectors } from './classify.js';
export { jenksUppers, kmeans1d } from './breaks.js';
export type { Classes, ClassMethod, ClassifyOptions, VectorClasses } from './classify.js';
export { fillUnclassed, labelComponents, majorityFilter, mergeSmallZones, minZoneAreaM2 } from './clean.js';
export type { Merged } from './clean.js';
export { boundaryCells, clipParts, clipPartsPolyclip, robust } from './clip.js';
export { traceZones, pointInRing } from './trace.js';
export { zoneMeans } from './means.js';
export { zoneArcs, arcsToParts, ringsVertexCount, vertexCount } from './arcs.js';
export type { ZoneArcs } from './arcs.js';
export { simplifyArcs } from './simplify.js';
export { mergeGraph, mergeRegions, regionGraph } from './regions.js';
export type { MergedRegions, RegionGraph, RegionJudge } from './regions.js';
export type { RasterFrame } from './trace.js';
export { toLonLat } from './polygons.js';
export type { ZoneVertices } from './polygons.js';
export { zonesFromSampleZones } from './composite.js';
export type { SampledZone } from './composite.js';

/** One management zone. */
export interface Zone {
  /** 0-based, in raster scan order of the zone's first cell (north-west first) */
  id: number;
  /** rate class 0..classCount-1 (0 = lowest) */
  cls: number;
  /** polygon parts in metres (field's UTM zone), exteriors CCW, holes CW */
  parts: RingsPart[];
  /** MultiPolygon coordinates in WGS 84 lon/lat (RFC 7946 winding); empty when `lonlat: false` */
  lonlat: number[][][][];
  /** ground area, m2 (planar UTM area scaled like the field's, so zone areas add up to Field.areaM2) */
  areaM2: number;
}

/** Zones of a field, with the rasters they came from. */
export interface ZoneSet<P = unknown, Why = string> {
  zones: Zone[];
  /** per zone (same order): the judge's profile, when a judge was given */
  profiles: P[] | null;
  /** every pair of neighbouring zones (ids), with the judge's reason for keeping them apart */
  pairs: { a: number; b: number; why: Why | null }[];
  /** how the count came about: classes found, classes after merging, zones after cleaning, zones after merging */
  counts: {
    classes: number;
    classesMerged: number;
    zonesCleaned: number;
    zonesMerged: number;
    rateClasses: number;
    zones: number;
  };
  /** vertices of the zone rings before and after edge simplification (before clipping), and as returned */
  vertices: ZoneVertices;
  /** per cell: class after cleaning (-1 where the cell has no share of the field) */
  classOfCell: Int16Array;
  /** per cell: zone id (-1 where the cell has no share of the field) */
  zoneOfCell: Int32Array;
  /** number of classes present after cleaning */
  classCount: number;
  /** the classes when makeZones classified a driving value itself */
  classes: Classes | null;
  /** minimum zone area used, m2 */
  minAreaM2: number;
  warnings: Warning[];
}

export interface MakeZonesOptions<P = unknown, Why = string> extends ClassifyOptions {
  /** neighbouring classes, then zones, are merged until this judge keeps every neighbouring pair apart; default none */
  judge?: RegionJudge<P, Why>;
  /** edge simplification tolerance in cells (shared borders simplified once, field boundary exact); default 1; 0 = staircase */
  simplifyCells?: number;
  /** majority filter passes (3 x 3); default 1; 0 = none */
  majorityIterations?: number;
  /** zones smaller than this are merged into a neighbour, m2; default 0.5 ac (2023.4 m2); see minZoneAreaM2 */
  minAreaM2?: number;
  /** also give each zone lon/lat coordinates; default true */
  lonlat?: boolean;
  /** projector for lon/lat (default: one built from field.utm) */
  projector?: Projector;
}

/**
 * Builds clean management zones from a driving value per cell (or ready-made classes).
 *
 * Steps: classes (default natural breaks, 5 classes, area-weighted) on cells with a share of the field;
 * 3 x 3 majority filter (1 pass); zones smaller than `minAreaM2` (default 0.5 ac) merged into the neighbour
 * with the longest shared border; cells with no value take their nearest zone so that traced zones cover
 * every edge cell; linear-time tracing of cell edges; zones that reach the boundary clipped to it exactly.
 * The zones do not overlap and together cover the field.
 *
 * @param grid the field grid (mask, fraction)
 * @param input a driving value per cell (NaN = none; e.g. a rate), or classes from classify/classifyVectors
 * @param field the field boundary in metres
 * @example
 * const zs = makeZones(grid, nRate, field, { method: 'jenks', classes: 4, step: 5, minAreaM2: minZoneAreaM2({ swathM: 18.3, speedKmh: 9 }) });
 * zs.zones.map((z) => [z.cls, z.areaM2 / 4046.86]);
 */
export function makeZones<P = unknown, Why = string>(
  grid: Grid,
  input: ArrayLike<number> | { classOf: Int16Array },
  field: Field,
  opts: MakeZonesOptions<P, Why> = {},
): ZoneSet<P, Why> {
  const { raw, classes, warnings } = inputClasses(grid, input, opts);
  let nClasses = 0;
  for (let i = 0; i < raw.length; i++) if (raw[i] + 1 > nClasses) nClasses = raw[i] + 1;
  const judge = opts.judge;
  // 1. neighbouring classes whose rates do not differ enough become one class
  const merged = judge && nClasses > 1 ? mergeClasses(raw, nClasses, grid, judge) : { raw, count: nClasses };
  // 2. speckle, edge cells, small zones
  const minAreaM2 = opts.minAreaM2 ?? 0.5 * M2_PER_AC;
  const cleaned = cleanZones(merged.raw, grid, opts.majorityIterations ?? 1, minAreaM2);
  // 3. neighbouring zones whose rates do not differ enough become one zone; then zones anywhere in the field
  // whose rates do not differ enough form one rate class (one decision), and touching zones of a class join
  const d: Design<P, Why> = judge
    ? rateClassZones(cleaned.zone, cleaned.count, grid, judge)
    : {
        label: cleaned.zone,
        count: cleaned.count,
        classOfZone: cleaned.classOfZone,
        areaM2: cleaned.areaM2,
        profiles: null,
        pairs: neighbourPairs(cleaned.zone, grid.cols, grid.rows),
        zonesMerged: cleaned.count,
        rateClasses: merged.count,
      };
  // 4. polygons: shared borders simplified once, then clipped to the exact boundary
  const poly = zonePolygons(grid, field, d.label, d.count, d.areaM2, opts.simplifyCells ?? 1, minAreaM2);
  const proj = opts.lonlat === false ? null : (opts.projector ?? makeProjector(field.utm));
  const { zones, newId } = zonesOf(poly, d.classOfZone, proj);
  return {
    zones,
    ...cellRasters(grid, d, newId),
    classes,
    minAreaM2,
    warnings,
    profiles: d.profiles ? d.profiles.filter((_, z) => newId[z] >= 0) : null,
    pairs: d.pairs
      .filter((p) => newId[p.a] >= 0 && newId[p.b] >= 0)
      .map((p) => ({ ...p, a: newId[p.a], b: newId[p.b] })),
    counts: {
      classes: nClasses,
      classesMerged: merged.count,
      zonesCleaned: cleaned.count,
      zonesMerged: d.zonesMerged,
      rateClasses: d.rateClasses,
      zones: zones.length,
    },
    vertices: poly.vertices,
  };
}

/** The zones before polygons: a zone raster with each zone's class, area, profile and neighbour pairs. */
interface Design<P, Why> {
  label: Int32Array;
  count: number;
  classOfZone: Int16Array;
  areaM2: Float64Array;
  profiles: P[] | null;
  pairs: ZoneSet<P, Why>['pairs'];
  zonesMerged: number;
  rateClasses: number;
}

/**
 * The class per cell (-1 where the cell has no share of the field) from the caller's classes or by classifying
 * the driving value, with a warning when cells inside the field have none.
 */
function inputClasses(
  grid: Grid,
  input: ArrayLike<number> | { classOf: Int16Array },
  opts: ClassifyOptions,
): { raw: Int16Array; classes: Classes | null; warnings: Warning[] } {
  const n = grid.cols * grid.rows;
  const warnings: Warning[] = [];
  let classes: Classes | null = null;
  let raw: Int16Array;
  if ('classOf' in input) {
    raw = Int16Array.from(input.classOf);
    if (raw.length !== n) throw new RangeError(`classes have ${raw.length} cells, the grid ${n}`);
    for (let i = 0; i < n; i++) if (!(grid.fraction[i] > 0)) raw[i] = -1;
  } else {
    if (input.length !== n) throw new RangeError(`values have ${input.length} cells, the grid ${n}`);
    classes = classify(input, { ...opts, weights: grid.fraction });
    raw = classes.classOf;
  }
  const missing = countMissing(raw, grid.fraction);
  if (missing > 0)
    warnings.push({
      code: 'zones-cell-without-value',
      message: `${missing} cells inside the field have no driving value; they take the nearest zone's class.`,
    });
  return { raw, classes, warnings };
}

/** Classes (every pair, wherever they lie) merged while the judge does not keep them apart. */
function mergeClasses<P, Why>(
  raw: Int16Array,
  nClasses: number,
  grid: Grid,
  judge: RegionJudge<P, Why>,
): { raw: Int16Array; count: number } {
  const { cols, rows, cell } = grid;
  const m = mergeRegions(raw, nClasses, cols, rows, grid.fraction, cell * cell, judge, 'label', true);
  const next = new Int16Array(raw.length);
  for (let i = 0; i < raw.length; i++) next[i] = raw[i] >= 0 ? m.of[raw[i]] : -1;
  return { raw: next, count: m.count };
}

/** Majority filter (`iterations` passes, 0 = none), unclassed cells filled, zones under the minimum merged. */
function cleanZones(raw: Int16Array, grid: Grid, iterations: number, minAreaM2: number): Merged {
  const { cols, rows } = grid;
  const smooth = iterations > 0 ? majorityFilter(raw, cols, rows, iterations) : raw;
  const filled = fillUnclassed(smooth, cols, rows);
  return mergeSmallZones(filled, cols, rows, grid.fraction, grid.cell, minAreaM2);
}

/** The zones that have polygons, numbered in order (`newId`: per zone of the design, its id or -1). */
function zonesOf(
  poly: { parts: RingsPart[][]; scale: number },
  classOfZone: Int16Array,
  proj: Projector | null,
): { zones: Zone[]; newId: Int32Array } {
  const zones: Zone[] = [];
  const newId = new Int32Array(poly.parts.length).fill(-1);
  for (let z = 0; z < poly.parts.length; z++) {
    const parts = poly.parts[z];
    if (parts.length === 0) continue;
    newId[z] = zones.length;
    zones.push({
      id: zones.length,
      cls: classOfZone[z],
      parts,
      lonlat: proj ? toLonLat(parts, proj) : [],
      areaM2: partsArea(parts) * poly.scale,
    });
  }
  return { zones, newId };
}

/** Per cell with a share of the field: its zone's id and class; and the number of classes present. */
function cellRasters<P, Why>(
  grid: Grid,
  d: Design<P, Why>,
  newId: Int32Array,
): { classOfCell: Int16Array; zoneOfCell: Int32Array; classCount: number } {
  const n = grid.cols * grid.rows;
  const zoneOfCell = new Int32Array(n).fill(-1);
  const classOfCell = new Int16Array(n).fill(-1);
  let classCount = 0;
  for (let i = 0; i < n; i++) {
    const z = d.label[i];
    if (z < 0 || !(grid.fraction[i] > 0) || newId[z] < 0) continue;
    zoneOfCell[i] = newId[z];
    classOfCell[i] = d.classOfZone[z];
    if (classOfCell[i] + 1 > classCount) classCount = classOfCell[i] + 1;
  }
  return { classOfCell, zoneOfCell, classCount };
}

/**
 * Neighbouring zones merged by the judge, then zones anywhere in the field grouped into rate classes (all
 * pairs judged; a class's profile comes from all its zones' cells pooled), and touching zones of one class
 * joined. Zone ids follow the raster order of each zone's first cell; classes are numbered by their first zone.
 */
function rateClassZones<P, Why>(zone: Int32Array, count: number, grid: Grid, judge: RegionJudge<P, Why>) {
  const m = mergeRegions(
    zone,
    count,
    grid.cols,
    grid.rows,
    grid.fraction,
    grid.cell * grid.cell,
    judge,
    'scan',
  );
  // each zone's own area, taken before mergeGraph pools areas into its rate classes' roots (in place)
  const ownArea = Float64Array.from(m.graph.areaM2);
  const g = mergeGraph(m.graph, judge, true);
  // touching merged zones of one rate class become one zone
  const parent = Int32Array.from({ length: m.count }, (_, k) => k);
  const find = (x: number) => {
    while (parent[x] !== x) {
      parent[x] = parent[parent[x]];
      x = parent[x];
    }
    return x;
  };
  for (const p of m.pairs)
    if (g.root[p.a] === g.root[p.b]) {
      const a = find(p.a),
        b = find(p.b);
      if (a !== b) parent[Math.max(a, b)] = Math.min(a, b);
    }
  const newId = new Int32Array(m.count).fill(-1),
    classId = new Int32Array(m.count).fill(-1);
  let n = 0,
    k = 0;
  const classOf: number[] = [],
    profiles: P[] = [];
  for (let z = 0; z < m.count; z++) {
    // m's ids already follow the raster order of first cells
    const c = find(z);
    if (newId[c] >= 0) continue;
    newId[c] = n++;
    const gr = g.root[z];
    if (classId[gr] < 0) classId[gr] = k++;
    classOf.push(classId[gr]);
    profiles.push(g.prof[gr]);
  }
  const final = Int32Array.from({ length: m.count }, (_, z) => newId[find(z)]);
  const label = new Int32Array(zone.length);
  for (let i = 0; i < zone.length; i++) label[i] = zone[i] >= 0 ? final[m.of[zone[i]]] : -1;
  const seen = new Set<number>();
  const pairs: { a: number; b: number; why: Why | null }[] = [];
  for (const p of m.pairs) {
    const a = Math.min(final[p.a], final[p.b]),
      b = Math.max(final[p.a], final[p.b]);
    if (a === b || seen.has(a * n + b)) continue;
    seen.add(a * n + b);
    pairs.push({ a, b, why: judge.compare(profiles[a], profiles[b]).why });
  }
  pairs.sort((p, q) => p.a - q.a || p.b - q.b);
  const areaM2 = new Float64Array(n);
  for (let z = 0; z < m.count; z++) areaM2[final[z]] += ownArea[z];
  return {
    label,
    count: n,
    classOfZone: Int16Array.from(classOf),
    profiles,
    pairs,
    zonesMerged: m.count,
    rateClasses: k,
    areaM2,
  };
}

/** Pairs of zone ids that share a cell edge. */
function neighbourPairs(
  label: Int32Array,
  cols: number,
  rows: number,
): { a: number; b: number; why: null }[] {
  const seen = new Set<string>();
  const out: { a: number; b: number; why: null }[] = [];
  const add = (p: number, q: number) => {
    const a = Math.min(p, q),
      b = Math.max(p, q),
      k = `${a},${b}`;
    if (!seen.has(k)) {
      seen.add(k);
      out.push({ a, b, why: null });
    }
  };
  for (let r = 0; r < rows; r++)
    for (let c = 0; c < cols; c++) {
      const i = r * cols + c,
        a = label[i];
      if (a < 0) continue;
      if (c + 1 < cols && label[i + 1] >= 0 && label[i + 1] !== a) add(a, label[i + 1]);
      if (r + 1 < rows && label[i + cols] >= 0 && label[i + cols] !== a) add(a, label[i + cols]);
    }
  return out.sort((p, q) => p.a - q.a || p.b - q.b);
}

function countMissing(raw: Int16Array, fraction: ArrayLike<number>): number {
  let k = 0;
  for (let i = 0; i < raw.length; i++) if (fraction[i] > 0 && raw[i] < 0) k++;
  return k;
}
