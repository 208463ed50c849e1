/**
 * Helpers shared by the CLI commands: reading files with user-level errors, atomic writes,
 * printing. Only src/cli/ touches process, console and the file system.
 */
import { mkdirSync, readdirSync, readFileSync, renameSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { basename, dirname, isAbsolute, join, resolve } from 'node:path';
import { isUserError, UserError, type Warning } from '../errors.js';

/** Reads a whole file; a missing or unreadable file is a UserError naming it and the fix. */
export function readInput(path: string, what: string): Buffer {
  let st;
  try {
    st = statSync(path);
  } catch {
    throw new UserError(`${what} file "${path}" does not exist. Fix: check the path (it is relative to ${process.cwd()}).`, { file: path });
  }
  if (st.isDirectory()) throw new UserError(`${what} "${path}" is a folder, not a file. Fix: name the file inside it.`, { file: path });
  try {
    return readFileSync(path);
  } catch (e) {
    throw new UserError(`${what} file "${path}" cannot be read (${(e as Error).message}). Fix: check its permissions.`, { file: path });
  }
}

/**
 * Writes a file atomically: to a temporary name beside it, then rename, so a failure never
 * leaves a half-written output.
 */
export function writeFileAtomic(path: string, data: string | Uint8Array): void {
  const dir = dirname(path);
  try {
    mkdirSync(dir, { recursive: true });
  } catch (e) {
    throw new UserError(`cannot create the output folder "${dir}" (${(e as Error).message}). Fix: choose a writable location.`, { file: path });
  }
  const tmp = join(dir, `.${basename(path)}.${process.pid}.tmp`);
  try {
    writeFileSync(tmp, data);
    renameSync(tmp, path);
  } catch (e) {
    rmSync(tmp, { force: true });
    throw new UserError(`cannot write "${path}" (${(e as Error).message}). Fix: choose a writable location.`, { file: path });
  }
}

/** Prints warnings on stderr, one per line. */
export function printWarnings(warnings: readonly Warning[]): void {
  for (const w of warnings) process.stderr.write(`warning: ${w.message}\n`);
}

/** Writes data to stdout (data on stdout, messages on stderr). */
export function out(text: string): void {
  process.stdout.write(text.endsWith('\n') ? text : text + '\n');
}

/** A message for people, on stderr. */
export function info(text: string): void {
  process.stderr.write(text.endsWith('\n') ? text : text + '\n');
}

/** Parses a number option or throws a UserError naming the option. */
export function numberOption(name: string, value: string | undefined, opts: { min?: number; max?: number; integer?: boolean } = {}): number | undefined {
  if (value === undefined) return undefined;
  const v = Number(value);
  if (!Number.isFinite(v) || (opts.integer && !Number.isInteger(v)) || (opts.min !== undefined && v < opts.min) || (opts.max !== undefined && v > opts.max)) {
    const range = [opts.min !== undefined ? `>= ${opts.min}` : '', opts.max !== undefined ? `<= ${opts.max}` : ''].filter(Boolean).join(' and ');
    throw new UserError(`option ${name}: "${value}" is not ${opts.integer ? 'a whole number' : 'a number'}${range ? ' ' + range : ''}. Fix: give e.g. ${name} ${opts.min ?? 1}.`);
  }
  return v;
}

/** The caution every command's help shows. */
export const CAUTION =
  'Caution: tilth computes suggestions from soil tests and editable default tables. Too much fertilizer with the\n' +
  'seed injures or kills seedlings; wrong rates cost money and can pollute water. Follow local guidelines, and\n' +
  'have a licensed agronomist or certified crop adviser check every prescription before it is applied.';

/**
 * Checks an output folder before any work is done: a file there, or a non-empty folder without `force`,
 * is a UserError. Returns the folder's stat when it exists.
 */
export function checkOutputDir(dir: string, force = false): ReturnType<typeof statSync> | undefined {
  const abs = resolve(dir);
  let existing: ReturnType<typeof statSync> | undefined;
  try {
    existing = statSync(abs);
  } catch {
    existing = undefined;
  }
  if (existing && !existing.isDirectory()) {
    throw new UserError(`output "${dir}" is a file, not a folder. Fix: give --out a folder path (it will be created).`, { file: dir });
  }
  if (existing && readdirSync(abs).length > 0 && !force) {
    throw new UserError(`output folder "${dir}" already exists and is not empty. Fix: choose a new folder, or add --force to replace it.`, { file: dir });
  }
  return existing;
}

/**
 * Writes a whole output folder at once: every file goes into a temporary sibling folder, which is
 * renamed into place only when all are written, so a failure never leaves a half-written output.
 * An existing non-empty folder is refused unless `force`; then it is replaced as a whole.
 *
 * @param dir the output folder
 * @param files relative path (may contain '/') -> contents
 */
export function writeOutputDir(dir: string, files: Map<string, string | Uint8Array>, force = false): void {
  const abs = resolve(dir);
  const existing = checkOutputDir(dir, force);
  const parent = dirname(abs);
  try {
    mkdirSync(parent, { recursive: true });
  } catch (e) {
    throw new UserError(`cannot create "${parent}" (${(e as Error).message}). Fix: choose a writable location for --out.`, { file: dir });
  }
  const tmp = join(parent, `.${basename(abs)}.tmp-${process.pid}-${Date.now()}`);
  try {
    for (const [rel, data] of files) {
      if (rel.split(/[\\/]/).some((s) => s === '..' || s === '') || isAbsolute(rel)) throw new Error(`bad output path ${rel}`);
      const p = join(tmp, rel);
      mkdirSync(dirname(p), { recursive: true });
      writeFileSync(p, data);
    }
    if (existing) {
      const old = `${tmp}.old`;
      renameSync(abs, old);
      try {
        renameSync(tmp, abs);
      } catch (e) {
        renameSync(old, abs);
        throw e;
      }
      rmSync(old, { recursive: true, force: true });
    } else {
      renameSync(tmp, abs);
    }
  } catch (e) {
    rmSync(tmp, { recursive: true, force: true });
    if (isUserError(e)) throw e;
    const code = (e as NodeJS.ErrnoException).code;
    if (code === 'EACCES' || code === 'EPERM' || code === 'EROFS' || code === 'ENOSPC') {
      throw new UserError(`cannot write the output folder "${dir}" (${(e as Error).message}). Fix: choose a writable location for --out; nothing was written.`, { file: dir });
    }
    throw e;
  }
}
