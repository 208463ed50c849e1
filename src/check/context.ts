/**
 * What every check of `tilth check` reads: the layer, the options, zone names and the working metres frame. Built
 * by checkPrescription (./index.ts); each check is one file whose entry function reads it, changes nothing, and
 * returns its report lines.
 */
import type { Feature, MultiPolygon, Polygon, Position } from 'geojson';
import { utmZone } from '../geo/crs.js';
import { exteriorsBbox } from '../geo/area.js';
import { arealScale, projector, utmZoneFor, type Projector } from '../geo/utm.js';
import type { CheckLayer } from './layer.js';
import { significantArea, type Poly } from './shape.js';
import type { CheckLine, CheckOptions, CheckStatus } from './types.js';

/** Pieces of overlap, gap or outside area smaller than this are numeric slivers and ignored (m2). */
export const SLIVER_M2 = 1;
/** ... and pieces thinner than this on average (m): rounding slivers along shared edges and the boundary. */
export const SLIVER_WIDTH_M = 0.05;

/**
 * Seconds a controller takes to reach a new rate: 4 s by default. Common practice; University of
 * Georgia Extension (2024) gives 3-5 s for typical rate controllers.
 */
export const DEFAULT_TRANSITION_S = 4;

/** Shared state of one check run. */
export interface CheckContext {
  layer: CheckLayer;
  opts: CheckOptions;
  feats: Feature[];
  /** per feature: why its coordinates are unusable ('' when usable) */
  problems: string[];
  names: string[];
  /** area of the pieces that matter (slivers and a grid's staircase left out), m2 on the ground */
  significant: (polys: Poly[], scale: number) => number;
  frame: Frame;
  /** the working UTM projection, or null when the coordinate system is unknown */
  work: Projector | null;
  /** planar / ground area at the layer's centre */
  scale: number;
  /** local origin of the working metres */
  origin: [number, number];
  /** per feature: its polygons in working metres (null when not a polygon) */
  metres: (Poly[] | null)[];
  groundAreas: number[];
  /** per feature: its metres when it is a valid polygon, else null (from the geometry check) */
  usable: (Poly[] | null)[];
  boxes: ([number, number, number, number] | null)[];
  /** union of the usable zones (from the overlap check; null when the overlay failed) */
  covered: Poly[] | null;
}

export const significantWith = (width: number) => (polys: Poly[], scale: number) =>
  significantArea(polys, SLIVER_M2, width, scale);

export const UNIT_SUFFIX: [RegExp, string, string, 'ac' | 'ha'][] = [
  [/_?lb_?ac$/i, 'lb/ac', 'lb', 'ac'],
  [/_?kg_?ha$/i, 'kg/ha', 'kg', 'ha'],
  [/_?gal_?ac$/i, 'US gal/ac', 'US gal', 'ac'],
  [/_?l_?ha$/i, 'L/ha', 'L', 'ha'],
];

export const fmt = (v: number, d = 1) => v.toFixed(d);
export const list = (z: string[], max = 12) =>
  z.length <= max ? z.join(', ') : `${z.slice(0, max).join(', ')} and ${z.length - max} more`;

/** A feature's polygons (a Polygon as one), or null when it is no polygon. */
function polygonsOf(f: Feature): Position[][][] | null {
  const g = f.geometry as Polygon | MultiPolygon | null;
  if (!g || (g.type !== 'Polygon' && g.type !== 'MultiPolygon')) return null;
  return g.type === 'Polygon' ? [g.coordinates] : g.coordinates;
}

export function lonlatLike(features: Feature[]): boolean {
  for (const f of features)
    for (const p of polygonsOf(f) ?? [])
      for (const r of p) for (const pt of r) if (Math.abs(pt[0]) > 180 || Math.abs(pt[1]) > 90) return false;
  return true;
}

export function bboxOf(features: Feature[]): [number, number, number, number] {
  return exteriorsBbox(features.flatMap((f) => polygonsOf(f) ?? []));
}

/** How a layer's coordinates become working metres. */
export interface Frame {
  /** 'lonlat' and 'utm' are known; 'planar' = unknown system, coordinates used as metres */
  kind: 'lonlat' | 'utm' | 'planar';
  utmProj: Projector | null;
}

