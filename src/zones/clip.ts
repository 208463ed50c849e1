/**
 * Clipping traced zones to the exact field boundary (polyclip-ts), only where a zone reaches the edge.
 */
import * as polyclip from 'polyclip-ts';
import { createRequire } from 'node:module';
import type { RingsPart } from '../types.js';
import { orient, partArea } from '../geo/area.js';
import type { RasterFrame } from './trace.js';

/**
 * Marks the cells whose square the field boundary may cross (conservative: every ring segment is walked
 * in steps shorter than a cell and the cells under each step's bounding box are marked).
 * A cell that is not marked lies wholly inside or wholly outside the field.
 * @example const band = boundaryCells(field.parts, grid);
 */
export function boundaryCells(parts: RingsPart[], f: RasterFrame): Uint8Array {
  const { cols, rows, xmin, ymax, cell } = f;
  const band = new Uint8Array(cols * rows);
  const eps = cell * 1e-9;
  const mark = (x0: number, y0: number, x1: number, y1: number) => {
    const c0 = Math.max(0, Math.floor((Math.min(x0, x1) - eps - xmin) / cell));
    const c1 = Math.min(cols - 1, Math.floor((Math.max(x0, x1) + eps - xmin) / cell));
    const r0 = Math.max(0, Math.floor((ymax - Math.max(y0, y1) - eps) / cell));
    const r1 = Math.min(rows - 1, Math.floor((ymax - Math.min(y0, y1) + eps) / cell));
    for (let r = r0; r <= r1; r++) for (let c = c0; c <= c1; c++) band[r * cols + c] = 1;
  };
  for (const p of parts) {
    for (const ring of [p.exterior, ...p.holes]) {
      for (let k = 0; k + 3 < ring.length; k += 2) {
        const ax = ring[k],
          ay = ring[k + 1],
          bx = ring[k + 2],
          by = ring[k + 3];
        const steps = Math.max(1, Math.ceil(Math.hypot(bx - ax, by - ay) / (cell * 0.5)));
        for (let s = 0; s < steps; s++) {
          const t0 = s / steps,
            t1 = (s + 1) / steps;
          mark(ax + (bx - ax) * t0, ay + (by - ay) * t0, ax + (bx - ax) * t1, ay + (by - ay) * t1);
        }
      }
    }
  }
  return band;
}

type Ring = [number, number][];

function toLocal(r: Float64Array, ox: number, oy: number): Ring {
  const out: Ring = [];
  for (let i = 0; i + 1 < r.length; i += 2) out.push([r[i] - ox, r[i + 1] - oy]);
  return out;
}

function fromLocal(r: Ring, ox: number, oy: number): Float64Array {
  const out = new Float64Array(r.length * 2);
  for (let i = 0; i < r.length; i++) {
    out[2 * i] = r[i][0] + ox;
    out[2 * i + 1] = r[i][1] + oy;
  }
  return out;
}

// jsts (a 1 MB bundle) is loaded on first use, so commands that never clip start faster
let jstsLib: any = null; // the jsts module (untyped)
let gfInstance: any = null;
function jstsModule() {
  jstsLib ??= createRequire(import.meta.url)('jsts');
  return jstsLib;
}
function geometryFactory() {
  gfInstance ??= new (jstsModule().geom.GeometryFactory)();
  return gfInstance;
}
const fieldCache = new WeakMap<RingsPart[], { ox: number; oy: number; g: unknown }>();

function toJsts(parts: RingsPart[], ox: number, oy: number): unknown {
  const jsts = jstsModule();
  const gf = geometryFactory();
  const ring = (r: Float64Array) => {
    const cs = [];
    for (let i = 0; i + 1 < r.length; i += 2) cs.push(new jsts.geom.Coordinate(r[i] - ox, r[i + 1] - oy));
    return gf.createLinearRing(cs);
  };
  return gf.createMultiPolygon(parts.map((p) => gf.createPolygon(ring(p.exterior), p.holes.map(ring))));
}

