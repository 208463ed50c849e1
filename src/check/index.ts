/**
 * checkPrescription: will this prescription load and apply what the agronomist meant?
 * One line per check (pass / warn / fail / skip) with the zones involved. Pure: layers in, report out.
 */
import type { Feature, MultiPolygon, Polygon } from 'geojson';
import { booleanValid } from '@turf/boolean-valid';
import { kinks } from '@turf/kinks';
import * as clip from 'polyclip-ts';
import { UserError, isUserError } from '../errors.js';
import { arealScale, projector, utmZoneFor, type Projector } from '../geo/utm.js';
import { m2ToAc, m2ToHa } from '../units/index.js';
import type { CheckLayer } from './layer.js';
import { hullExtent, polysArea, ringCentroid, significantArea, type Poly } from './shape.js';
import { usableFeatures } from './coords.js';

export { readLayer, layerFromGeoJSON, type CheckLayer, type LayerField } from './layer.js';

/** Pieces of overlap, gap or outside area smaller than this are numeric slivers and ignored (m2). */
export const SLIVER_M2 = 1;
/** ... and pieces thinner than this on average (m): rounding slivers along shared edges and the boundary. */
export const SLIVER_WIDTH_M = 0.05;
const significantWith = (width: number) => (polys: Poly[], scale: number) => significantArea(polys, SLIVER_M2, width, scale);
/**
 * Seconds a controller takes to reach a new rate: 4 s by default. Common practice; University of
 * Georgia Extension (2024) gives 3-5 s for typical rate controllers.
 */
export const DEFAULT_TRANSITION_S = 4;

export type CheckStatus = 'pass' | 'warn' | 'fail' | 'skip';

/** One line of the report. */
export interface CheckLine {
  /** stable name: crs, geometry, overlap, outside, gaps, rate_field, rate_range, zone_size, total */
  check: string;
  status: CheckStatus;
  message: string;
  /** zone ids involved (as the file names them, or "feature N") */
  zones: string[];
}

/** Product over the whole prescription for one rate column. */
export interface RateTotal {
  field: string;
  /** unit read from the column name's ending (_lbac, _kgha, _galac, _lha), else null */
  unit: string | null;
  /** total product in `totalUnit`; with an unknown unit, rate x acres */
  total: number;
  totalUnit: string;
  areaAc: number;
}

export interface CheckReport {
  file: string;
  /** true when no line failed */
  ok: boolean;
  lines: CheckLine[];
  totals: RateTotal[];
}

/** Options of {@link checkPrescription}; every limit is off unless given. */
export interface CheckOptions {
  /** field boundary; enables the gap and outside checks */
  boundary?: CheckLayer;
  /** the rate column (default: columns ending in a unit, _lbac _kgha _galac _lha; else the single numeric column that is not an id or area) */
  rateField?: string;
  /** machine's lowest rate above 0 (a 0 rate is read as "off" and passes) */
  min?: number;
  /** machine's highest rate */
  max?: number;
  /** travel speed, km/h: enables the zone size check */
  speedKmh?: number;
  /** swath width, m: adds "zone smaller than one rate change x swath" to the size check */
  swathM?: number;
  /** seconds to reach a new rate (default {@link DEFAULT_TRANSITION_S}) */
  transitionS?: number;
  /** refuse a layer without a coordinate system instead of reading it as WGS 84 */
  strict?: boolean;
}

const UNIT_SUFFIX: [RegExp, string, string, 'ac' | 'ha'][] = [
  [/_?lb_?ac$/i, 'lb/ac', 'lb', 'ac'],
  [/_?kg_?ha$/i, 'kg/ha', 'kg', 'ha'],
  [/_?gal_?ac$/i, 'US gal/ac', 'US gal', 'ac'],
  [/_?l_?ha$/i, 'L/ha', 'L', 'ha'],
];

const fmt = (v: number, d = 1) => v.toFixed(d);
const list = (z: string[], max = 12) => (z.length <= max ? z.join(', ') : `${z.slice(0, max).join(', ')} and ${z.length - max} more`);

function lonlatLike(features: Feature[]): boolean {
  for (const f of features) {
    const g = f.geometry as Polygon | MultiPolygon | null;
    if (!g || (g.type !== 'Polygon' && g.type !== 'MultiPolygon')) continue;
    const polys = g.type === 'Polygon' ? [g.coordinates] : g.coordinates;
    for (const p of polys) for (const r of p) for (const pt of r) if (Math.abs(pt[0]) > 180 || Math.abs(pt[1]) > 90) return false;
  }
  return true;
}

