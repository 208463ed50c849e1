/**
 * Management zones: rate classes -> cleaned class raster -> traced polygons clipped to the field.
 * Pure functions on flat typed arrays; see docs/zones.md for the method.
 */
import * as polyclip from 'polyclip-ts';
import type { Field, Grid, RingsPart, SampleZones, Warning } from '../types.js';
import { orient, partsArea } from '../geo/area.js';
import { projector as makeProjector, type Projector } from '../geo/utm.js';
import { M2_PER_AC } from '../units/index.js';
import { vertexCount } from './arcs.js';
import { classify, type Classes, type ClassifyOptions } from './classify.js';
import { fillUnclassed, majorityFilter, mergeSmallZones } from './clean.js';
import { boundaryCells, clipParts, robust } from './clip.js';
import { arcsToParts, ringsVertexCount, zoneArcs } from './arcs.js';
import { simplifyArcs } from './simplify.js';
import { mergeGraph, mergeRegions, type RegionJudge } from './regions.js';

export { classify, classifyVectors, jenksUppers, kmeans1d } from './classify.js';
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
  vertices: { traced: number; simplified: number; clipped: number };
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
  const { cols, rows, cell } = grid;
  const n = cols * rows;
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
  let nClasses = 0;
  for (let i = 0; i < n; i++) if (raw[i] + 1 > nClasses) nClasses = raw[i] + 1;
  const judge = opts.judge;
  // 1. neighbouring classes whose rates do not differ enough become one class
  let classesMerged = nClasses;
  if (judge && nClasses > 1) {
    const m = mergeRegions(raw, nClasses, cols, rows, grid.fraction, cell * cell, judge, 'label', true);
    const next = new Int16Array(n);
    for (let i = 0; i < n; i++) next[i] = raw[i] >= 0 ? m.of[raw[i]] : -1;
    raw = next;
    classesMerged = m.count;
  }
  // 2. speckle, edge cells, small zones
  const smooth =
    (opts.majorityIterations ?? 1) > 0 ? majorityFilter(raw, cols, rows, opts.majorityIterations ?? 1) : raw;
  const filled = fillUnclassed(smooth, cols, rows);
  const minAreaM2 = opts.minAreaM2 ?? 0.5 * M2_PER_AC;
  const cleaned = mergeSmallZones(filled, cols, rows, grid.fraction, cell, minAreaM2);
  // 3. neighbouring zones whose rates do not differ enough become one zone; then zones anywhere in the field
  // whose rates do not differ enough form one rate class (one decision), and touching zones of a class join
  let zoneLabel = cleaned.zone,
    count = cleaned.count,
    classOfZone = cleaned.classOfZone,
    zoneArea = cleaned.areaM2;
  let profiles: P[] | null = null;
  let pairs: ZoneSet<P, Why>['pairs'] = [];
  let zonesMerged = count,
    rateClasses = classesMerged;
  if (judge) {
    const r = rateClassZones(cleaned.zone, cleaned.count, grid, judge);
    zonesMerged = r.zonesMerged;
    rateClasses = r.rateClasses;
    zoneLabel = r.label;
    count = r.count;
    classOfZone = r.classOfZone;
    profiles = r.profiles;
    pairs = r.pairs;
    zoneArea = r.areaM2;
  } else pairs = neighbourPairs(zoneLabel, cols, rows);
  // 4. polygons: shared borders simplified once, then clipped to the exact boundary
  const poly = zonePolygons(grid, field, zoneLabel, count, zoneArea, opts.simplifyCells ?? 1, minAreaM2);
  const proj = opts.lonlat === false ? null : (opts.projector ?? makeProjector(field.utm));
  const zones: Zone[] = [];
  const newId = new Int32Array(count).fill(-1);
  for (let z = 0; z < count; z++) {
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
  const vertices = poly.vertices;
  const zoneOfCell = new Int32Array(n).fill(-1);
  const classOfCell = new Int16Array(n).fill(-1);
  let classCount = 0;
  for (let i = 0; i < n; i++) {
    const z = zoneLabel[i];
    if (z < 0 || !(grid.fraction[i] > 0) || newId[z] < 0) continue;
    zoneOfCell[i] = newId[z];
    classOfCell[i] = classOfZone[z];
    if (classOfCell[i] + 1 > classCount) classCount = classOfCell[i] + 1;
  }
  return {
    zones,
    classOfCell,
    zoneOfCell,
    classCount,
    classes,
    minAreaM2,
    warnings,
    profiles: profiles ? profiles.filter((_, z) => newId[z] >= 0) : null,
    pairs: pairs
      .filter((p) => newId[p.a] >= 0 && newId[p.b] >= 0)
      .map((p) => ({ ...p, a: newId[p.a], b: newId[p.b] })),
    counts: {
      classes: nClasses,
      classesMerged,
      zonesCleaned: cleaned.count,
      zonesMerged,
      rateClasses,
      zones: zones.length,
    },
    vertices,
  };
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
  for (let z = 0; z < m.count; z++) areaM2[final[z]] += m.graph.areaM2[z];
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

/**
 * Zone polygons from a zone raster (`cellArea`: each zone's area from its cells, m2): arcs simplified to `tol`
 * cells (0 = staircase), rings rebuilt, zones near the boundary clipped to it. The arcs are simplified as a
 * partition of the raster's cells, and the field boundary cuts through edge cells, so a shortcut can move the
 * in-field part of a zone along the edge into its neighbour; a zone that smoothing takes below half its own area,
 * or below `minAreaM2` although its cells reach it, keeps its staircase borders (simplification is redone with
 * them fixed; after three rounds every border keeps its staircase).
 */
function zonePolygons(
  grid: Grid,
  field: Field,
  label: Int32Array,
  count: number,
  cellArea: Float64Array,
  tol: number,
  minAreaM2: number,
): { parts: RingsPart[][]; vertices: ZoneSet['vertices']; scale: number } {
  const arcs = zoneArcs(label, count, grid);
  const staircase = simplifyArcs(arcs, 0);
  const needsClip = zonesNearBoundary(field, grid, label, count, Math.ceil(tol) + 1);
  const planarField = partsArea(field.parts);
  const scale = planarField > 0 ? field.areaM2 / planarField : 1;
  const keep = new Uint8Array(count);
  for (let attempt = 0; ; attempt++) {
    const smoothing = tol > 0 && attempt < 3;
    const smooth = smoothing ? simplifyArcs(arcs, tol) : staircase;
    const traced = arcsToParts(arcs, smooth, grid);
    const parts = traced.map((p, z) => (needsClip[z] ? clipParts(p, field.parts, grid.xmin, grid.ymax) : p));
    const shrunk = smoothing ? shrunkZones(parts, cellArea, minAreaM2, keep) : [];
    for (const z of shrunk) {
      keep[z] = 1;
      arcs.arcs.forEach((_, k) => {
        if (arcs.left[k] === z || arcs.right[k] === z) arcs.fixed[k] = true;
      });
    }
    if (shrunk.length === 0) {
      const vertices = {
        traced: ringsVertexCount(arcs, staircase),
        simplified: ringsVertexCount(arcs, smooth),
        clipped: parts.reduce((s, p) => s + vertexCount(p), 0),
      };
      return { parts, vertices, scale };
    }
  }
}

/**
 * Zones (not yet kept as staircases) whose smoothed, clipped polygons fall below half their area from cells
 * (tilth's rule: a zone that gives up more than half of itself to its neighbours is no longer where its cells
 * are), or below `minAreaM2` although their cells reach it.
 */
function shrunkZones(
  parts: RingsPart[][],
  cellArea: Float64Array,
  minAreaM2: number,
  keep: Uint8Array,
): number[] {
  const out: number[] = [];
  for (let z = 0; z < parts.length; z++) {
    if (keep[z]) continue;
    const floor = Math.max(cellArea[z] >= minAreaM2 ? minAreaM2 : 0, cellArea[z] / 2);
    if (partsArea(parts[z]) < floor * (1 - 1e-9)) out.push(z);
  }
  return out;
}

/** Zones with a cell within `reach` cells of one the boundary crosses, or of a cell outside: these are clipped. */
function zonesNearBoundary(
  field: Field,
  grid: Grid,
  label: Int32Array,
  count: number,
  reach: number,
): Uint8Array {
  const { cols, rows } = grid;
  const band = boundaryCells(field.parts, grid);
  const out = new Uint8Array(count);
  for (let i = 0; i < label.length; i++) if (label[i] >= 0 && (!grid.mask[i] || band[i])) out[label[i]] = 1;
  // smoothed borders move up to about `reach` cells: zones that near the boundary are clipped too
  for (let r = 0; r < rows; r++)
    for (let c = 0; c < cols; c++) {
      if (!band[r * cols + c]) continue;
      for (let rr = Math.max(0, r - reach); rr <= Math.min(rows - 1, r + reach); rr++) {
        for (let cc = Math.max(0, c - reach); cc <= Math.min(cols - 1, c + reach); cc++) {
          const z = label[rr * cols + cc];
          if (z >= 0) out[z] = 1;
        }
      }
    }
  return out;
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

/**
 * Polygon parts in metres to MultiPolygon lon/lat coordinates.
 * @example toLonLat(zone.parts, projector(field.utm)) // [[[[lon, lat], ...]]]
 */
export function toLonLat(parts: RingsPart[], p: Projector): number[][][][] {
  const ring = (r: Float64Array) => {
    const ll = p.inverse(r);
    const out: number[][] = [];
    for (let i = 0; i + 1 < ll.length; i += 2) out.push([ll[i], ll[i + 1]]);
    return out;
  };
  return parts.map((pt) => [ring(pt.exterior), ...pt.holes.map(ring)]);
}

/** A zone of a zone-composite field: the sampled zone polygon clipped to the boundary. */
export interface SampledZone {
  id: number;
  /** the samples' zone key */
  key: string;
  parts: RingsPart[];
  lonlat: number[][][][];
  areaM2: number;
}

/**
 * Zones of a zone-composite field: each sampled zone polygon clipped to the field boundary. Where
 * sampled zones overlap, the overlap goes to the zone listed first (with a warning); field area that
 * no sampled zone covers is reported in a warning (it gets no rate).
 * @example const { zones, warnings } = zonesFromSampleZones(inputs.zones!, inputs.field);
 */
export function zonesFromSampleZones(
  sz: SampleZones,
  field: Field,
  opts: { projector?: Projector } = {},
): { zones: SampledZone[]; warnings: Warning[] } {
  const [ox, oy] = [field.bbox[0], field.bbox[3]];
  const planarField = partsArea(field.parts);
  const scale = planarField > 0 ? field.areaM2 / planarField : 1;
  const proj = opts.projector ?? makeProjector(field.utm);
  const warnings: Warning[] = [];
  const zones: SampledZone[] = [];
  const taken: RingsPart[][] = [];
  for (let k = 0; k < sz.keys.length; k++) {
    let parts = clipParts(sz.parts[k], field.parts, ox, oy);
    if (taken.length > 0 && parts.length > 0) {
      const before = partsArea(parts);
      parts = differenceParts(parts, taken.flat(), ox, oy);
      const lost = before - partsArea(parts);
      if (lost > 1e-6 * Math.max(1, before)) {
        warnings.push({
          code: 'zones-sampled-overlap',
          where: sz.keys[k],
          message: `Sampled zone "${sz.keys[k]}" overlaps an earlier zone by ${((lost * scale) / M2_PER_AC).toFixed(2)} ac; the overlap stays with the earlier zone. Fix: correct the zone polygons so they do not overlap.`,
        });
      }
    }
    if (parts.length === 0) {
      warnings.push({
        code: 'zones-sampled-outside',
        where: sz.keys[k],
        message: `Sampled zone "${sz.keys[k]}" lies outside the field boundary; it is left out. Fix: check that the zone file belongs to this field.`,
      });
      continue;
    }
    taken.push(parts);
    zones.push({
      id: zones.length,
      key: sz.keys[k],
      parts,
      lonlat: toLonLat(parts, proj),
      areaM2: partsArea(parts) * scale,
    });
  }
  const covered = zones.reduce((s, z) => s + z.areaM2, 0);
  if (field.areaM2 - covered > 1e-4 * field.areaM2) {
    warnings.push({
      code: 'zones-sampled-gap',
      message: `The sampled zones cover ${(covered / M2_PER_AC).toFixed(2)} of the field's ${(field.areaM2 / M2_PER_AC).toFixed(2)} ac; the rest gets no rate. Fix: extend the zone polygons to the boundary.`,
    });
  }
  return { zones, warnings };
}

function differenceParts(a: RingsPart[], b: RingsPart[], ox: number, oy: number): RingsPart[] {
  const g = (ps: RingsPart[]) =>
    ps.map((p) =>
      [p.exterior, ...p.holes].map((r) => {
        const out: [number, number][] = [];
        for (let i = 0; i + 1 < r.length; i += 2) out.push([r[i] - ox, r[i + 1] - oy]);
        return out;
      }),
    );
  const res = robust(
    () => polyclip.difference(g(a) as polyclip.Geom, g(b) as polyclip.Geom) as [number, number][][][],
  );
  return res
    .map((poly) => {
      const rings = poly.map((r) => Float64Array.from(r.flatMap(([x, y]) => [x + ox, y + oy])));
      return { exterior: rings[0], holes: rings.slice(1) };
    })
    .map((p) => ({ exterior: orient(p.exterior, true), holes: p.holes.map((h) => orient(h, false)) }));
}
