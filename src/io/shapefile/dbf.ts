/**
 * dBASE III attribute table (.dbf) of a shapefile, following the ESRI Shapefile Technical Description
 * (July 1998, "dBASE File") and the dBASE III PLUS file structure. Text is written as UTF-8 and a
 * `.cpg` file saying so goes beside it.
 */

/** One column of the table. */
export interface DbfField {
  /** column name, 1-10 ASCII characters (see {@link shortFieldNames}) */
  name: string;
  /** N = number written as text, C = text */
  type: 'N' | 'C';
  /** characters per value: N 1-20 (digits, sign and point), C 1-254 bytes */
  width: number;
  /** digits after the point for N (0 for whole numbers); must be 0 for C */
  decimals: number;
}

const enc = new TextEncoder();

/** Text of a number right-justified in `width` characters with `decimals` digits; blanks for NaN/null. */
export function formatNumber(v: number | null | undefined, width: number, decimals: number): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return ' '.repeat(width);
  let s = v.toFixed(decimals);
  if (s === '-0' || /^-0\.0*$/.test(s)) s = s.slice(1);
  if (s.length > width)
    throw new RangeError(`dbf: ${v} needs ${s.length} characters, more than the column width ${width}`);
  return s.padStart(width, ' ');
}

/**
 * UTF-8 bytes of text cut to at most `width` bytes without splitting a character, padded with spaces. Control
 * characters (NUL, the 0x1A end-of-file mark, ESC, line breaks ...) become spaces: readers stop or split on them.
 */
function textBytes(s: string, width: number): Uint8Array {
  const out = new Uint8Array(width).fill(0x20);
  let b = enc.encode(s.replace(/[\u0000-\u001f\u007f-\u009f]/g, ' '));
  if (b.length > width) {
    let cut = width;
    while (cut > 0 && (b[cut] & 0xc0) === 0x80) cut--; // do not start the cut inside a multi-byte character
    b = b.subarray(0, cut);
  }
  out.set(b);
  return out;
}

/** Checks a column list; throws RangeError for a programming mistake (bad width, name, duplicate). */
export function validateFields(fields: readonly DbfField[]): void {
  const seen = new Set<string>();
  for (const f of fields) {
    if (!/^[A-Za-z][A-Za-z0-9_]{0,9}$/.test(f.name))
      throw new RangeError(
        `dbf: column name "${f.name}" is not 1-10 ASCII letters, digits or _ starting with a letter`,
      );
    const key = f.name.toUpperCase();
    if (seen.has(key)) throw new RangeError(`dbf: column name "${f.name}" is used twice`);
    seen.add(key);
    if (
      f.type === 'N' &&
      (f.width < 1 ||
        f.width > 20 ||
        f.decimals < 0 ||
        f.decimals > 15 ||
        (f.decimals > 0 && f.decimals > f.width - 2))
    ) {
      throw new RangeError(`dbf: numeric column "${f.name}" has width ${f.width} and ${f.decimals} decimals`);
    }
    if (f.type === 'C' && (f.width < 1 || f.width > 254 || f.decimals !== 0))
      throw new RangeError(`dbf: text column "${f.name}" has width ${f.width}`);
  }
}

/**
 * Encodes a dBASE III table.
 *
 * @param fields columns, in order
 * @param rows one array of values per record, in column order (numbers for N, strings for C; null = blank)
 * @param date the "last update" date in the header (default: today, UTC); pass one for byte-stable output
 * @example encodeDbf([{ name: 'zone', type: 'N', width: 4, decimals: 0 }], [[1], [2]], new Date('2026-04-01'))
 */
export function encodeDbf(
  fields: readonly DbfField[],
  rows: readonly (readonly (string | number | null)[])[],
  date: Date = new Date(),
): Uint8Array {
  validateFields(fields);
  const headerLen = 32 + 32 * fields.length + 1;
  const recLen = 1 + fields.reduce((s, f) => s + f.width, 0);
  const out = new Uint8Array(headerLen + recLen * rows.length + 1);
  const v = new DataView(out.buffer);
  out[0] = 0x03; // dBASE III without memo
  out[1] = date.getUTCFullYear() - 1900;
  out[2] = date.getUTCMonth() + 1;
  out[3] = date.getUTCDate();
  v.setUint32(4, rows.length, true);
  v.setUint16(8, headerLen, true);
  v.setUint16(10, recLen, true);
  fields.forEach((f, i) => {
    const d = 32 + 32 * i;
    out.set(enc.encode(f.name), d); // rest of the 11-byte name stays 0
    out[d + 11] = f.type.charCodeAt(0);
    out[d + 16] = f.width;
    out[d + 17] = f.decimals;
  });
  out[headerLen - 1] = 0x0d;
  let p = headerLen;
  rows.forEach((row, r) => {
    if (row.length !== fields.length)
      throw new RangeError(`dbf: row ${r + 1} has ${row.length} values for ${fields.length} columns`);
    out[p++] = 0x20; // not deleted
    fields.forEach((f, i) => {
      const val = row[i];
      if (f.type === 'N') {
        if (val !== null && typeof val !== 'number')
          throw new RangeError(
            `dbf: row ${r + 1} column "${f.name}" is numeric but got ${JSON.stringify(val)}`,
          );
        out.set(enc.encode(formatNumber(val, f.width, f.decimals)), p);
      } else {
        out.set(textBytes(val === null ? '' : String(val), f.width), p);
      }
      p += f.width;
    });
  });
  out[p] = 0x1a; // end of file
  return out;
}

/** The header facts of a .dbf, read back for checks: record count and columns. */
export interface DbfHeader {
  records: number;
  headerLength: number;
  recordLength: number;
  fields: DbfField[];
}

/**
 * Reads a .dbf header and checks that the file is long enough for the records it declares.
 * Returns a problem description instead of throwing.
 */
export function inspectDbf(bytes: Uint8Array): DbfHeader | string {
  if (bytes.length < 33) return `it has ${bytes.length} bytes, too few for a dBASE header`;
  const v = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const records = v.getUint32(4, true),
    headerLength = v.getUint16(8, true),
    recordLength = v.getUint16(10, true);
  const fields: DbfField[] = [];
  const dec = new TextDecoder('latin1');
  for (let d = 32; d + 32 <= headerLength && bytes[d] !== 0x0d; d += 32) {
    const raw = bytes.subarray(d, d + 11);
    const end = raw.indexOf(0);
    fields.push({
      name: dec.decode(end >= 0 ? raw.subarray(0, end) : raw),
      type: String.fromCharCode(bytes[d + 11]) as 'N' | 'C',
      width: bytes[d + 16],
      decimals: bytes[d + 17],
    });
  }
  const need = headerLength + records * recordLength;
  if (bytes.length < need)
    return `its header declares ${records} records of ${recordLength} bytes (${need} bytes) but the file has ${bytes.length} (the file is truncated)`;
  return { records, headerLength, recordLength, fields };
}