function bboxOf(features: Feature[]): [number, number, number, number] {
  let x0 = Infinity, y0 = Infinity, x1 = -Infinity, y1 = -Infinity;
  for (const f of features) {
    const g = f.geometry as Polygon | MultiPolygon | null;
    if (!g || (g.type !== 'Polygon' && g.type !== 'MultiPolygon')) continue;
    for (const p of g.type === 'Polygon' ? [g.coordinates] : g.coordinates) for (const pt of p[0] ?? []) {
      x0 = Math.min(x0, pt[0]); x1 = Math.max(x1, pt[0]); y0 = Math.min(y0, pt[1]); y1 = Math.max(y1, pt[1]);
    }
  }
  return [x0, y0, x1, y1];
}

/** How a layer's coordinates become working metres. */
interface Frame {
  /** 'lonlat' and 'utm' are known; 'planar' = unknown system, coordinates used as metres */
  kind: 'lonlat' | 'utm' | 'planar';
  utmProj: Projector | null;
}

/** The layer's polygons in the working UTM metres (null for a feature that is not a polygon). */
function toMetres(features: Feature[], frame: Frame, work: Projector | null, origin: [number, number]): (Poly[] | null)[] {
  const [ox, oy] = origin;
  // metres from a local origin, rounded to 0.1 mm: overlay (polyclip-ts) is exact arithmetic and fails on
  // the nanometre noise a projection round trip leaves on edges that should be collinear
  const snap = (p: number[]): [number, number] => [Math.round((p[0] - ox) * 1e4) / 1e4, Math.round((p[1] - oy) * 1e4) / 1e4];
  return features.map((f) => {
    const g = f.geometry as Polygon | MultiPolygon | null;
    if (!g || (g.type !== 'Polygon' && g.type !== 'MultiPolygon')) return null;
    const polys = g.type === 'Polygon' ? [g.coordinates] : g.coordinates;
    return polys.map((p) => p.map((r) => r.map((pt): [number, number] => {
      if (frame.kind === 'planar' || !work) return snap(pt);
      if (frame.kind === 'utm' && frame.utmProj!.utm.epsg === work.utm.epsg) return snap(pt);
      const ll = frame.kind === 'utm' ? frame.utmProj!.toLonLat(pt[0], pt[1]) : [pt[0], pt[1]];
      return snap(work.toMetres(ll[0], ll[1]));
    })));
  });
}

function frameOf(layer: CheckLayer): Frame {
  const c = layer.crs;
  if (c?.kind === 'utm') return { kind: 'utm', utmProj: projector(utmZoneFor(6 * c.zone! - 183, c.south ? -1 : 1)) };
  if (c?.kind === 'lonlat' || (!c && lonlatLike(layer.features)) || (c?.kind === null && lonlatLike(layer.features))) return { kind: 'lonlat', utmProj: null };
  return { kind: 'planar', utmProj: null };
}

/** Zone names: the value of a zone id column when there is one, else "feature N". */
function zoneNames(layer: CheckLayer): string[] {
  const idField = ['zone_id', 'zoneid', 'zone', 'id', 'zone_no'].map((n) => layer.fields.find((f) => f.name.toLowerCase() === n)).find(Boolean);
  return layer.features.map((f, i) => {
    const v = idField ? f.properties?.[idField.name] : undefined;
    return v === undefined || v === null || v === '' ? `feature ${i + 1}` : `zone ${String(v).trim()}`;
  });
}

function bbox(polys: Poly[]): [number, number, number, number] {
  let x0 = Infinity, y0 = Infinity, x1 = -Infinity, y1 = -Infinity;
  for (const p of polys) for (const [x, y] of p[0] ?? []) {
    x0 = Math.min(x0, x); x1 = Math.max(x1, x); y0 = Math.min(y0, y); y1 = Math.max(y1, y);
  }
  return [x0, y0, x1, y1];
}
const boxesMeet = (a: number[], b: number[]) => a[0] <= b[2] && b[0] <= a[2] && a[1] <= b[3] && b[1] <= a[3];

