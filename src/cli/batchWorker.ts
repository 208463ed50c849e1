/**
 * The worker side of `tilth batch` (see batchPool.ts): builds one field per message with the same code as
 * `tilth build` (runBuild) and answers with its outcome; a user error or a bug fails that field only.
 */
import { parentPort } from 'node:worker_threads';
import { isUserError } from '../errors.js';
import { runBuild, type BuildFlags, type BuildOutcome } from './build.js';

/** A job for a worker: one field's build flags. */
export interface FieldJob {
  id: number;
  flags: BuildFlags;
}

/** One field's result: ok, infeasible (some zone cannot meet its targets), bad input, or a bug. */
export interface FieldResult {
  id: number;
  status: 'ok' | 'infeasible' | 'bad-input' | 'error';
  /** the user error's message or the bug's stack */
  message?: string;
  /** wall time of the field's build, ms */
  ms: number;
  outcome:
    (Pick<BuildOutcome, 'totals' | 'infeasible' | 'field' | 'files' | 'zones'> & { warnings: number }) | null;
}

/**
 * Builds one field (exported for tests and for running a batch in one thread).
 * @example const r = await buildField({ id: 0, flags: { samples, boundary, plan, out } })
 */
export async function buildField(job: FieldJob): Promise<FieldResult> {
  const t0 = performance.now();
  try {
    // the batch already keeps every core busy with fields: no surface threads inside a field
    const flags = { ...job.flags, quiet: true, threads: '1' };
    const o = await runBuild(flags, { say() {}, onProgress() {}, stepDone() {} });
    const outcome = {
      totals: o.totals,
      infeasible: o.infeasible,
      field: o.field,
      files: o.files,
      zones: o.zones,
      warnings: o.warnings.length,
    };
    return {
      id: job.id,
      status: o.infeasible.length ? 'infeasible' : 'ok',
      ms: performance.now() - t0,
      outcome,
    };
  } catch (e) {
    const user = isUserError(e);
    return {
      id: job.id,
      status: user ? 'bad-input' : 'error',
      message: user ? (e as Error).message : ((e as Error)?.stack ?? String(e)),
      ms: performance.now() - t0,
      outcome: null,
    };
  }
}

/** Serves jobs from the parent until it terminates the worker. */
export function serveBatch(): void {
  parentPort!.on('message', (job: FieldJob) => {
    void buildField(job).then((r) => parentPort!.postMessage(r));
  });
}
