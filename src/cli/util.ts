/**
 * Helpers shared by the CLI commands: reading files with user-level errors, atomic writes,
 * printing. Only src/cli/ touches process, console and the file system.
 */
import { readFileSync, statSync } from 'node:fs';
import { UserError, type Warning } from '../errors.js';
import { terminalSafe } from './safety/stdio.js';
import { checkInputSize } from './safety/sizes.js';

// output writing lives in ./safety/ (never lose a user's files); re-exported for the commands
export { checkOutputDir, writeOutputDir } from './safety/outdir.js';
export { checkOutputFile, writeOutputFile } from './safety/outfile.js';
import { lengthM, parseLength, parseSpeed, speedKmh, type Length, type Speed } from '../units/index.js';

/** Reads a whole file; a missing or unreadable file, or one over its kind's size limit (./safety/sizes.ts), is a UserError naming it and the fix. */
export function readInput(path: string, what: string): Buffer {
  let st;
  try {
    st = statSync(path);
  } catch {
    throw new UserError(
      `${what} file "${path}" does not exist. Fix: check the path (it is relative to ${process.cwd()}).`,
      { file: path },
    );
  }
  if (st.isDirectory())
    throw new UserError(`${what} "${path}" is a folder, not a file. Fix: name the file inside it.`, {
      file: path,
    });
  checkInputSize(path, st.size, what);
  try {
    return readFileSync(path);
  } catch (e) {
    throw new UserError(
      `${what} file "${path}" cannot be read (${(e as Error).message}). Fix: check its permissions.`,
      { file: path },
    );
  }
}

/** Prints warnings on stderr, one per line (control characters from the data removed). */
export function printWarnings(warnings: readonly Warning[]): void {
  for (const w of warnings) process.stderr.write(`warning: ${terminalSafe(w.message)}\n`);
}

/** Writes data to stdout (data on stdout, messages on stderr); on a terminal, control characters from the data are removed. */
export function out(text: string): void {
  const t = process.stdout.isTTY ? terminalSafe(text) : text;
  process.stdout.write(t.endsWith('\n') ? t : t + '\n');
}

/** A message for people, on stderr (control characters from the data removed). */
export function info(text: string): void {
  const t = terminalSafe(text);
  process.stderr.write(t.endsWith('\n') ? t : t + '\n');
}

/** Parses a number option or throws a UserError naming the option. */
export function numberOption(
  name: string,
  value: string | undefined,
  opts: { min?: number; max?: number; integer?: boolean } = {},
): number | undefined {
  if (value === undefined) return undefined;
  const v = Number(value);
  if (
    !Number.isFinite(v) ||
    (opts.integer && !Number.isInteger(v)) ||
    (opts.min !== undefined && v < opts.min) ||
    (opts.max !== undefined && v > opts.max)
  ) {
    const range = [
      opts.min !== undefined ? `>= ${opts.min}` : '',
      opts.max !== undefined ? `<= ${opts.max}` : '',
    ]
      .filter(Boolean)
      .join(' and ');
    throw new UserError(
      `option ${name}: "${value}" is not ${opts.integer ? 'a whole number' : 'a number'}${range ? ' ' + range : ''}. Fix: give e.g. ${name} ${opts.min ?? 1}.`,
    );
  }
  return v;
}

/**
 * Parses a speed option with its unit ("8mph", "13km/h"; a plain number is km/h) or throws a UserError naming
 * the option; `range` is in km/h.
 * @example speedOption('--speed', '8mph', [0.1, 100]) // { value: 8, unit: 'mph' }
 */
export function speedOption(
  name: string,
  value: string | undefined,
  range: [number, number],
): Speed | undefined {
  if (value === undefined) return undefined;
  const s = parseSpeed(value, 'km/h');
  const kmh = s && speedKmh(s);
  if (!s || !(kmh! >= range[0] && kmh! <= range[1]))
    throw new UserError(
      `option ${name}: "${value}" is not a speed from ${range[0]} to ${range[1]} km/h. Fix: give it with its unit, e.g. ${name} 13km/h or ${name} 8mph (a plain number is km/h).`,
    );
  return s;
}

/**
 * Parses a length option with its unit ("60ft", "18m"; a plain number is metres) or throws a UserError naming
 * the option; `range` is in metres.
 * @example lengthOption('--swath', '60ft', [0.1, 200]) // { value: 60, unit: 'ft' }
 */
export function lengthOption(
  name: string,
  value: string | undefined,
  range: [number, number],
): Length | undefined {
  if (value === undefined) return undefined;
  const l = parseLength(value, 'm');
  const m = l && lengthM(l);
  if (!l || !(m! >= range[0] && m! <= range[1]))
    throw new UserError(
      `option ${name}: "${value}" is not a length from ${range[0]} to ${range[1]} m. Fix: give it with its unit, e.g. ${name} 18m or ${name} 60ft (a plain number is metres).`,
    );
  return l;
}

/** The caution every command's help shows (src/vocabulary.ts). */
export { CAUTION } from '../vocabulary.js';
