/**
 * Zip archives in memory (fflate): writing a file set, and reading one safely without extracting it.
 */
import { Unzip, UnzipInflate, unzipSync, zipSync, type Zippable } from 'fflate';
import { UserError } from '../errors.js';

/**
 * Zips files (name -> bytes) into one archive, deflated, with a fixed timestamp so the same
 * files give the same bytes.
 *
 * @param files entry name -> content; names use / for folders
 * @param mtime entry date (default 2000-01-01 UTC, a fixed value so output is reproducible)
 * @example writeFileAtomic('rx.zip', zipFiles({ 'rx.shp': shp, 'rx.dbf': dbf }))
 */
export function zipFiles(
  files: Readonly<Record<string, Uint8Array>>,
  mtime: Date = new Date(Date.UTC(2000, 0, 1)),
): Uint8Array {
  const z: Zippable = {};
  for (const [name, data] of Object.entries(files)) {
    if (!isSafeEntryName(name)) throw new RangeError(`zipFiles: unsafe entry name ${JSON.stringify(name)}`);
    z[name] = [data, { level: 6, mtime }];
  }
  return zipSync(z);
}

/**
 * True for an entry name that stays inside the folder it would be extracted to: relative,
 * no `..` segment, no drive letter, no backslash tricks, no NUL.
 */
export function isSafeEntryName(name: string): boolean {
  if (!name || name.includes('\0')) return false;
  const n = name.replace(/\\/g, '/');
  if (n.startsWith('/') || /^[A-Za-z]:/.test(n)) return false;
  return !n.split('/').some((seg) => seg === '..');
}

/**
 * Most bytes all entries of one archive may unpack to: 256 MiB. A soil-sample or boundary file is kilobytes and a
 * prescription a few megabytes; this bounds memory whatever an archive's headers claim.
 */
export const ZIP_MAX_TOTAL_BYTES = 256 * 1024 * 1024;
/** Most entries in one archive: 10 000. */
export const ZIP_MAX_ENTRIES = 10_000;
/**
 * Largest unpacked : packed ratio: 200. Shapefile parts pack 2-50 times (a .dbf of padded text the most);
 * deflate's limit is about 1032, which only a bomb of repeated bytes reaches. Judged once more than
 * {@link ZIP_RATIO_FLOOR_BYTES} are unpacked, so tiny files of repeated bytes pass.
 */
export const ZIP_MAX_RATIO = 200;
/**
 * Limits for ISO 11783-10 task data archives: unpacked : packed up to 1 100, above deflate's maximum (about 1032),
 * so the ratio refuses no deflated archive. A grid file (GRDnnnnn.bin) of equal rates over a large area is a run
 * of one 4-byte value, which deflate packs near its maximum (tilth's own task data of a field with a distant
 * part did); what bounds memory and time here is the total, 256 MiB, checked from the headers and while unpacking.
 */
export const TASKDATA_ZIP_LIMITS: ZipLimits = { maxRatio: 1_100 };
/** Unpacked size under which the ratio is not judged: 1 MiB. */
export const ZIP_RATIO_FLOOR_BYTES = 1024 * 1024;
/** Packed bytes fed to the inflater at a time, so one step unpacks at most about 4 MiB before the limits are checked. */
const FEED = 4096;

/** Limits for {@link readZip}: an archive that unpacks to far more than it holds is refused. */
export interface ZipLimits {
  /** total unpacked bytes (default {@link ZIP_MAX_TOTAL_BYTES}) */
  maxTotalBytes?: number;
  /** number of entries (default {@link ZIP_MAX_ENTRIES}) */
  maxEntries?: number;
  /** unpacked : packed (default {@link ZIP_MAX_RATIO}) */
  maxRatio?: number;
}

const mib = (n: number) => (n < 1048576 ? `${n} bytes` : `${(n / 1048576).toFixed(0)} MiB`);

