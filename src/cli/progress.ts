/**
 * Terminal output for commands: progress bars for slow steps on a TTY, plain lines otherwise, a coloured
 * summary that honours NO_COLOR (https://no-color.org: set and not empty = no colour), and --quiet.
 * Everything goes to stderr (stdout is for data). Library stages report progress through a plain
 * callback `(done, total) => void`; pass `task.onProgress` to them.
 *
 * @example
 * const term = createTerminal({ quiet: opts.quiet });
 * const t = term.task('cross-validation', nutrients.length);
 * const surfaces = buildSurfaces(inputs, { onProgress: t.onProgress });
 * t.done();
 * term.summary('Prescription', [['zones', '14'], ['field', '158.2 ac']]);
 */
import { terminalSafe } from './safety/stdio.js';

/** Where the terminal writes: process.stderr, or a fake in tests. */
export interface TermStream {
  write(text: string): unknown;
  isTTY?: boolean;
  columns?: number;
}

export interface TerminalOptions {
  /** print only warnings (default false) */
  quiet?: boolean;
  /** default process.stderr */
  stream?: TermStream;
  /** default process.env (NO_COLOR, TERM) */
  env?: Record<string, string | undefined>;
  /** clock in ms (default performance.now) */
  now?: () => number;
}

/** One slow step. */
export interface Task {
  /** sets progress; total may change (e.g. once it is known) */
  update(done: number, total?: number): void;
  /** the same as update, as a callback for library stages */
  readonly onProgress: (done: number, total: number) => void;
  /** ends the step: a ticked line with the time taken and an optional note */
  done(note?: string): void;
  /** ends the step as failed */
  fail(note?: string): void;
}

type Paint = (s: string) => string;

export interface Terminal {
  readonly tty: boolean;
  readonly color: boolean;
  readonly quiet: boolean;
  /** colour helpers (identity without colour) */
  readonly paint: { bold: Paint; dim: Paint; green: Paint; yellow: Paint; red: Paint; cyan: Paint };
  task(label: string, total?: number): Task;
  /** a message for people (hidden by --quiet) */
  line(text: string): void;
  /** a warning (shown even with --quiet) */
  warn(text: string): void;
  /** a titled block of label / value rows (hidden by --quiet) */
  summary(title: string, rows: readonly (readonly [string, string])[]): void;
}

const BAR = 24;
const REDRAW_MS = 80;

/**
 * Creates the terminal helper for a command.
 * Defaults: stderr; colour only on a TTY with NO_COLOR unset or empty and TERM not "dumb".
 */
export function createTerminal(opts: TerminalOptions = {}): Terminal {
  const stream = opts.stream ?? process.stderr;
  const env = opts.env ?? process.env;
  const quiet = !!opts.quiet;
  const tty = !!stream.isTTY;
  const color = tty && !(env.NO_COLOR !== undefined && env.NO_COLOR !== '') && env.TERM !== 'dumb';
  const paint = painter(color);
  const out: Out = {
    stream,
    now: opts.now ?? (() => performance.now()),
    quiet,
    tty,
    color,
    paint,
    live: false,
    write(s) {
      if (out.live) stream.write('\r\x1b[2K');
      out.live = false;
      stream.write(s.endsWith('\n') ? s : s + '\n');
    },
  };
  return {
    tty,
    color,
    quiet,
    paint,
    task: (label, total = 0) => startTask(out, label, total),
    line(text) {
      if (!quiet) out.write(terminalSafe(text));
    },
    warn(text) {
      out.write(`${paint.yellow('warning:')} ${terminalSafe(text)}`);
    },
    summary(title, rows) {
      if (quiet) return;
      const w = Math.max(0, ...rows.map(([k]) => k.length));
      out.write(
        [
          paint.bold(terminalSafe(title)),
          ...rows.map(([k, v]) => `  ${terminalSafe(k).padEnd(w)}  ${paint.cyan(terminalSafe(v))}`),
        ].join('\n'),
      );
    },
  };
}

/** What the terminal's parts share: the stream, the settings, and whether a bar is drawn on the current line. */
interface Out {
  stream: TermStream;
  now: () => number;
  quiet: boolean;
  tty: boolean;
  color: boolean;
  paint: Terminal['paint'];
  /** a bar is drawn on the current line */
  live: boolean;
  /** clears a drawn bar, then writes one line */
  write(s: string): void;
}

function painter(color: boolean): Terminal['paint'] {
  const sgr =
    (open: number, close: number): Paint =>
    (s) =>
      color ? `\x1b[${open}m${s}\x1b[${close}m` : s;
  return {
    bold: sgr(1, 22),
    dim: sgr(2, 22),
    green: sgr(32, 39),
    yellow: sgr(33, 39),
    red: sgr(31, 39),
    cyan: sgr(36, 39),
  };
}

const secs = (ms: number): string => (ms < 1000 ? `${Math.round(ms)} ms` : `${(ms / 1000).toFixed(1)} s`);

/** One step: a bar redrawn at most every REDRAW_MS on a TTY, then a ticked (or plain) line with the time. */
function startTask(out: Out, label: string, total: number): Task {
  const { stream, now, quiet, tty, color, paint } = out;
  const t0 = now();
  let last = -Infinity;
  let doneN = 0;
  let tot = total;
  let ended = false;
  const draw = (force: boolean): void => {
    if (quiet || !tty || ended) return;
    const t = now();
    if (!force && t - last < REDRAW_MS) return;
    last = t;
    const frac = tot > 0 ? Math.min(1, doneN / tot) : 0;
    const full = Math.round(frac * BAR);
    const bar =
      tot > 0
        ? `[${'#'.repeat(full)}${'-'.repeat(BAR - full)}] ${String(Math.round(frac * 100)).padStart(3)}%`
        : '...';
    const text = `${label} ${bar} ${paint.dim(secs(t - t0))}`;
    stream.write(`\r\x1b[2K${text.slice(0, Math.max(20, (stream.columns ?? 80) - 1) + (color ? 20 : 0))}`);
    out.live = true;
  };
  const update = (d: number, t?: number): void => {
    doneN = d;
    if (t !== undefined) tot = t;
    draw(false);
  };
  draw(true);
  const end = (ok: boolean, note?: string): void => {
    if (ended) return;
    ended = true;
    if (quiet) return;
    const mark = ok ? paint.green(tty ? '✓' : 'done') : paint.red(tty ? '✗' : 'failed');
    out.write(
      tty
        ? `${mark} ${label} ${paint.dim(`(${secs(now() - t0)})`)}${note ? ` ${note}` : ''}`
        : `${label}: ${mark} in ${secs(now() - t0)}${note ? `; ${note}` : ''}`,
    );
  };
  return {
    update,
    onProgress: (d: number, t: number) => update(d, t),
    done: (n) => end(true, n),
    fail: (n) => end(false, n),
  };
}
