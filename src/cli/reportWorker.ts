/**
 * Entry of the report worker thread (src/cli/sulphurAhead.ts): makes the report's sulphate-S pages from the
 * input it is sent and posts them back, or the error's stack (the build then makes them in its own thread, where
 * the same error is raised). Bundled as dist/report-worker.mjs; from the TypeScript sources bin/tilth.js loads it
 * through tsx.
 */
import { parentPort } from 'node:worker_threads';
import { sulphurPages, type SulphurPagesInput } from '../prescription/sulphurPages.js';

parentPort?.on('message', (input: SulphurPagesInput) => {
  try {
    parentPort!.postMessage({ pages: sulphurPages(input) });
  } catch (e) {
    parentPort!.postMessage({ error: (e as Error)?.stack ?? String(e) });
  }
});
