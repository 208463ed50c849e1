/**
 * The report's sulphate-S pages (variability charts and the chance-below map, src/prescription/sulphurPages.ts)
 * made on a second core while the main thread draws the zones: they need only the samples, the grid and the
 * surfaces, and on a 1 m section they are seconds of kriging and semivariogram work that the zone stage (one
 * thread) would otherwise wait for. The pages are the same as those made in place (same code, same input); when
 * anything goes wrong on the way (the worker does not start, fails, or the build's grid is not the one it was
 * given) the folder step makes them in place, so a failure is raised there with its stack.
 * docs/performance.md, "The report's sulphur pages beside the zones".
 */
import { Worker } from 'node:worker_threads';
import type { Plan } from '../agronomy/plan.js';
import type { Tables } from '../agronomy/tables.js';
import type { BuildOptions, Prescription } from '../prescription/index.js';
import { sulphurPagesInput, type SulphurPages } from '../prescription/sulphurPages.js';
import type { FieldInputs } from '../types.js';

/** A report worker started for one build. */
export interface SulphurAhead {
  /** for BuildOptions.onSurfaces: sends the pages' input to the worker (the first call only) */
  onSurfaces: NonNullable<BuildOptions['onSurfaces']>;
  /**
   * The pages, when the worker made them from these inputs and this prescription's grid and surfaces; undefined
   * (make them in place) otherwise. Stops the worker.
   */
  pages(inputs: FieldInputs, rx: Prescription): Promise<SulphurPages | undefined>;
  /** stops the worker (also when the build fails) */
  close(): void;
}

/**
 * Starts the report worker: from the bundle dist/report-worker.mjs, from the TypeScript sources the launcher
 * (bin/tilth.js sees `workerData.tilthReportWorker`).
 */
function startReportWorker(): Worker {
  const here = import.meta.url;
  if (here.endsWith('.ts'))
    return new Worker(new URL('../../bin/tilth.js', here), { workerData: { tilthReportWorker: true } });
  return new Worker(new URL('./report-worker.mjs', here));
}

/**
 * A report worker for a build with `threads` threads, started when the surfaces are handed over (started earlier,
 * its loading slowed the surface stage, whose threads keep both processors busy: the section's surfaces took
 * 4.4-5.0 s instead of 4.1-4.2 s in paired runs); null with one thread (and `tilth batch`, whose fields already
 * keep every core busy).
 * @param say where to say what happened, when TILTH_THREADS_REPORT=1 asks (tests)
 * @example const ahead = sulphurAhead(plan, tables, 2); buildPrescription(inputs, plan, tables, { onSurfaces: ahead?.onSurfaces })
 */
export function sulphurAhead(
  plan: Plan,
  tables: Tables,
  threads: number,
  say?: (line: string) => void,
): SulphurAhead | null {
  if (!(threads > 1)) return null;
  // started with the job (not earlier): while the surfaces are made both processors are busy already
  let w: Worker | null = null;
  let sent: Parameters<SulphurAhead['onSurfaces']>[0] | null = null;
  let answer: Promise<SulphurPages | undefined> = Promise.resolve(undefined);
  const stop = () => void w?.terminate().catch(() => {});
  const start = () => {
    try {
      w = startReportWorker();
      w.unref();
      w.on('error', () => {});
    } catch {
      w = null;
    }
  };
  return {
    onSurfaces(made) {
      if (sent) return;
      sent = made;
      start();
      const worker = w;
      if (!worker) return;
      answer = new Promise((resolve) => {
        worker.once('message', (m: { pages?: SulphurPages; error?: string }) => resolve(m.pages));
        worker.once('error', () => resolve(undefined));
        worker.once('exit', () => resolve(undefined));
      });
      try {
        worker.postMessage(sulphurPagesInput(made.inputs, plan, tables, made.grid, made.surfaces));
      } catch {
        // not cloneable (a bug to find in place): the folder step makes the pages
        answer = Promise.resolve(undefined);
      }
    },
    async pages(inputs, rx) {
      const same =
        sent !== null && sent.inputs === inputs && sent.grid === rx.grid && sent.surfaces === rx.surfaces;
      // the worker is unref'd: hold the process open while waiting for it
      if (same) w?.ref();
      const pages = same ? await answer : undefined;
      stop();
      say?.(`sulphate-S pages: ${pages ? 'made on a second thread beside the zones' : 'made in place'}`);
      return pages;
    },
    close: stop,
  };
}
