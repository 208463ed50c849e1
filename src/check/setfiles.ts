/**
 * A shapefile set's files agree with each other as GDAL requires (ESRI Shapefile Technical Description, 1998):
 * the .shx index has one 8-byte entry per .shp record, each pointing at that record with its length; the .dbf
 * header's record count is the .shp's, and the file holds header + count x record length bytes. GDAL finds
 * records through the .shx and attributes through the .dbf header, so a set where these disagree is read
 * differently (or not at all) by GDAL; `tilth check` refuses it instead of passing what a terminal may not load.
 */

/** The .shp records as [offset, content length] in bytes (content after the 8-byte record header). */
function shpRecords(shp: Uint8Array): [number, number][] | string {
  const dv = new DataView(shp.buffer, shp.byteOffset, shp.byteLength);
  if (shp.length < 100 || dv.getInt32(0, false) !== 9994) return 'the .shp header is damaged';
  const end = Math.min(shp.length, dv.getInt32(24, false) * 2);
  const out: [number, number][] = [];
  for (let o = 100; o + 8 <= end;) {
    const len = dv.getInt32(o + 4, false) * 2;
    if (len < 0 || o + 8 + len > end) return `.shp record ${out.length + 1} runs past the end of the file`;
    out.push([o, len]);
    o += 8 + len;
  }
  return out;
}

/**
 * Why the set's .shp, .shx and .dbf disagree, or '' when they agree (or the .shx / .dbf is absent: other
 * checks name a missing file).
 * @example setFilesProblem(shp, shx, dbf) // '.shx entry 3 points at byte 7020, but that .shp record starts at 7012'
 */
export function setFilesProblem(
  shp: Uint8Array,
  shx: Uint8Array | undefined,
  dbf: Uint8Array | undefined,
): string {
  const recs = shpRecords(shp);
  if (typeof recs === 'string') return recs;
  if (shx) {
    const dv = new DataView(shx.buffer, shx.byteOffset, shx.byteLength);
    if (shx.length < 100 || dv.getInt32(0, false) !== 9994) return 'the .shx header is damaged';
    if (dv.getInt32(24, false) * 2 !== shx.length)
      return `the .shx header gives a length of ${dv.getInt32(24, false) * 2} bytes, but the file has ${shx.length}`;
    const n = (shx.length - 100) / 8;
    if (n !== recs.length) return `the .shx indexes ${n} records, the .shp holds ${recs.length}`;
    for (let i = 0; i < n; i++) {
      const off = dv.getInt32(100 + 8 * i, false) * 2,
        len = dv.getInt32(104 + 8 * i, false) * 2;
      if (off !== recs[i]![0] || len !== recs[i]![1])
        return `.shx entry ${i + 1} (byte ${off}, ${len} bytes) does not match .shp record ${i + 1} (byte ${recs[i]![0]}, ${recs[i]![1]} bytes)`;
    }
  }
  if (dbf) {
    if (dbf.length < 32) return 'the .dbf header is damaged';
    const dv = new DataView(dbf.buffer, dbf.byteOffset, dbf.byteLength);
    const count = dv.getUint32(4, true),
      headerLen = dv.getUint16(8, true),
      recLen = dv.getUint16(10, true);
    if (count !== recs.length)
      return `the .dbf header counts ${count} records, the .shp holds ${recs.length}`;
    if (headerLen < 33 || recLen < 1 || headerLen + count * recLen > dbf.length)
      return `the .dbf is shorter than its header says (${headerLen} + ${count} x ${recLen} bytes, the file has ${dbf.length})`;
    if (dbf[headerLen - 1] !== 0x0d)
      return 'the .dbf field list does not end where its header says (no 0x0D terminator)';
    return dbfFieldsProblem(dbf, headerLen, recLen, count);
  }
  return '';
}

const NUMERIC_BYTE = /^[0-9 +\-.eE*]*$/;

/** Field names readable (printable ASCII, not empty), widths adding up to the record, numbers holding only number characters. */
function dbfFieldsProblem(dbf: Uint8Array, headerLen: number, recLen: number, count: number): string {
  const fields: { name: string; type: string; width: number }[] = [];
  for (let o = 32; o + 32 <= headerLen - 1; o += 32) {
    const raw = dbf.subarray(o, o + 11);
    const nul = raw.indexOf(0);
    const nameBytes = raw.subarray(0, nul < 0 ? 11 : nul);
    if (nameBytes.length === 0 || nameBytes.some((b) => b < 0x20 || b > 0x7e))
      return `.dbf field ${fields.length + 1} has no readable name`;
    fields.push({
      name: String.fromCharCode(...nameBytes),
      type: String.fromCharCode(dbf[o + 11]!),
      width: dbf[o + 16]!,
    });
  }
  if (1 + fields.reduce((t, f) => t + f.width, 0) !== recLen)
    return `the .dbf field widths add up to ${fields.reduce((t, f) => t + f.width, 0) + 1} bytes, its header says ${recLen} per record`;
  const text = new TextDecoder('latin1');
  for (let r = 0; r < count; r++) {
    let o = headerLen + r * recLen + 1;
    for (const f of fields) {
      if (
        (f.type === 'N' || f.type === 'F') &&
        !NUMERIC_BYTE.test(text.decode(dbf.subarray(o, o + f.width)))
      ) {
        return `.dbf record ${r + 1}, field ${f.name}: ${JSON.stringify(text.decode(dbf.subarray(o, o + f.width)).trim())} is not a number`;
      }
      o += f.width;
    }
  }
  return '';
}
