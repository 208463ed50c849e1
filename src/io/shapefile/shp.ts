/**
 * Polygon geometry in the ESRI shapefile main file (.shp) and its index (.shx),
 * following the ESRI Shapefile Technical Description (July 1998). Shape type 5 (Polygon) only.
 */
import { ringsBbox } from '../../geo/area.js';

/** One feature: its rings (closed, x0 y0 ... xn yn, first == last), already in shapefile winding. */
export type ShpPolygon = Float64Array[];

const HEADER = 100;
const FILE_CODE = 9994;
const VERSION = 1000;
/** Shape type 5: Polygon (ESRI technical description, table 1). */
export const SHAPE_POLYGON = 5;

/** Bytes of one Polygon record's content: type, bbox, NumParts, NumPoints, Parts[], Points[]. */
function contentBytes(rings: ShpPolygon): number {
  let pts = 0;
  for (const r of rings) pts += r.length >> 1;
  return 44 + 4 * rings.length + 16 * pts;
}

function writeHeader(v: DataView, lengthWords: number, bbox: [number, number, number, number]): void {
  v.setInt32(0, FILE_CODE, false);
  v.setInt32(24, lengthWords, false);
  v.setInt32(28, VERSION, true);
  v.setInt32(32, SHAPE_POLYGON, true);
  v.setFloat64(36, bbox[0], true);
  v.setFloat64(44, bbox[1], true);
  v.setFloat64(52, bbox[2], true);
  v.setFloat64(60, bbox[3], true);
  // Z and M ranges stay 0 (unused for shape type 5)
}

/**
 * Encodes polygons as .shp and .shx bytes. Rings are written as given: the caller orients them
 * (exterior clockwise, holes counter-clockwise) and closes them.
 *
 * @param polygons one entry per feature (record numbers start at 1, in this order)
 * @returns `shp`, `shx` and the file bounding box
 * @example
 * const { shp, shx } = encodePolygons([[new Float64Array([0,0, 0,1, 1,1, 1,0, 0,0])]]);
 */
export function encodePolygons(polygons: ShpPolygon[]): {
  shp: Uint8Array;
  shx: Uint8Array;
  bbox: [number, number, number, number];
} {
  let total = HEADER;
  for (const p of polygons) total += 8 + contentBytes(p);
  const shp = new Uint8Array(total);
  const shx = new Uint8Array(HEADER + 8 * polygons.length);
  const sv = new DataView(shp.buffer),
    xv = new DataView(shx.buffer);
  let fx0 = Infinity,
    fy0 = Infinity,
    fx1 = -Infinity,
    fy1 = -Infinity;
  let off = HEADER;
  polygons.forEach((rings, i) => {
    const len = contentBytes(rings);
    xv.setInt32(HEADER + 8 * i, off / 2, false);
    xv.setInt32(HEADER + 8 * i + 4, len / 2, false);
    sv.setInt32(off, i + 1, false);
    sv.setInt32(off + 4, len / 2, false);
    const c = off + 8;
    const bb = ringsBbox(rings);
    fx0 = Math.min(fx0, bb[0]);
    fy0 = Math.min(fy0, bb[1]);
    fx1 = Math.max(fx1, bb[2]);
    fy1 = Math.max(fy1, bb[3]);
    sv.setInt32(c, SHAPE_POLYGON, true);
    for (let k = 0; k < 4; k++) sv.setFloat64(c + 4 + 8 * k, bb[k], true);
    sv.setInt32(c + 36, rings.length, true);
    let npts = 0;
    for (const r of rings) npts += r.length >> 1;
    sv.setInt32(c + 40, npts, true);
    let start = 0,
      p = c + 44;
    for (const r of rings) {
      sv.setInt32(p, start, true);
      p += 4;
      start += r.length >> 1;
    }
    for (const r of rings) for (let k = 0; k < r.length; k++, p += 8) sv.setFloat64(p, r[k], true);
    off += 8 + len;
  });
  const bbox: [number, number, number, number] = polygons.length ? [fx0, fy0, fx1, fy1] : [0, 0, 0, 0];
  writeHeader(sv, total / 2, bbox);
  writeHeader(xv, shx.length / 2, bbox);
  return { shp, shx, bbox };
}

/** What {@link inspectShp} finds in a .shp file's bytes. */
export interface ShpLayout {
  shapeType: number;
  /** records found by walking the record headers */
  records: number;
  /** per record: rings as flat coordinate arrays (Polygon / PolyLine only; empty for others) */
  rings: Float64Array[][];
}

/**
 * Walks a .shp file's header and record headers and checks them against the file's length,
 * so a truncated or padded file is caught before any reader silently stops early.
 * Returns a problem description (for a user message) instead of throwing.
 *
 * @example const r = inspectShp(bytes); if (typeof r === 'string') throw new UserError(r);
 */
export function inspectShp(bytes: Uint8Array): ShpLayout | string {
  if (bytes.length < HEADER) return `it has ${bytes.length} bytes, fewer than the 100-byte header`;
  const v = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  if (v.getInt32(0, false) !== FILE_CODE) return `its first 4 bytes are not the shapefile code 9994`;
  const declared = v.getInt32(24, false) * 2;
  if (declared !== bytes.length) {
    return (
      `its header says ${declared} bytes but the file has ${bytes.length}` +
      (declared > bytes.length ? ' (the file is truncated)' : '')
    );
  }
  const shapeType = v.getInt32(32, true);
  const rings: Float64Array[][] = [];
  let off = HEADER,
    n = 0;
  while (off < bytes.length) {
    if (off + 8 > bytes.length) return `record ${n + 1} header is cut off at byte ${off}`;
    const len = v.getInt32(off + 4, false) * 2;
    if (len < 4 || off + 8 + len > bytes.length)
      return `record ${n + 1} at byte ${off} claims ${len} bytes of content, past the end of the file (the file is truncated)`;
    const c = off + 8;
    const t = v.getInt32(c, true);
    const recRings: Float64Array[] = [];
    if ((t === 5 || t === 3) && len >= 44) {
      const np = v.getInt32(c + 36, true),
        nq = v.getInt32(c + 40, true);
      if (np < 0 || nq < 0 || 44 + 4 * np + 16 * nq > len)
        return `record ${n + 1} declares ${np} rings and ${nq} points, more than its ${len} bytes hold`;
      const starts: number[] = [];
      for (let k = 0; k < np; k++) starts.push(v.getInt32(c + 44 + 4 * k, true));
      const p0 = c + 44 + 4 * np;
      for (let k = 0; k < np; k++) {
        const a = starts[k],
          b = k + 1 < np ? starts[k + 1] : nq;
        if (a < 0 || b > nq || b < a) return `record ${n + 1} ring ${k + 1} has a bad start index ${a}`;
        const r = new Float64Array(2 * (b - a));
        for (let q = 0; q < r.length; q++) r[q] = v.getFloat64(p0 + 8 * (2 * a + q), true);
        recRings.push(r);
      }
    }
    rings.push(recRings);
    n++;
    off += 8 + len;
  }
  return { shapeType, records: n, rings };
}
