/**
 * Reading a shapefile set that any program may have written, for `tilth check`: header and
 * record counts are checked here first, then the `shapefile` package decodes geometry and attributes.
 */
import type { Feature } from 'geojson';
import { read as readShp } from 'shapefile';
import { UserError } from '../../errors.js';
import { inspectDbf, type DbfField, type DbfHeader } from './dbf.js';
import { inspectShp } from './shp.js';

/** The files of one set, by extension (lower case, no dot). */
export interface ShapefileBytes {
  shp: Uint8Array;
  shx?: Uint8Array;
  dbf?: Uint8Array;
  prj?: Uint8Array;
  cpg?: Uint8Array;
}

/** A shapefile set as read: features in the file's own coordinates, columns and raw column text. */
export interface ShapefileRead {
  features: Feature[];
  fields: DbfField[];
  /** .prj text, or null when there is none */
  prj: string | null;
  /** per column name: the raw text of each record (trimmed), for checking values the reader turned into null */
  rawText: Record<string, string[]>;
  /** ring coordinates per record straight from the .shp bytes (file winding, before any reader repairs it) */
  rings: Float64Array[][];
}

function toArrayBuffer(u: Uint8Array): ArrayBuffer {
  return u.buffer.slice(u.byteOffset, u.byteOffset + u.byteLength) as ArrayBuffer;
}

function rawColumns(bytes: Uint8Array, h: DbfHeader, decoder: { decode(b: Uint8Array): string }): Record<string, string[]> {
  const out: Record<string, string[]> = {};
  let off = 1;
  const offs = h.fields.map((f) => {
    const o = off;
    off += f.width;
    return o;
  });
  h.fields.forEach((f, i) => {
    const vals: string[] = [];
    for (let r = 0; r < h.records; r++) {
      const s = h.headerLength + r * h.recordLength + offs[i];
      vals.push(decoder.decode(bytes.subarray(s, s + f.width)).trim());
    }
    out[f.name] = vals;
  });
  return out;
}

/**
 * Reads a polygon shapefile set from bytes. Throws UserError (naming `label`) for: a truncated or
 * inconsistent .shp, a .shx or .dbf whose record count differs from the .shp, a missing .dbf,
 * or a shape type other than Polygon. Text is decoded as UTF-8 when the .cpg says so, else as windows-1252.
 *
 * @param files the set's files
 * @param label the .shp file name for messages
 * @example const set = await readShapefile({ shp, dbf, prj }, 'rx.shp')
 */
export async function readShapefile(files: ShapefileBytes, label: string): Promise<ShapefileRead> {
  const base = label.replace(/\.shp$/i, '');
  const layout = inspectShp(files.shp);
  if (typeof layout === 'string') throw new UserError(`${label}: not a readable shapefile: ${layout}. Fix: export the prescription again (the copy may be incomplete).`, { file: label });
  if (layout.shapeType !== 5) {
    throw new UserError(`${label}: holds shape type ${layout.shapeType}, not polygons (type 5). Fix: give the zone polygons of the prescription, not points or lines.`, { file: label, value: layout.shapeType });
  }
  if (files.shx) {
    const shxRecords = (files.shx.length - 100) / 8;
    if (shxRecords !== layout.records) {
      throw new UserError(`${base}.shx: lists ${shxRecords} records but ${label} holds ${layout.records}. Fix: export the prescription again; the files of the set do not belong together.`, { file: `${base}.shx` });
    }
  }
  if (!files.dbf) throw new UserError(`${label}: the attribute table ${base}.dbf is missing, so there are no rates. Fix: copy the .dbf beside the .shp (same name).`, { file: label });
  const h = inspectDbf(files.dbf);
  if (typeof h === 'string') throw new UserError(`${base}.dbf: not a readable dBASE table: ${h}. Fix: export the prescription again.`, { file: `${base}.dbf` });
  if (h.records !== layout.records) {
    throw new UserError(`${base}.dbf: holds ${h.records} records but ${label} holds ${layout.records} shapes; every zone needs exactly one row. Fix: export the prescription again; the files of the set do not belong together.`, { file: `${base}.dbf`, value: h.records });
  }
  const cpg = files.cpg ? new TextDecoder().decode(files.cpg).trim() : '';
  const encoding = /^(UTF-?8|65001)$/i.test(cpg) ? 'utf-8' : 'windows-1252';
  let fc;
  try {
    fc = await readShp(toArrayBuffer(files.shp), toArrayBuffer(files.dbf), { encoding });
  } catch (e) {
    throw new UserError(`${label}: cannot be decoded (${(e as Error).message}). Fix: export the prescription again.`, { file: label });
  }
  return {
    features: fc.features,
    fields: h.fields,
    prj: files.prj ? new TextDecoder().decode(files.prj) : null,
    rawText: rawColumns(files.dbf, h, new TextDecoder(encoding)),
    rings: layout.rings,
  };
}
