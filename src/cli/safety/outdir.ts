/**
 * Writing a whole output folder without ever losing a user's files.
 *
 * - `--out` is refused when it is `/`, the current folder or above it, the home folder or above it, or holds an
 *   input file; an existing folder is replaced (with `--force`) only when it is empty or tilth wrote it
 *   (its `.tilth-output.json` marker lists every file in it).
 * - A linked `--out` writes through the link.
 * - The replace keeps a complete folder at every instant: the new output is written into a temporary folder
 *   beside the target (marker first, state "writing", then every file, then the marker "complete"), the old
 *   folder is renamed aside, the new one renamed in, the old one deleted. A run killed in between leaves
 *   temporary folders that the next run for the same output restores or removes (leftovers.ts).
 */
import { mkdirSync, readdirSync, renameSync, rmSync, statSync, writeFileSync, type Stats } from 'node:fs';
import { dirname, isAbsolute, join } from 'node:path';
import { isUserError, UserError } from '../../errors.js';
import { fsReason, isFsUserProblem } from './errno.js';
import { recoverLeftovers, tempPath } from './leftovers.js';
import { MARKER, markerText, ownership, removeOwnFolder } from './ownership.js';
import { refuseProtectedFolder, resolveOutputPath } from './paths.js';

/** Options of an output folder write. */
export interface OutputDirOptions {
  /** replace an existing non-empty folder (only one tilth wrote) */
  force?: boolean;
  /** the command's input files: a folder holding one is refused */
  inputs?: readonly string[];
  /** where messages go (default stderr) */
  say?: (line: string) => void;
}

const toOptions = (o: boolean | OutputDirOptions | undefined): OutputDirOptions =>
  typeof o === 'object' ? o : { force: !!o };

function statOrUndefined(path: string, shown: string): Stats | undefined {
  try {
    return statSync(path);
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    if (code === 'ENOENT') return undefined;
    throw new UserError(
      `cannot look at the output "${shown}" (${fsReason(e)}). Fix: choose another location for --out.`,
      { file: shown },
    );
  }
}

/**
 * Checks an output folder before any work is done, so a long run never ends in a refusal: the protected
 * places, a file in the way, a non-empty folder without `force`, a folder with files tilth did not write.
 * @returns the resolved output path and whether it exists
 * @example checkOutputDir('rx', { force: true, inputs: ['samples.csv'] })
 */
export function checkOutputDir(
  dir: string,
  opts: boolean | OutputDirOptions = {},
): { target: string; exists: boolean } {
  const { force, inputs } = toOptions(opts);
  if (dir.trim() === '') throw new UserError('--out is empty. Fix: give a folder name, e.g. --out rx-out.');
  const target = resolveOutputPath(dir);
  refuseProtectedFolder(target, dir, inputs);
  const st = statOrUndefined(target, dir);
  if (!st) return { target, exists: false };
  if (!st.isDirectory())
    throw new UserError(
      `output "${dir}" is a file, not a folder. Fix: give --out a folder path (it will be created).`,
      { file: dir },
    );
  let own;
  try {
    own = ownership(target);
  } catch (e) {
    throw new UserError(
      `cannot look inside the output folder "${dir}" (${fsReason(e)}). Fix: choose another folder for --out.`,
      { file: dir },
    );
  }
  if (own.empty) return { target, exists: true };
  if (!own.ours) {
    const list = own.tooBig
      ? 'more files than an output folder holds'
      : own.foreign.slice(0, 5).join(', ') +
        (own.foreign.length > 5 ? ` and ${own.foreign.length - 5} more` : '');
    throw new UserError(
      `output folder "${dir}" holds files tilth did not write (${list}); tilth replaces only an empty folder or one it wrote itself. ` +
        'Fix: give --out a new folder, or move those files out of it first.',
      { file: dir },
    );
  }
  if (!force)
    throw new UserError(
      `output folder "${dir}" is not empty (it holds an earlier tilth output). Fix: add --force to replace it, or choose a new folder.`,
      { file: dir },
    );
  return { target, exists: true };
}

/** Writes every file and the marker into a fresh temporary folder beside the target. */
function writeTemp(target: string, files: Map<string, string | Uint8Array>): string {
  for (const rel of files.keys()) {
    if (
      isAbsolute(rel) ||
      rel.split(/[\\/]/).some((s) => s === '..' || s === '' || s === '.') ||
      rel === MARKER
    )
      throw new Error(`bad output path ${rel}`);
  }
  const tmp = tempPath(target, 'new');
  mkdirSync(tmp);
  writeFileSync(join(tmp, MARKER), markerText(files.keys(), 'writing'));
  for (const [rel, data] of files) {
    const p = join(tmp, rel);
    mkdirSync(dirname(p), { recursive: true });
    writeFileSync(p, data);
  }
  writeFileSync(join(tmp, MARKER), markerText(files.keys(), 'complete'));
  return tmp;
}

/** Moves the complete new folder into place; an existing folder is set aside first and deleted after. */
function swapIn(tmp: string, target: string, exists: boolean, say: (s: string) => void): void {
  if (!exists || readdirSync(target).length === 0) {
    renameSync(tmp, target); // onto nothing, or atomically onto an empty folder
    return;
  }
  const old = tempPath(target, 'old');
  renameSync(target, old);
  try {
    renameSync(tmp, target);
  } catch (e) {
    renameSync(old, target);
    throw e;
  }
  try {
    removeOwnFolder(old);
  } catch (e) {
    say(
      `warning: the new output is in place, but the previous one, set aside as ${old}, could not be deleted (${fsReason(e)}); delete it yourself.`,
    );
  }
}

/**
 * Writes a whole output folder at once (see the file comment): a failure leaves the old folder or nothing,
 * never half an output, and never touches a file tilth did not write.
 * @param dir the output folder (`--out`)
 * @param files relative path (may contain '/') -> contents
 * @param opts `force` to replace an earlier tilth output; `inputs` to refuse a folder holding one (default none)
 * @example writeOutputDir('rx', new Map([['zones.csv', csv]]), { force: true, inputs: ['samples.csv'] })
 */
export function writeOutputDir(
  dir: string,
  files: Map<string, string | Uint8Array>,
  opts: boolean | OutputDirOptions = {},
): void {
  const o = toOptions(opts);
  const say = o.say ?? ((s: string) => process.stderr.write(s + '\n'));
  let target = resolveOutputPath(dir);
  try {
    mkdirSync(dirname(target), { recursive: true });
    for (const note of recoverLeftovers(target)) say(`tilth: ${note}`);
  } catch (e) {
    if (!isFsUserProblem(e)) throw e;
    throw new UserError(
      `cannot create the folder "${dirname(target)}" for --out "${dir}" (${fsReason(e)}). Fix: choose a writable location for --out; nothing was written.`,
      { file: dir },
    );
  }
  const checked = checkOutputDir(dir, o);
  target = checked.target;
  let tmp: string | undefined;
  try {
    tmp = writeTemp(target, files);
    swapIn(tmp, target, checked.exists, say);
  } catch (e) {
    if (tmp) rmSync(tmp, { recursive: true, force: true });
    if (isUserError(e) || !isFsUserProblem(e)) throw e;
    throw new UserError(
      `cannot write the output folder "${dir}" (${fsReason(e)}). Fix: choose a writable location for --out; nothing was written${checked.exists ? ' and the existing folder is unchanged' : ''}.`,
      { file: dir },
    );
  }
}
