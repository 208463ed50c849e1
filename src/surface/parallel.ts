/**
 * Worker threads for the per-cell stage of the surfaces (the shared k-nearest search and the IDW sums).
 * The library starts no thread by itself and knows no file: the caller hands it a factory that starts one
 * worker running the worker entry (src/surface/worker.ts; the CLI's factory is src/cli/threads.ts).
 *
 * The calling thread stays synchronous: the bands of rows of a job are claimed one at a time through a
 * shared counter by the calling thread and the workers alike, the results land in shared memory, and the
 * calling thread waits (Atomics.wait) only for bands a worker has claimed and not yet finished. A worker
 * that is slow to start (or never starts) therefore costs nothing: the calling thread does its bands.
 * Every band is computed by the same code whichever thread runs it, so results are identical bit for bit
 * to a run in one thread (tests/surface/parallel.test.ts). docs/architecture.md, "Threads".
 */
import { MessageChannel, receiveMessageOnPort, type MessagePort, type Worker } from 'node:worker_threads';
import { IdwBands, type IdwJob } from './idwBands.js';

/** Worker threads for {@link nutrientSurfaces} (and {@link SurfacePool.start}). */
export interface SurfaceThreads {
  /**
   * threads sharing the per-cell work, the calling one included (1: no worker is started); at most one per
   * `minCells / 2` searched cells are used
   */
  threads: number;
  /** starts one worker thread running the surface worker entry (dist/surface-worker.mjs, src/surface/worker.ts) */
  startWorker: () => Worker;
  /** searched cells below which no worker is started (default {@link PARALLEL_MIN_CELLS}) */
  minCells?: number;
  /** after each job: bands done by each thread, the calling thread first (for tests and tuning) */
  onBands?: (perThread: number[]) => void;
}

/**
 * Below this many searched cells the surfaces are computed in the calling thread only: starting a worker
 * (about 30-60 ms from the bundle on an idle machine, more from the TypeScript sources, and its code compiled
 * again in the worker) costs more than it saves. Whole builds in alternating pairs on a 2-thread machine: the
 * demo quarter at 2 m (160 000 cells) took less wall and CPU time without the worker, at 1.25 m (400 000 cells)
 * a little less wall time with it (docs/performance.md, "Threads").
 */
export const PARALLEL_MIN_CELLS = 300_000;

/** How long the calling thread waits without any band finishing before it gives up (a stuck worker). */
const STALL_MS = 120_000;

/** The first message to a worker: the port on which it reports errors. */
export interface WorkerHello {
  hello: MessagePort;
}

/** A job message to a worker: the job (its arrays shared) and the shared control words. */
export interface WorkerJob {
  job: IdwJob;
  /** Int32Array on a SharedArrayBuffer: [next band, bands done, error flag, bands per thread ...] */
  ctl: Int32Array;
  /** this worker's slot in the per-thread counts (1 ..) */
  slot: number;
  /** bands in the job */
  bands: number;
}

const NEXT = 0,
  DONE = 1,
  ERROR = 2,
  COUNTS = 3;

/** Claims and runs bands of a job until none is left (the calling thread and every worker alike). */
function runClaimedBands(bands: IdwBands, ctl: Int32Array, slot: number): void {
  for (;;) {
    const i = Atomics.add(ctl, NEXT, 1);
    if (i >= bands.bands) return;
    bands.run(i);
    ctl[COUNTS + slot]++;
    Atomics.add(ctl, DONE, 1);
    Atomics.notify(ctl, DONE);
  }
}

/**
 * Worker threads started for one surface run; {@link SurfacePool.run} shares a job's bands among them and
 * the calling thread. Close it when done (workers are unref'd, so a forgotten pool does not keep the
 * process alive).
 */
export class SurfacePool {
  private readonly workers: { w: Worker; port: MessagePort }[] = [];
  private readonly masks = new WeakMap<object, Uint8Array>();
  private readonly started: Promise<void>[] = [];

  private constructor(private readonly t: SurfaceThreads) {
    for (let s = 1; s < t.threads; s++) {
      const w = t.startWorker();
      w.unref();
      // a worker that fails to start leaves its bands to the others; its error must not crash the process
      w.on('error', () => {});
      const { port1, port2 } = new MessageChannel();
      const started = new Promise<void>((ready, fail) => {
        port1.once('message', () => ready());
        w.once('error', fail);
        w.once('exit', (code) => fail(new Error(`a surface worker thread stopped (exit code ${code})`)));
      });
      started.catch(() => {}); // only ready() reports it
      this.started.push(started);
      port1.unref();
      w.postMessage({ hello: port2 } satisfies WorkerHello, [port2]);
      this.workers.push({ w, port: port1 });
    }
  }

