/**
 * Where an output really goes, and which places tilth must never replace: the current folder and its
 * ancestors, the home folder and its ancestors, `/`, and any folder holding an input file.
 */
import { lstatSync, readlinkSync, realpathSync } from 'node:fs';
import { homedir } from 'node:os';
import { basename, dirname, join, parse, relative, resolve, sep } from 'node:path';
import { UserError } from '../../errors.js';

/** Most symbolic links followed in a chain before giving up (as the kernel's ELOOP limit). */
const MAX_LINKS = 40;

/**
 * The path an output is written to: symbolic links on the way are followed, including a last component
 * that is a link (existing or dangling), so a linked `--out` writes through the link instead of replacing it.
 * @example resolveOutputPath('rx') // '/home/me/fields/rx', or the folder the link rx points to
 */
export function resolveOutputPath(path: string): string {
  let p = resolve(path);
  for (let i = 0; i < MAX_LINKS; i++) {
    let st;
    try {
      st = lstatSync(p);
    } catch {
      return realParent(p);
    }
    if (!st.isSymbolicLink()) return realParent(p);
    p = resolve(dirname(p), readlinkSync(p));
  }
  throw new UserError(
    `output "${path}" is a chain of more than ${MAX_LINKS} symbolic links (or a loop). Fix: give --out a real folder.`,
    { file: path },
  );
}

/** The path with its parent folder's links resolved as far as the parent exists. */
function realParent(p: string): string {
  const parent = dirname(p);
  if (parent === p) return p;
  try {
    return join(realpathSync(parent), basename(p));
  } catch {
    return join(realParent(parent), basename(p));
  }
}

/** Real path of an existing path, or its resolved path when it does not exist. */
export function realOrResolved(path: string): string {
  try {
    return realpathSync(path);
  } catch {
    return resolve(path);
  }
}

/** True when `inner` is `outer` or lies inside it. */
export function isInside(inner: string, outer: string): boolean {
  if (inner === outer) return true;
  const rel = relative(outer, inner);
  return rel !== '' && !rel.startsWith('..' + sep) && rel !== '..' && !parse(rel).root;
}

/**
 * Refuses, before any work, an output folder that is or holds a place tilth must never replace:
 * `/`, the current folder or any folder above it, the home folder or any folder above it, a folder
 * holding an input file (at any depth).
 * @param target the resolved output path (resolveOutputPath)
 * @param shown the path as the user gave it, for messages
 * @param inputs the command's input files
 * @example refuseProtectedFolder(resolveOutputPath('.'), '.', []) // throws: the current folder
 */
export function refuseProtectedFolder(target: string, shown: string, inputs: readonly string[] = []): void {
  const fix = 'Fix: give --out a new folder of its own, e.g. --out rx-out.';
  if (dirname(target) === target)
    throw new UserError(
      `--out "${shown}" is the root folder /; tilth never writes its outputs there. ${fix}`,
      { file: shown },
    );
  const cwd = realOrResolved(process.cwd());
  if (isInside(cwd, target)) {
    const what = cwd === target ? 'the current folder' : `a folder above the current folder (${cwd})`;
    throw new UserError(`--out "${shown}" is ${what}; replacing it would delete your own files. ${fix}`, {
      file: shown,
    });
  }
  const home = realOrResolved(homedir());
  if (isInside(home, target)) {
    throw new UserError(
      `--out "${shown}" is ${home === target ? 'your home folder' : `a folder above your home folder (${home})`}. ${fix}`,
      { file: shown },
    );
  }
  for (const input of inputs) {
    if (isInside(realOrResolved(input), target)) {
      throw new UserError(
        `--out "${shown}" holds the input file "${input}"; replacing the folder would delete it. ${fix}`,
        { file: shown },
      );
    }
  }
}

/** Shapefile sidecar names tilth reads or writes beside a .shp. */
const SIDECARS = ['.shp', '.shx', '.dbf', '.prj', '.cpg', '.qix', '.sbn', '.sbx', '.xml'];

/**
 * Refuses an output file that is one of the inputs, or a file of an input shapefile set (its .prj, .dbf ...).
 * @example refuseInputFile('/f/field.prj', 'field.prj', ['field.shp']) // throws
 */
export function refuseInputFile(target: string, shown: string, inputs: readonly string[]): void {
  for (const input of inputs) {
    const real = realOrResolved(input);
    const same = [real];
    if (/\.shp$/i.test(real))
      for (const ext of SIDECARS) same.push(real.slice(0, -4) + ext, real.slice(0, -4) + ext.toUpperCase());
    if (same.some((p) => p.toLowerCase() === target.toLowerCase() && dirname(p) === dirname(target))) {
      throw new UserError(
        `output "${shown}" is the input file "${input}"${real === target ? '' : ' (or a file of its shapefile set)'}; writing it would destroy the input. Fix: choose another output name.`,
        { file: shown },
      );
    }
  }
}
