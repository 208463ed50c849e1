/**
 * Zip archives in memory (fflate): writing a file set, and reading one safely without extracting it.
 */
import { unzipSync, zipSync, type Zippable } from 'fflate';
import { UserError } from '../errors.js';

/**
 * Zips files (name -> bytes) into one archive, deflated, with a fixed timestamp so the same
 * files give the same bytes.
 *
 * @param files entry name -> content; names use / for folders
 * @param mtime entry date (default 2000-01-01 UTC, a fixed value so output is reproducible)
 * @example writeFileAtomic('rx.zip', zipFiles({ 'rx.shp': shp, 'rx.dbf': dbf }))
 */
export function zipFiles(files: Readonly<Record<string, Uint8Array>>, mtime: Date = new Date(Date.UTC(2000, 0, 1))): Uint8Array {
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

/** Limits for {@link readZip}: a small archive that unpacks to gigabytes is refused. */
export interface ZipLimits {
  /** total unpacked bytes (default 512 MiB) */
  maxTotalBytes?: number;
  /** number of entries (default 10 000) */
  maxEntries?: number;
}

/**
 * Reads a zip archive in memory, never extracting to disk. Any entry whose name would escape the
 * target folder (`../`, absolute path, drive letter) makes the whole archive a UserError naming it.
 * Folder entries are skipped.
 *
 * @param bytes the archive
 * @param label file name for messages
 * @returns entry name -> bytes
 * @example const entries = readZip(readInput('rx.zip', 'prescription'), 'rx.zip')
 */
export function readZip(bytes: Uint8Array, label: string, limits: ZipLimits = {}): Record<string, Uint8Array> {
  const maxTotal = limits.maxTotalBytes ?? 512 * 1024 * 1024, maxEntries = limits.maxEntries ?? 10_000;
  let total = 0, count = 0;
  const bad: string[] = [];
  let out: Record<string, Uint8Array>;
  try {
    out = unzipSync(bytes, {
      filter: (f) => {
        if (!isSafeEntryName(f.name)) bad.push(f.name);
        total += f.originalSize;
        count++;
        return bad.length === 0 && !f.name.endsWith('/') && total <= maxTotal && count <= maxEntries;
      },
    });
  } catch (e) {
    throw new UserError(`${label}: not a readable zip archive (${(e as Error).message}). Fix: re-create the zip, or pass the .shp or .geojson file itself.`, { file: label });
  }
  if (bad.length) {
    throw new UserError(`${label}: entry "${bad[0]}" points outside the folder it would be unpacked into; tilth refuses the whole archive and writes nothing. Fix: re-create the zip with plain file names.`, { file: label, where: bad[0] });
  }
  if (total > maxTotal || count > maxEntries) {
    throw new UserError(`${label}: the archive unpacks to ${count} entries and ${total} bytes, more than the ${maxEntries} entries / ${maxTotal} bytes tilth reads. Fix: zip only the prescription's files.`, { file: label });
  }
  return out;
}
