/**
 * A small pool of node:worker_threads workers for `tilth batch`: each worker loads tilth once and builds
 * fields one after another (start-up and compiled code are paid once per worker, not once per field). The
 * worker runs the same module as the CLI (`process.argv[1]`, the bundle or the sources through tsx); src/cli/main.ts
 * sees `workerData.tilthBatchWorker` and serves jobs (src/cli/batchWorker.ts) instead of parsing arguments.
 * A worker that dies (out of memory, a crash) fails only its field and is replaced.
 * Why not piscina: one message type, a queue of tens of fields and a replacement on exit are all this needs;
 * the pool is about 60 lines and adds no dependency to the start-up bundle.
 */
import { Worker } from 'node:worker_threads';
import { pathToFileURL } from 'node:url';
import type { FieldJob, FieldResult } from './batchWorker.js';

/**
 * Runs every job on at most `workers` threads; `onDone` hears each field as it finishes (any order).
 * Resolves with the results in job order once all are done; never rejects for a field's failure.
 * @example const results = await runPool(jobs, 2, (r) => console.error(r.status))
 */
export function runPool(
  jobs: FieldJob[],
  workers: number,
  onDone: (r: FieldResult) => void,
  entry = process.argv[1],
): Promise<FieldResult[]> {
  const results: FieldResult[] = new Array(jobs.length);
  const queue = [...jobs];
  let running = 0;
  return new Promise((resolve) => {
    if (jobs.length === 0) {
      resolve(results);
      return;
    }
    const finish = (r: FieldResult, w: Worker | null): void => {
      results[r.id] = r;
      running--;
      onDone(r);
      if (w && queue.length) {
        give(w);
        return;
      }
      w?.terminate();
      if (running === 0 && queue.length === 0) resolve(results);
    };
    const give = (w: Worker): void => {
      const job = queue.shift()!;
      running++;
      current.set(w, job);
      w.postMessage(job);
    };
    const current = new Map<Worker, FieldJob>();
    const start = (): void => {
      const w = new Worker(pathToFileURL(entry), {
        workerData: { tilthBatchWorker: true },
        stdout: true,
        stderr: false,
      });
      w.stdout.resume(); // a field's build prints nothing; anything else is dropped, never mixed into the farm summary
      w.on('message', (r: FieldResult) => {
        current.delete(w);
        finish(r, w);
      });
      w.on('error', (e) => crash(w, e.stack ?? String(e)));
      w.on('exit', (code) => {
        if (current.has(w)) crash(w, `the worker stopped (exit code ${code})`);
      });
      give(w);
    };
    const crash = (w: Worker, why: string): void => {
      const job = current.get(w);
      if (!job) return;
      current.delete(w);
      finish({ id: job.id, status: 'error', message: why, ms: 0, outcome: null }, null);
      if (queue.length) start();
    };
    for (let i = 0; i < Math.min(Math.max(1, workers), jobs.length); i++) start();
  });
}