function fromJsts(g: any, ox: number, oy: number, minPartM2: number): RingsPart[] {
  const out: RingsPart[] = [];
  const ring = (ls: any) => {
    const cs = ls.getCoordinates();
    const r = new Float64Array(cs.length * 2);
    for (let i = 0; i < cs.length; i++) {
      r[2 * i] = cs[i].x + ox;
      r[2 * i + 1] = cs[i].y + oy;
    }
    return r;
  };
  const visit = (x: any) => {
    const type = x.getGeometryType();
    if (type === 'Polygon') {
      if (x.isEmpty()) return;
      const holes: Float64Array[] = [];
      for (let k = 0; k < x.getNumInteriorRing(); k++) holes.push(orient(ring(x.getInteriorRingN(k)), false));
      const part = { exterior: orient(ring(x.getExteriorRing()), true), holes };
      if (partArea(part) >= minPartM2) out.push(part);
    } else if (type === 'MultiPolygon' || type === 'GeometryCollection') {
      for (let k = 0; k < x.getNumGeometries(); k++) visit(x.getGeometryN(k));
    }
  };
  visit(g);
  return out;
}

/**
 * Intersection of polygon parts with the field, computed around a local origin so the arithmetic works on
 * small numbers. Uses JTS's overlay (jsts), which is about 10x faster than polyclip-ts on staircase
 * rings; falls back to polyclip-ts if JTS reports a topology problem. Rings come back closed, exteriors
 * counter-clockwise, holes clockwise; parts with no area (below `minPartM2`, default 1e-6 m2) are dropped.
 * @example const clipped = clipParts(zoneParts, field.parts, grid.xmin, grid.ymax);
 */
export function clipParts(
  parts: RingsPart[],
  clip: RingsPart[],
  ox: number,
  oy: number,
  minPartM2 = 1e-6,
): RingsPart[] {
  try {
    let f = fieldCache.get(clip);
    if (!f || f.ox !== ox || f.oy !== oy) {
      f = { ox, oy, g: toJsts(clip, ox, oy) };
      fieldCache.set(clip, f);
    }
    const res = (toJsts(parts, ox, oy) as any).intersection(f.g);
    return fromJsts(res, ox, oy, minPartM2);
  } catch {
    return clipPartsPolyclip(parts, clip, ox, oy, minPartM2);
  }
}

/**
 * The same intersection with polyclip-ts (slower; used when JTS fails, and as a cross-check in tests).
 * @example const clipped = clipPartsPolyclip(zoneParts, field.parts, grid.xmin, grid.ymax);
 */
export function clipPartsPolyclip(
  parts: RingsPart[],
  clip: RingsPart[],
  ox: number,
  oy: number,
  minPartM2 = 1e-6,
): RingsPart[] {
  const a = parts.map((p) => [toLocal(p.exterior, ox, oy), ...p.holes.map((h) => toLocal(h, ox, oy))]);
  const b = clip.map((p) => [toLocal(p.exterior, ox, oy), ...p.holes.map((h) => toLocal(h, ox, oy))]);
  const res = robust(() => polyclip.intersection(a as polyclip.Geom, b as polyclip.Geom) as Ring[][]);
  const out: RingsPart[] = [];
  for (const poly of res) {
    const ext = orient(fromLocal(poly[0], ox, oy), true);
    const holes = poly.slice(1).map((h) => orient(fromLocal(h, ox, oy), false));
    const part: RingsPart = { exterior: ext, holes };
    if (partArea(part) >= minPartM2) out.push(part);
  }
  return out;
}

/**
 * Runs a polyclip-ts operation with a small snapping tolerance. With its default (exact) setting
 * polyclip-ts 0.16 sometimes fails to link output rings on staircase input ("Unable to complete output
 * ring"); a tolerance of 1e-9 (coordinates are local metres) avoids it. Retries coarser, then rethrows.
 * @example const u = robust(() => polyclip.union(a, b));
 */
export function robust<T>(op: () => T): T {
  let last: unknown;
  for (const eps of [1e-9, 1e-7, 1e-5]) {
    polyclip.setPrecision(eps);
    try {
      return op();
    } catch (e) {
      last = e;
    } finally {
      polyclip.setPrecision();
    }
  }
  throw last;
}
