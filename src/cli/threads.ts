/**
 * `--threads N` for `tilth build` and `tilth surface`: the worker factory the CLI hands the library
 * (src/surface/parallel.ts). From the bundle, workers run dist/surface-worker.mjs beside the CLI's chunks;
 * from the TypeScript sources (bin/tilth.js fell back to tsx), they run bin/tilth.js, which sees
 * `workerData.tilthSurfaceWorker` and loads src/surface/worker.ts through tsx.
 */
import { availableParallelism } from 'node:os';
import { Worker } from 'node:worker_threads';
import type { Command } from 'commander';
import type { SurfaceThreads } from '../surface/parallel.js';
import { numberOption } from './util.js';

/** The default of --threads: the cores this process may use. */
export const DEFAULT_THREADS = availableParallelism();

/** Adds `--threads <n>` to a command. */
export function addThreadsOption(cmd: Command): Command {
  return cmd.option(
    '--threads <n>',
    `threads for the per-cell map work; 1 = no worker threads (default: the machine's cores, ${DEFAULT_THREADS} here)`,
  );
}

/**
 * Starts one surface worker: the bundled entry when this code runs from dist/, else the launcher, which
 * loads the TypeScript worker through tsx.
 * @example const w = startSurfaceWorker(); w.unref()
 */
export function startSurfaceWorker(): Worker {
  const here = import.meta.url;
  if (here.endsWith('.ts'))
    return new Worker(new URL('../../bin/tilth.js', here), { workerData: { tilthSurfaceWorker: true } });
  return new Worker(new URL('./surface-worker.mjs', here));
}

/**
 * The library's thread options from the --threads value (default {@link DEFAULT_THREADS}).
 * @throws UserError when the value is not a whole number from 1 to 256
 * @example nutrientSurface(samples, 'p', grid, null, { threads: surfaceThreads(o.threads) })
 */
export function surfaceThreads(flag: string | undefined): SurfaceThreads {
  const threads = numberOption('--threads', flag, { min: 1, max: 256, integer: true }) ?? DEFAULT_THREADS;
  // TILTH_THREADS_REPORT=1: one line per threaded run, bands done by each thread (this one first)
  const onBands =
    process.env.TILTH_THREADS_REPORT === '1'
      ? (c: number[]) => process.stderr.write(`surface threads: bands per thread ${c.join('/')}\n`)
      : undefined;
  return { threads, startWorker: startSurfaceWorker, onBands };
}

/**
 * With TILTH_THREADS_REPORT=1 (tests, tuning): writes a line about what the threads did on stderr; else undefined.
 * @example threadsReport?.('sulphate-S pages: made in place')
 */
export const threadsReport: ((line: string) => void) | undefined =
  process.env.TILTH_THREADS_REPORT === '1' ? (line) => void process.stderr.write(`${line}\n`) : undefined;