  /**
   * A pool of `threads.threads - 1` workers when the work is large enough to share, else null (then
   * compute in the calling thread).
   * @param cells how many cells will be searched
   * @example const pool = SurfacePool.start({ threads: 2, startWorker }, 640_000); try { ... } finally { pool?.close() }
   */
  static start(threads: SurfaceThreads | undefined, cells: number): SurfacePool | null {
    if (!threads) return null;
    const min = threads.minCells ?? PARALLEL_MIN_CELLS;
    // at least min / 4 cells per thread: a 64-core machine starts 3 workers for a small field, not 63
    const n = Math.min(Math.floor(threads.threads), min > 0 ? Math.floor(cells / (min / 4)) : Infinity);
    if (!(n > 1) || cells < min) return null;
    return new SurfacePool({ ...threads, threads: n });
  }

  /**
   * Resolves when every worker has loaded and is waiting for work (never needed for correctness: bands
   * are shared out whether workers are ready or not; tests use it to be sure the workers take part).
   */
  ready(): Promise<void> {
    // the workers are unref'd: hold the process open while waiting for them
    for (const { w } of this.workers) w.ref();
    const unref = () => this.workers.forEach(({ w }) => w.unref());
    return Promise.all(this.started).then(unref, (e) => {
      unref();
      throw e;
    });
  }

  /** A NaN-filled grid in shared memory that the workers can write (`cells` values). */
  grid(cells: number): Float64Array {
    return new Float64Array(new SharedArrayBuffer(cells * 8)).fill(NaN);
  }

  /**
   * Runs every band of `job` on the calling thread and the workers; returns when all are done. The job's
   * outputs must come from {@link grid}; `where` is passed on as a shared 0/1 mask.
   * @throws Error with the worker's stack when a worker failed on a band
   */
  run(job: IdwJob): void {
    const threads = this.workers.length + 1;
    const ctl = new Int32Array(new SharedArrayBuffer(4 * (COUNTS + threads)));
    const shared: IdwJob = {
      ...job,
      where: job.where && this.mask(job.where, job.grid.cols * job.grid.rows),
    };
    const bands = new IdwBands(shared),
      total = bands.bands;
    this.workers.forEach(({ w }, i) =>
      w.postMessage({ job: shared, ctl, slot: i + 1, bands: total } satisfies WorkerJob),
    );
    runClaimedBands(bands, ctl, 0);
    let seen = Atomics.load(ctl, DONE),
      since = Date.now();
    while (seen < total && !Atomics.load(ctl, ERROR)) {
      Atomics.wait(ctl, DONE, seen, 1000);
      const now = Atomics.load(ctl, DONE);
      if (now !== seen) [seen, since] = [now, Date.now()];
      else if (Date.now() - since > STALL_MS)
        throw new Error(`surface worker threads stopped: ${total - seen} of ${total} bands unfinished`);
    }
    if (Atomics.load(ctl, ERROR)) throw new Error(`a surface worker thread failed:\n${this.workerError()}`);
    this.t.onBands?.(Array.from(ctl.subarray(COUNTS)));
  }

  /** Stops the workers (asynchronously; nothing waits for them). */
  close(): void {
    for (const { w, port } of this.workers) {
      port.close();
      void w.terminate().catch(() => {});
    }
    this.workers.length = 0;
  }

  private mask(where: ArrayLike<number>, cells: number): Uint8Array {
    const key = where as object;
    let m = this.masks.get(key);
    if (!m) {
      m = new Uint8Array(new SharedArrayBuffer(cells));
      for (let i = 0; i < cells; i++) m[i] = where[i] > 0 ? 1 : 0;
      this.masks.set(key, m);
    }
    return m;
  }

  private workerError(): string {
    for (const { port } of this.workers)
      for (let m = receiveMessageOnPort(port); m; m = receiveMessageOnPort(port)) {
        const e = (m.message as { error?: string }).error;
        if (e) return e;
      }
    return '(no message)';
  }
}

/**
 * The worker side: answers {@link WorkerJob} messages by claiming bands until none is left; a failure
 * sets the error flag and sends its stack on the port from {@link WorkerHello}.
 * @example serveSurfaceJobs(parentPort!)
 */
export function serveSurfaceJobs(parent: MessagePort): void {
  let report: MessagePort | null = null;
  parent.on('message', (m: WorkerHello | WorkerJob) => {
    if ('hello' in m) {
      report = m.hello;
      report.postMessage({ ready: true });
      return;
    }
    // a late worker finds every band taken: nothing to set up
    if (Atomics.load(m.ctl, NEXT) >= m.bands) return;
    try {
      runClaimedBands(new IdwBands(m.job), m.ctl, m.slot);
    } catch (e) {
      report?.postMessage({ error: (e as Error)?.stack ?? String(e) });
      Atomics.store(m.ctl, ERROR, 1);
      Atomics.notify(m.ctl, DONE);
    }
  });
}
