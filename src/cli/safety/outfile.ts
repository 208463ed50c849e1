/**
 * Writing one output file (a grid, its .prj, a report page, a tables file) without destroying a user's file:
 * never over an input (or a file of an input shapefile set), never over an existing file tilth did not write
 * unless `--force`, through a symbolic link rather than over it, to a temporary name and then renamed.
 */
import {
  mkdirSync,
  openSync,
  readSync,
  closeSync,
  renameSync,
  rmSync,
  statSync,
  writeFileSync,
} from 'node:fs';
import { dirname, join } from 'node:path';
import { UserError } from '../../errors.js';
import { fsReason, isFsUserProblem } from './errno.js';
import { refuseInputFile, resolveOutputPath } from './paths.js';

/** Options of a single output file write. */
export interface OutputFileOptions {
  /** the command's input files: writing over one is refused */
  inputs?: readonly string[];
  /** replace an existing file tilth cannot recognise as its own */
  force?: boolean;
  /** recognises tilth's own earlier output from the file's first 4 KiB (default: nothing is recognised) */
  ours?: (head: string) => boolean;
  /** the option named in messages (default --out) */
  flag?: string;
}

function head(path: string): string {
  const fd = openSync(path, 'r');
  try {
    const buf = Buffer.alloc(4096);
    const n = readSync(fd, buf, 0, buf.length, 0);
    return buf.subarray(0, n).toString('utf8');
  } finally {
    closeSync(fd);
  }
}

/**
 * Checks an output file before any work: not an input, not a folder, not someone else's file (unless force).
 * @returns the resolved path the file will be written to
 * @example checkOutputFile('p.asc', { inputs: ['samples.csv'], ours: (h) => h.startsWith('ncols') })
 */
export function checkOutputFile(path: string, opts: OutputFileOptions = {}): string {
  const flag = opts.flag ?? '--out';
  if (path.trim() === '') throw new UserError(`${flag} is empty. Fix: give a file name.`);
  const target = resolveOutputPath(path);
  refuseInputFile(target, path, opts.inputs ?? []);
  let st;
  try {
    st = statSync(target);
  } catch (e) {
    if ((e as NodeJS.ErrnoException).code === 'ENOENT') return target;
    throw new UserError(
      `cannot look at the output "${path}" (${fsReason(e)}). Fix: choose another location for ${flag}.`,
      { file: path },
    );
  }
  if (st.isDirectory())
    throw new UserError(`output "${path}" is a folder. Fix: give ${flag} a file name.`, { file: path });
  if (!st.isFile())
    throw new UserError(
      `output "${path}" is not a regular file (a device or pipe?). Fix: give ${flag} a file name.`,
      { file: path },
    );
  if (opts.force) return target;
  let mine = false;
  try {
    mine = !!opts.ours && opts.ours(head(target));
  } catch {
    mine = false;
  }
  if (!mine)
    throw new UserError(
      `output "${path}" already exists and tilth did not write it. Fix: choose another name, or add --force to replace it.`,
      { file: path },
    );
  return target;
}

/**
 * Writes an output file safely (see the file comment): checks, a temporary name beside the target, rename.
 * @example writeOutputFile('p.asc', text, { inputs: [o.samples, o.boundary], ours: (h) => /^ncols/i.test(h) })
 */
export function writeOutputFile(path: string, data: string | Uint8Array, opts: OutputFileOptions = {}): void {
  const target = checkOutputFile(path, opts);
  writeFileAtomic(target, data, path);
}

/**
 * Writes a file atomically: to a temporary name beside it, then rename, so a failure never leaves a
 * half-written output. No ownership checks (see writeOutputFile); a symbolic link is written through.
 * @example writeFileAtomic('out/report.html', html)
 */
export function writeFileAtomic(path: string, data: string | Uint8Array, shown = path): void {
  const target = resolveOutputPath(path);
  const dir = dirname(target);
  try {
    mkdirSync(dir, { recursive: true });
  } catch (e) {
    if (!isFsUserProblem(e)) throw e;
    throw new UserError(
      `cannot create the output folder "${dir}" (${fsReason(e)}). Fix: choose a writable location; nothing was written.`,
      { file: shown },
    );
  }
  const tmp = join(dir, `.tilth-${process.pid}-${Date.now().toString(36)}.tmp`);
  try {
    writeFileSync(tmp, data);
    renameSync(tmp, target);
  } catch (e) {
    try {
      rmSync(tmp, { force: true });
    } catch {
      /* the message below says what happened */
    }
    if (!isFsUserProblem(e)) throw e;
    throw new UserError(
      `cannot write "${shown}" (${fsReason(e)}). Fix: choose a writable location; nothing was written.`,
      { file: shown },
    );
  }
}