/**
 * Checks a prescription layer (zones with rates) as an applicator operator needs before going to the
 * field: coordinate system known, every zone a valid polygon, no overlaps, no parts outside and no gaps
 * inside the boundary (when given), rate column present and numeric, rates within the machine's range,
 * zones long enough to reach their rate at the travel speed, and total product per rate column.
 * Overlap, gap and outside pieces under {@link SLIVER_M2}, or thinner on average than {@link SLIVER_WIDTH_M}, are ignored.
 *
 * Throws UserError for what makes the file unusable: a rate column holding text, or no coordinate
 * system with `strict`.
 *
 * @example
 * const report = checkPrescription(await readLayer({ 'rx.zip': bytes }, 'rx.zip'), { min: 40, max: 250, speedKmh: 12 });
 * report.ok // false when any line failed
 */
export function checkPrescription(rawLayer: CheckLayer, opts: CheckOptions = {}): CheckReport {
  // unusable coordinates (NaN, null, out of range) fail the geometry check and are kept out of the others
  const { features: cleaned, problems } = usableFeatures(rawLayer.features);
  const layer: CheckLayer = { ...rawLayer, features: cleaned };
  const lines: CheckLine[] = [];
  const add = (check: string, status: CheckStatus, message: string, zones: string[] = []) => lines.push({ check, status, message, zones });
  const names = zoneNames(layer);
  const feats = layer.features;
  // a grid follows the boundary only to a cell: pieces thinner on average than a cell are its staircase
  const significant = significantWith(Math.max(SLIVER_WIDTH_M, layer.resolutionM ?? 0));

  // --- coordinate system
  const frame = frameOf(layer);
  if (!layer.crs) {
    if (opts.strict) throw new UserError(`${layer.label}: has no coordinate system (no .prj file beside the .shp). Fix: copy the .prj that belongs to it beside it, or drop --strict to read the coordinates as WGS 84 longitude/latitude.`, { file: layer.label });
    if (frame.kind === 'lonlat') add('crs', 'warn', 'no .prj: coordinates are in longitude/latitude range and are read as WGS 84 (EPSG:4326); add the .prj before loading it in a terminal');
    else add('crs', 'fail', 'no .prj and the coordinates are not longitude/latitude: the coordinate system is unknown; measures below use them as metres');
  } else if (layer.crs.kind === null) {
    add('crs', 'fail', `coordinate system not recognised (${layer.crs.label}); tilth knows WGS 84, NAD83 and NAD83(CSRS) longitude/latitude and UTM` + (frame.kind === 'lonlat' ? '; read as WGS 84 longitude/latitude' : '; measures below use the coordinates as metres'));
  } else if (frame.kind === 'lonlat' && !lonlatLike(feats)) {
    add('crs', 'fail', `${layer.crs.label} declared but coordinates lie outside longitude -180..180 / latitude -90..90`);
  } else {
    const nad = layer.crs.datum !== 'WGS84' ? ` (${layer.crs.datum} is used as WGS 84; they differ by 1-2 m)` : '';
    add('crs', layer.crs.datum === 'WGS84' ? 'pass' : 'warn', `${layer.crs.label}${nad}`);
  }
  const [bx0, by0, bx1, by1] = bboxOf(feats);
  let work: Projector | null = null;
  let scale = 1;
  let origin: [number, number] = Number.isFinite(bx0) ? [(bx0 + bx1) / 2, (by0 + by1) / 2] : [0, 0];
  if (frame.kind !== 'planar' && Number.isFinite(bx0)) {
    if (frame.kind === 'utm') {
      work = frame.utmProj;
      const [clon, clat] = work!.toLonLat(origin[0], origin[1]);
      scale = arealScale(work!, clon, clat);
    } else if (lonlatLike(feats)) {
      const [clon, clat] = origin;
      work = projector(utmZoneFor(clon, clat));
      scale = arealScale(work, clon, clat);
      origin = work.toMetres(clon, clat);
    }
  }
  const metres = toMetres(feats, work ? frame : { kind: 'planar', utmProj: null }, work, origin);
  const groundAreas = metres.map((m) => (m ? polysArea(m) / scale : 0));

  // --- geometry
  const bad: string[] = [], why: string[] = [];
  const valid = feats.map((f, i) => {
    const g = f.geometry;
    let reason = problems[i] ?? '';
    if (reason) { /* coordinates unusable */ } else if (!g) reason = 'no geometry';
    else if (g.type !== 'Polygon' && g.type !== 'MultiPolygon') reason = `a ${g.type}, not a polygon`;
    else if ((g.type === 'Polygon' ? [g.coordinates] : g.coordinates).some((p) => p.some((r) => r.length < 4))) reason = 'a ring with fewer than 4 points';
    else {
      try {
        const k = kinks(f as Feature<Polygon | MultiPolygon>);
        if (k.features.length) {
          const c = k.features[0].geometry.coordinates;
          reason = `edges cross themselves (${k.features.length} crossing${k.features.length > 1 ? 's' : ''}, first near lat ${c[1].toFixed(6)}, lon ${c[0].toFixed(6)})`;
        } else if (!booleanValid(f)) reason = 'not a valid polygon (a hole outside its ring, touching rings or overlapping parts)';
      } catch (e) {
        reason = `unreadable geometry (${(e as Error).message})`;
      }
    }
    if (reason) { bad.push(names[i]); why.push(`${names[i]}: ${reason}`); }
    return !reason;
  });
  if (!feats.length) add('geometry', 'fail', 'the file holds no zones');
  else if (bad.length) add('geometry', 'fail', `${bad.length} of ${feats.length} zones invalid: ${list(why, 6)}`, bad);
  else add('geometry', 'pass', `${feats.length} zones, all valid polygons`);

  const usable = metres.map((m, i) => (valid[i] && m ? m : null));
  const boxes = usable.map((m) => (m ? bbox(m) : null));

  // --- overlaps between zones: when the zones' areas add up to their union's, nothing overlaps and the
  // pairwise search (the slow part) is skipped
  const ok = usable.filter((m): m is Poly[] => !!m);
  const overlayFailed = (check: string, e: unknown) => {
    if (isUserError(e)) throw e;
    add(check, 'warn', `not computed: the polygon overlay failed (${(e as Error).message.slice(0, 120)}); inspect the zones in a GIS`);
  };
  let covered: Poly[] | null = null;
  try {
    covered = ok.length ? (clip.union(ok[0] as clip.Geom, ...(ok.slice(1) as clip.Geom[])) as Poly[]) : [];
    const overlapTotal = ok.reduce((s, m) => s + polysArea(m), 0) - polysArea(covered);
    const pairs: string[] = [], overlapZones = new Set<string>();
    if (overlapTotal >= SLIVER_M2) for (let i = 0; i < usable.length; i++) for (let j = i + 1; j < usable.length; j++) {
      if (!usable[i] || !usable[j] || !boxesMeet(boxes[i]!, boxes[j]!)) continue;
      const a = significant(clip.intersection(usable[i]! as clip.Geom, usable[j]! as clip.Geom) as Poly[], scale);
      if (a >= SLIVER_M2) {
        pairs.push(`${names[i]} & ${names[j]} (${fmt(a)} m2)`);
        overlapZones.add(names[i]); overlapZones.add(names[j]);
      }
    }
    if (pairs.length) add('overlap', 'fail', `zones overlap, the controller would pick one rate: ${list(pairs, 8)}`, [...overlapZones]);
    else add('overlap', 'pass', 'no zones overlap');
  } catch (e) {
    overlayFailed('overlap', e);
  }

  // --- boundary: outside parts and gaps
  if (!opts.boundary) {
    add('outside', 'skip', 'no --boundary given');
    add('gaps', 'skip', 'no --boundary given');
  } else {
    const bl = opts.boundary;
    const bp = usableFeatures(bl.features).problems.findIndex(Boolean);
    if (bp >= 0) throw new UserError(`${bl.label} feature ${bp + 1}: ${usableFeatures([bl.features[bp]!]).problems[0]}. Fix: export the field boundary again.`, { file: bl.label, where: `feature ${bp + 1}` });
    const bframe = frameOf(bl);
    if (!work || bframe.kind === 'planar') {
      add('outside', 'skip', 'the prescription or the boundary has no known coordinate system');
      add('gaps', 'skip', 'the prescription or the boundary has no known coordinate system');
    } else if (!covered) {
      add('outside', 'skip', 'the zones could not be merged (see overlap)');
      add('gaps', 'skip', 'the zones could not be merged (see overlap)');
    } else try {
      const cov = covered;
      const bpolys = toMetres(bl.features, bframe, work, origin).filter((m): m is Poly[] => !!m).flat();
      if (!bpolys.length) throw new UserError(`${bl.label}: holds no polygon to use as the field boundary. Fix: give the field's boundary polygon.`, { file: bl.label });
      const boundary = clip.union(bpolys[0] as clip.Geom, ...(bpolys.slice(1) as clip.Geom[])) as Poly[];
      const out: string[] = [], outZones: string[] = [];
      const outsideTotal = cov.length ? polysArea(clip.difference(cov as clip.Geom, boundary as clip.Geom) as Poly[]) : 0;
      if (outsideTotal >= SLIVER_M2) usable.forEach((m, i) => {
        if (!m) return;
        const a = significant(clip.difference(m as clip.Geom, boundary as clip.Geom) as Poly[], scale);
        if (a >= SLIVER_M2) { out.push(`${names[i]} (${fmt(a)} m2)`); outZones.push(names[i]); }
      });
      if (out.length) add('outside', 'fail', `parts outside the boundary: ${list(out, 8)}`, outZones);
      else add('outside', 'pass', 'every zone lies inside the boundary');
      const gaps = (cov.length ? clip.difference(boundary as clip.Geom, cov as clip.Geom) : boundary) as Poly[];
      const pieces = gaps.map((p) => ({ p, a: polysArea([p]) / scale })).filter((g) => g.a >= SLIVER_M2 && significant([g.p], scale) > 0).sort((a, b) => b.a - a.a);
      if (pieces.length) {
        const where = pieces.slice(0, 5).map(({ p, a }) => {
          const [cx, cy] = ringCentroid(p[0]);
          const [lon, lat] = work!.toLonLat(cx + origin[0], cy + origin[1]);
          const near = usable.map((m, i) => (m && boxesMeet(boxes[i]!, bbox([p])) ? names[i] : '')).filter(Boolean);
          return `${fmt(a)} m2 near lat ${lat.toFixed(6)}, lon ${lon.toFixed(6)}${near.length ? ` (beside ${list(near, 4)})` : ''}`;
        });
        const total = pieces.reduce((s, g) => s + g.a, 0);
        const near = new Set<string>();
        for (const { p } of pieces) usable.forEach((m, i) => m && boxesMeet(boxes[i]!, bbox([p])) && near.add(names[i]));
        add('gaps', 'fail', `${pieces.length} part${pieces.length > 1 ? 's' : ''} of the field (${fmt(total)} m2, ${fmt(m2ToAc(total), 3)} ac) ${pieces.length > 1 ? 'lie' : 'lies'} in no zone and get the terminal's default rate: ${where.join('; ')}`, [...near]);
      } else add('gaps', 'pass', 'the zones cover the whole field');
    } catch (e) {
      if (!lines.some((l) => l.check === 'outside')) overlayFailed('outside', e);
      overlayFailed('gaps', e);
    }
  }

  // --- rate columns
  const rateFields = pickRateFields(layer, opts, add);
  const rates: Record<string, (number | null)[]> = {};
  for (const rf of rateFields) {
    const field = layer.fields.find((x) => x.name === rf)!;
    rates[rf] = feats.map((f, i) => {
      const v = f.properties?.[rf];
      if (field.numeric && typeof v === 'number' && Number.isFinite(v)) return v;
      const text = typeof v === 'string' ? v.trim() : (layer.rawText?.[rf]?.[i] ?? '');
      if (text === '') return null;
      throw new UserError(
        `${layer.label}, ${names[i]}, column "${rf}": "${text}" is ${field.numeric ? 'not a number' : 'text (a text column)'}; a controller needs a numeric rate column. Fix: write the rate as a plain number in a numeric column (in a GIS, a Real/Double field), with the unit in the column name.`,
        { file: layer.label, where: names[i], field: rf, value: text },
      );
    });
  }
  for (const rf of rateFields) {
    const missing = rates[rf].map((v, i) => (v === null ? names[i] : '')).filter(Boolean);
    if (missing.length) add('rate_field', 'fail', `"${rf}": ${missing.length} zone${missing.length > 1 ? 's have' : ' has'} no rate: ${list(missing)}`, missing);
    else add('rate_field', 'pass', `"${rf}" is numeric in every zone`);
  }

  // --- rate range
  if (opts.min === undefined && opts.max === undefined) add('rate_range', 'skip', 'no --min or --max given');
  else for (const rf of rateFields) {
    const low: string[] = [], high: string[] = [];
    rates[rf].forEach((v, i) => {
      if (v === null) return;
      if (opts.min !== undefined && v > 0 && v < opts.min) low.push(`${names[i]} (${v})`);
      if (opts.max !== undefined && v > opts.max) high.push(`${names[i]} (${v})`);
      if (v < 0) low.push(`${names[i]} (${v}, negative)`);
    });
    const zones = [...low, ...high].map((s) => s.replace(/ \(.*$/, ''));
    if (low.length || high.length) {
      add('rate_range', 'fail', `"${rf}" outside the machine's ${opts.min ?? '-'} to ${opts.max ?? '-'}: ${[low.length ? `below: ${list(low)}` : '', high.length ? `above: ${list(high)}` : ''].filter(Boolean).join('; ')}`, zones);
    } else add('rate_range', 'pass', `"${rf}" within ${opts.min ?? '-'} to ${opts.max ?? '-'} (0 = off)`);
  }

  // --- zone size at speed
  if (opts.speedKmh === undefined) add('zone_size', 'skip', 'no --speed given');
  else {
    const t = opts.transitionS ?? DEFAULT_TRANSITION_S;
    const d = (opts.speedKmh / 3.6) * t;
    const tooShort: string[] = [], narrow: string[] = [], tiny: string[] = [];
    usable.forEach((m, i) => {
      if (!m) return;
      for (const part of m) {
        const { diameter, width } = hullExtent(part[0]);
        const a = polysArea([part]) / scale;
        if (diameter < d) { tooShort.push(`${names[i]} (${fmt(diameter)} m)`); return; }
        if (opts.swathM !== undefined && a < d * opts.swathM) { tiny.push(`${names[i]} (${fmt(a)} m2)`); return; }
        if (width < d) { narrow.push(`${names[i]} (${fmt(width)} m)`); return; }
      }
    });
    const head = `at ${opts.speedKmh} km/h a rate change takes ${t} s = ${fmt(d)} m`;
    if (tooShort.length || tiny.length) {
      const parts = [tooShort.length ? `no part longer than that: ${list(tooShort)}` : '', tiny.length ? `smaller than ${fmt(d)} m x ${opts.swathM} m swath: ${list(tiny)}` : ''].filter(Boolean);
      add('zone_size', 'fail', `${head}; ${parts.join('; ')}`, [...tooShort, ...tiny].map((s) => s.replace(/ \(.*$/, '')));
    } else if (narrow.length) add('zone_size', 'warn', `${head}; narrower than that across (crossing them the rate is not reached): ${list(narrow)}`, narrow.map((s) => s.replace(/ \(.*$/, '')));
    else add('zone_size', 'pass', `${head}; every zone is longer and wider than that`);
  }

  // --- totals
  const totals: RateTotal[] = [];
  const areaAc = m2ToAc(groundAreas.reduce((s, a) => s + a, 0));
  for (const rf of rateFields) {
    const u = UNIT_SUFFIX.find(([re]) => re.test(rf));
    const total = rates[rf].reduce<number>((s, v, i) => s + (v ?? 0) * (u?.[3] === 'ha' ? m2ToHa(groundAreas[i]) : m2ToAc(groundAreas[i])), 0);
    const t: RateTotal = { field: rf, unit: u ? u[1] : null, total, totalUnit: u ? u[2] : 'rate x ac', areaAc };
    totals.push(t);
    add('total', work ? 'pass' : 'warn', `"${rf}": ${fmt(total, 0)} ${t.totalUnit} over ${fmt(areaAc, 2)} ac${u ? '' : ' (unit not known from the column name)'}${work ? '' : ' (areas in file units: coordinate system unknown)'}`);
  }
  return { file: layer.label, ok: !lines.some((l) => l.status === 'fail'), lines, totals };
}

function pickRateFields(layer: CheckLayer, opts: CheckOptions, add: (c: string, s: CheckStatus, m: string, z?: string[]) => void): string[] {
  const all = layer.fields.map((f) => f.name);
  if (opts.rateField) {
    const f = layer.fields.find((x) => x.name.toLowerCase() === opts.rateField!.toLowerCase());
    if (!f) {
      add('rate_field', 'fail', `no column "${opts.rateField}"; the columns are ${all.join(', ') || 'none'}`);
      return [];
    }
    return [f.name];
  }
  const byUnit = layer.fields.filter((f) => UNIT_SUFFIX.some(([re]) => re.test(f.name)));
  if (byUnit.length) return byUnit.map((f) => f.name);
  const numeric = layer.fields.filter((f) => f.numeric && !/^(zone_?id|zone|id|zone_no|fid|objectid|area.*|acres?|hectares?|ha|ac)$/i.test(f.name));
  if (numeric.length === 1) {
    add('rate_field', 'warn', `no --rate-field given; using the only numeric column "${numeric[0].name}" (unit unknown)`);
    return [numeric[0].name];
  }
  add('rate_field', 'fail', `cannot tell the rate column: give --rate-field (columns: ${all.join(', ') || 'none'})`);
  return [];
}
