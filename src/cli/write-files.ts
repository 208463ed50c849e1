/**
 * Writing a folder of generated files (e.g. `--out DIR/shapefiles/`) all at once: into a temporary
 * folder beside it, then renamed into place, so a failure never leaves half a set.
 */
import { existsSync, mkdirSync, renameSync, rmSync, writeFileSync } from 'node:fs';
import { basename, dirname, join } from 'node:path';
import { UserError } from '../errors.js';
import { isSafeEntryName } from '../io/zip.js';

/**
 * Writes `files` (plain names, no folders) as the whole content of folder `dir`, replacing what was there.
 * @example writeFolderAtomic(join(out, 'shapefiles'), prescriptionFiles(fc, { layout: 'per_placement' }).files)
 */
export function writeFolderAtomic(dir: string, files: Readonly<Record<string, Uint8Array | string>>): void {
  for (const name of Object.keys(files)) {
    if (!isSafeEntryName(name) || /[\\/]/.test(name)) throw new Error(`writeFolderAtomic: unsafe file name ${JSON.stringify(name)}`);
  }
  const parent = dirname(dir);
  const tmp = join(parent, `.${basename(dir)}.${process.pid}.tmp`);
  const old = join(parent, `.${basename(dir)}.${process.pid}.old`);
  try {
    mkdirSync(parent, { recursive: true });
    rmSync(tmp, { recursive: true, force: true });
    mkdirSync(tmp);
    for (const [name, data] of Object.entries(files)) writeFileSync(join(tmp, name), data);
    if (existsSync(dir)) renameSync(dir, old);
    renameSync(tmp, dir);
    rmSync(old, { recursive: true, force: true });
  } catch (e) {
    rmSync(tmp, { recursive: true, force: true });
    if (existsSync(old) && !existsSync(dir)) renameSync(old, dir);
    throw new UserError(`cannot write the folder "${dir}" (${(e as Error).message}). Fix: choose a writable --out location.`, { file: dir });
  }
}