/** Checks the central directory's claims (names, count, sizes, ratios) before anything is unpacked. */
function checkHeaders(
  bytes: Uint8Array,
  label: string,
  maxTotal: number,
  maxEntries: number,
  maxRatio: number,
): void {
  let total = 0,
    count = 0;
  let bad: string | undefined, bomb: string | undefined;
  try {
    unzipSync(bytes, {
      filter: (f) => {
        if (!isSafeEntryName(f.name)) bad ??= f.name;
        total += f.originalSize;
        count++;
        if (f.originalSize > ZIP_RATIO_FLOOR_BYTES && f.originalSize > maxRatio * Math.max(1, f.size))
          bomb ??= `${f.name} (${mib(f.originalSize)} from ${mib(f.size)})`;
        return false; // nothing is unpacked here
      },
    });
  } catch (e) {
    throw new UserError(
      `${label}: not a readable zip archive (${(e as Error).message}). Fix: re-create the zip, or pass the .shp or .geojson file itself.`,
      { file: label },
    );
  }
  if (bad !== undefined) {
    throw new UserError(
      `${label}: entry "${bad}" points outside the folder it would be unpacked into; tilth refuses the whole archive and writes nothing. Fix: re-create the zip with plain file names.`,
      { file: label, where: bad },
    );
  }
  if (count > maxEntries)
    throw new UserError(
      `${label}: the archive holds ${count} entries, more than the ${maxEntries} tilth reads. Fix: zip only the shapefile's or prescription's files.`,
      { file: label },
    );
  if (total > maxTotal)
    throw new UserError(
      `${label}: the archive says it unpacks to ${mib(total)}, more than the ${mib(maxTotal)} tilth reads from a zip. Fix: zip only the shapefile's or prescription's files.`,
      { file: label },
    );
  if (bomb)
    throw new UserError(
      `${label}: entry ${bomb} unpacks more than ${maxRatio} times its packed size, as only a zip bomb does; refused. Fix: zip the real files again.`,
      { file: label },
    );
}

/**
 * Reads a zip archive in memory, never extracting to disk, within limits checked twice: from the central
 * directory before unpacking (names, entry count, total size, per-entry ratio) and while unpacking, a few KiB
 * of packed data at a time (total bytes and ratio to the archive's size), since headers can lie. Any entry whose
 * name would escape the target folder (`../`, absolute path, drive letter) makes the whole archive a UserError.
 * Folder entries are skipped.
 *
 * @param bytes the archive
 * @param label file name for messages
 * @param limits defaults {@link ZIP_MAX_TOTAL_BYTES}, {@link ZIP_MAX_ENTRIES}, {@link ZIP_MAX_RATIO}
 * @returns entry name -> bytes
 * @example const entries = readZip(readInput('rx.zip', 'prescription'), 'rx.zip')
 */
export function readZip(
  bytes: Uint8Array,
  label: string,
  limits: ZipLimits = {},
): Record<string, Uint8Array> {
  const maxTotal = limits.maxTotalBytes ?? ZIP_MAX_TOTAL_BYTES,
    maxEntries = limits.maxEntries ?? ZIP_MAX_ENTRIES,
    maxRatio = limits.maxRatio ?? ZIP_MAX_RATIO;
  checkHeaders(bytes, label, maxTotal, maxEntries, maxRatio);
  const parts = new Map<string, Uint8Array[]>();
  let total = 0,
    over = '',
    failed = '';
  const uz = new Unzip((f) => {
    if (!isSafeEntryName(f.name)) {
      over = `entry "${f.name}" points outside the folder it would be unpacked into`;
      return;
    }
    if (f.name.endsWith('/') || parts.size >= maxEntries) return;
    const chunks: Uint8Array[] = [];
    parts.set(f.name, chunks);
    f.ondata = (err, chunk) => {
      if (err) {
        failed ||= err.message;
        return;
      }
      total += chunk.length;
      if (total > maxTotal) over ||= `it unpacks to more than ${mib(maxTotal)}`;
      else if (total > ZIP_RATIO_FLOOR_BYTES && total > maxRatio * bytes.length)
        over ||= `it unpacks more than ${maxRatio} times its size, as only a zip bomb does`;
      if (over) f.terminate();
      else chunks.push(chunk);
    };
    f.start();
  });
  uz.register(UnzipInflate);
  try {
    for (let i = 0; i < bytes.length && !over; i += FEED)
      uz.push(bytes.subarray(i, Math.min(bytes.length, i + FEED)), i + FEED >= bytes.length);
  } catch (e) {
    failed ||= (e as Error).message;
  }
  if (over)
    throw new UserError(
      `${label}: ${over}; refused. Fix: zip only the shapefile's or prescription's real files.`,
      { file: label },
    );
  if (failed)
    throw new UserError(
      `${label}: not a readable zip archive (${failed}). Fix: re-create the zip, or pass the .shp or .geojson file itself.`,
      { file: label },
    );
  const out: Record<string, Uint8Array> = {};
  for (const [name, chunks] of parts) out[name] = concatBytes(chunks);
  return out;
}

/**
 * The chunks one after another in one array (a single chunk is returned as it is).
 * @example concatBytes([Uint8Array.of(1), Uint8Array.of(2, 3)]) // Uint8Array [1, 2, 3]
 */
export function concatBytes(chunks: readonly Uint8Array[]): Uint8Array {
  if (chunks.length === 1) return chunks[0]!;
  const out = new Uint8Array(chunks.reduce((s, c) => s + c.length, 0));
  let o = 0;
  for (const c of chunks) {
    out.set(c, o);
    o += c.length;
  }
  return out;
}
