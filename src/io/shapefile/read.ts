/**
 * The one ESRI shapefile reader, for inputs and for `tilth check`: the header and record counts of the .shp,
 * .shx and .dbf are checked first (a truncated copy is named, never read short), then the `shapefile` package
 * decodes geometry and attributes. Coordinates stay as the file has them; `shapefileLonLat` (./lonlat.ts) turns
 * them into WGS 84 longitude/latitude. Takes bytes, never paths.
 */
import type { Feature } from 'geojson';
import { UserError } from '../../errors.js';
import { inspectDbf, type DbfField, type DbfHeader } from './dbf.js';
import { inspectShp } from './shp.js';

/** The files of one shapefile set: .shp required; .shx, .dbf, .prj, .cpg as found beside it. */
export interface ShapefileBytes {
  shp: Uint8Array;
  shx?: Uint8Array;
  dbf?: Uint8Array;
  prj?: Uint8Array;
  cpg?: Uint8Array;
}

/** A shapefile set as read: features in the file's own coordinates, columns and raw column text. */
export interface ShapefileRead {
  /** the .shp name, for messages */
  file: string;
  /** shape type from the .shp header (1 Point, 3 PolyLine, 5 Polygon, 8 MultiPoint ...) */
  shapeType: number;
  features: Feature[];
  /** the .dbf columns (none without a .dbf) */
  fields: DbfField[];
  /** .prj text, or null when there is none (or it is blank) */
  prj: string | null;
  /** per column name: the raw text of each record (trimmed), to tell "blank" from "text the reader dropped" */
  rawText: Record<string, string[]>;
}

/**
 * Text encoding for the .dbf from a .cpg ("UTF-8", "1252", "ISO-8859-1" ...); windows-1252 without one.
 * @example encodingFromCpg('1252') // 'windows-1252'
 */
export function encodingFromCpg(cpg: string | undefined): string {
  if (!cpg || !cpg.trim()) return 'windows-1252';
  const c = cpg.trim().toLowerCase();
  if (/^utf-?8$/.test(c)) return 'utf-8';
  if (/^\d+$/.test(c)) return c === '65001' ? 'utf-8' : `windows-${c}`;
  if (/^(iso[-_ ]?)?8859[-_ ]?(\d+)$/.test(c)) return `iso-8859-${/(\d+)$/.exec(c)![1]}`;
  return c;
}

/** A decoder for the .cpg's encoding; one the platform does not know reads as windows-1252. */
function decoder(encoding: string): { decode(b: Uint8Array): string } {
  try {
    return new TextDecoder(encoding);
  } catch {
    return new TextDecoder('windows-1252');
  }
}

function toArrayBuffer(u: Uint8Array): ArrayBuffer {
  return u.buffer.slice(u.byteOffset, u.byteOffset + u.byteLength) as ArrayBuffer;
}

function rawColumns(
  bytes: Uint8Array,
  h: DbfHeader,
  decoder: { decode(b: Uint8Array): string },
): Record<string, string[]> {
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

/** Checks the .shp, .shx and .dbf headers against each other; returns the .dbf header (null without a .dbf). */
function checkSet(
  files: ShapefileBytes,
  label: string,
): { records: number; shapeType: number; dbf: DbfHeader | null } {
  const base = label.replace(/\.shp$/i, '');
  if (files.shp.length === 0)
    throw new UserError(`${label}: the .shp file is empty (0 bytes). Fix: export the layer again.`, {
      file: label,
    });
  if (files.dbf && files.dbf.length === 0) {
    throw new UserError(
      `${label}: the .dbf file beside it is empty (0 bytes), so the attributes are lost. Fix: export the layer again, or copy the whole set of files (.shp, .shx, .dbf, .prj, .cpg).`,
      { file: label },
    );
  }
  const layout = inspectShp(files.shp);
  if (typeof layout === 'string')
    throw new UserError(
      `${label}: not a readable shapefile: ${layout}. Fix: export the layer again (the copy may be incomplete).`,
      { file: label },
    );
  if (files.shx) {
    const shxRecords = (files.shx.length - 100) / 8;
    if (shxRecords !== layout.records) {
      throw new UserError(
        `${base}.shx: lists ${shxRecords} records but ${label} holds ${layout.records}. Fix: export the layer again; the files of the set do not belong together.`,
        { file: `${base}.shx` },
      );
    }
  }
  if (!files.dbf) return { records: layout.records, shapeType: layout.shapeType, dbf: null };
  const h = inspectDbf(files.dbf);
  if (typeof h === 'string')
    throw new UserError(`${base}.dbf: not a readable dBASE table: ${h}. Fix: export the layer again.`, {
      file: `${base}.dbf`,
    });
  if (h.records !== layout.records) {
    throw new UserError(
      `${base}.dbf: holds ${h.records} records but ${label} holds ${layout.records} shapes; every shape needs exactly one row. Fix: export the layer again; the files of the set do not belong together.`,
      { file: `${base}.dbf`, value: h.records },
    );
  }
  return { records: layout.records, shapeType: layout.shapeType, dbf: h };
}

/**
 * Reads a shapefile set from bytes. Throws UserError (naming `label`) for an empty, truncated or inconsistent
 * .shp, a .shx or .dbf whose record count differs from the .shp, or a set the `shapefile` package cannot decode.
 * Text is decoded by the .cpg (windows-1252 without one). The shape type and the .dbf's presence are the
 * caller's to judge.
 *
 * @param files the set's files
 * @param label the .shp file name for messages
 * @example const set = await readShapefile({ shp, dbf, prj }, 'rx.shp'); set.features.length
 */
export async function readShapefile(files: ShapefileBytes, label: string): Promise<ShapefileRead> {
  const { shapeType, dbf } = checkSet(files, label);
  const cpg = files.cpg ? new TextDecoder().decode(files.cpg) : undefined;
  const encoding = encodingFromCpg(cpg);
  // loaded only when a shapefile is read: the package and its text-encoding polyfill cost about 0.1 s of
  // start-up for every command otherwise (docs/performance.md)
  // a CommonJS package: its exports are the namespace's default everywhere (Node, tsx, the split bundle, where
  // they are not also copied onto the namespace)
  const mod = await import('shapefile');
  const shapefile = mod.default ?? mod;
  let fc;
  try {
    fc = await shapefile.read(toArrayBuffer(files.shp), files.dbf ? toArrayBuffer(files.dbf) : undefined, {
      encoding,
    });
  } catch (e) {
    throw new UserError(
      `${label}: cannot be read as a shapefile (${(e as Error).message}). Fix: export the layer again.`,
      { file: label },
    );
  }
  const prj = files.prj ? new TextDecoder().decode(files.prj) : '';
  return {
    file: label,
    shapeType,
    features: fc.features,
    fields: dbf?.fields ?? [],
    prj: prj.trim() ? prj : null,
    rawText: files.dbf && dbf ? rawColumns(files.dbf, dbf, decoder(encoding)) : {},
  };
}