/** The layer's polygons in the working UTM metres (null for a feature that is not a polygon). */
export function toMetres(
  features: Feature[],
  frame: Frame,
  work: Projector | null,
  origin: [number, number],
): (Poly[] | null)[] {
  const [ox, oy] = origin;
  // metres from a local origin, rounded to 0.1 mm: overlay (polyclip-ts) is exact arithmetic and fails on
  // the nanometre noise a projection round trip leaves on edges that should be collinear
  const snap = (p: number[]): [number, number] => [
    Math.round((p[0] - ox) * 1e4) / 1e4,
    Math.round((p[1] - oy) * 1e4) / 1e4,
  ];
  return features.map((f) => {
    const polys = polygonsOf(f);
    if (!polys) return null;
    return polys.map((p) =>
      p.map((r) =>
        r.map((pt): [number, number] => {
          if (frame.kind === 'planar' || !work) return snap(pt);
          if (frame.kind === 'utm' && frame.utmProj!.utm.epsg === work.utm.epsg) return snap(pt);
          const ll = frame.kind === 'utm' ? frame.utmProj!.toLonLat(pt[0], pt[1]) : [pt[0], pt[1]];
          return snap(work.toMetres(ll[0], ll[1]));
        }),
      ),
    );
  });
}

export function frameOf(layer: CheckLayer): Frame {
  const c = layer.crs;
  if (c?.kind === 'utm') return { kind: 'utm', utmProj: projector(utmZone(c.zone!, !!c.south)) };
  if (
    c?.kind === 'lonlat' ||
    (!c && lonlatLike(layer.features)) ||
    (c?.kind === null && lonlatLike(layer.features))
  )
    return { kind: 'lonlat', utmProj: null };
  return { kind: 'planar', utmProj: null };
}

/** Zone names: the value of a zone id column when there is one, else "feature N". */
export function zoneNames(layer: CheckLayer): string[] {
  const idField = ['zone_id', 'zoneid', 'zone', 'id', 'zone_no']
    .map((n) => layer.fields.find((f) => f.name.toLowerCase() === n))
    .find(Boolean);
  return layer.features.map((f, i) => {
    const v = idField ? f.properties?.[idField.name] : undefined;
    return v === undefined || v === null || v === '' ? `feature ${i + 1}` : `zone ${String(v).trim()}`;
  });
}

export const bbox = (polys: Poly[]) => exteriorsBbox(polys);
export const boxesMeet = (a: number[], b: number[]) =>
  a[0] <= b[2] && b[0] <= a[2] && a[1] <= b[3] && b[1] <= a[3];

/** Adds one report line. */
export type AddLine = (check: string, status: CheckStatus, message: string, zones?: string[]) => void;

/**
 * The lines one check writes, and `add` to write one (zones default to none).
 * @example const { lines, add } = lineWriter(); add('crs', 'pass', 'WGS 84'); lines.length // 1
 */
export function lineWriter(): { lines: CheckLine[]; add: AddLine } {
  const lines: CheckLine[] = [];
  return {
    lines,
    add: (check, status, message, zones = []) => lines.push({ check, status, message, zones }),
  };
}

/** When an overlay fails: a warning for the check, never a crash (a UserError still stops the run). */
export function overlayFailed(
  add: AddLine,
  check: string,
  e: unknown,
  isUserError: (e: unknown) => boolean,
): void {
  if (isUserError(e)) throw e;
  add(
    check,
    'warn',
    `not computed: the polygon overlay failed (${(e as Error).message.slice(0, 120)}); inspect the zones in a GIS`,
  );
}

/**
 * The working frame: a UTM projection (the layer's own, or the zone of its centre for lon/lat), the areal scale
 * at the centre and a local origin; planar (file units as metres) when the system is unknown.
 * @example const { work, scale, origin } = workingFrame(layer, frameOf(layer))
 */
export function workingFrame(
  layer: CheckLayer,
  frame: Frame,
): { work: Projector | null; scale: number; origin: [number, number] } {
  const [bx0, by0, bx1, by1] = bboxOf(layer.features);
  let work: Projector | null = null;
  let scale = 1;
  let origin: [number, number] = Number.isFinite(bx0) ? [(bx0 + bx1) / 2, (by0 + by1) / 2] : [0, 0];
  if (frame.kind !== 'planar' && Number.isFinite(bx0)) {
    if (frame.kind === 'utm') {
      work = frame.utmProj;
      const [clon, clat] = work!.toLonLat(origin[0], origin[1]);
      scale = arealScale(work!, clon, clat);
    } else if (lonlatLike(layer.features)) {
      const [clon, clat] = origin;
      work = projector(utmZoneFor(clon, clat));
      scale = arealScale(work, clon, clat);
      origin = work.toMetres(clon, clat);
    }
  }
  return { work, scale, origin };
}
