/** `tilth build`: the whole prescription from samples, boundary and plan, written into one folder. */
import type { Command } from 'commander';
import { parsePlan } from '../agronomy/index.js';
import { buildPrescription, defaultCell, type Prescription } from '../prescription/index.js';
import { gridBbox } from '../prescription/unsampled.js';
import { checkBuildCells, checkBoundaryVertices } from './safety/budgets.js';
import { readinessProblems } from './safety/readiness.js';
import { UserError } from '../errors.js';
import type { FieldInputs } from '../types.js';
import type { Plan } from '../agronomy/index.js';
import type { PrescriptionFolder } from '../prescription/folder.js';
import { provenance } from '../prescription/provenance.js';
import { summaryText } from '../prescription/outputs.js';
import { addInputOptions, inputOptionsFrom, loadInputs } from './inputs.js';
import { tablesFromOption } from './plan.js';
import {
  CAUTION,
  checkOutputDir,
  info,
  numberOption,
  out,
  printWarnings,
  readInput,
  writeOutputDir,
} from './util.js';
import { createTerminal, type Task, type Terminal } from './progress.js';
import { addThreadsOption, surfaceThreads, threadsReport } from './threads.js';
import { sulphurAhead } from './sulphurAhead.js';

export interface BuildFlags {
  samples: string;
  boundary: string;
  zones?: string;
  plan: string;
  tables?: string;
  out: string;
  force?: boolean;
  json?: boolean;
  cell?: string;
  columns?: string;
  depthFactor?: string;
  dropOutside?: boolean;
  /** keep | drop (default: the plan's soil_test.outliers) */
  outliers?: string;
  pMethod?: 'olsen' | 'kelowna';
  assumeWgs84?: boolean;
  quiet?: boolean;
  /** --threads (default: the machine's cores) */
  threads?: string;
}

export function register(program: Command): void {
  addThreadsOption(addInputOptions(program.command('build')))
    .description(
      'Build a variable-rate prescription: nutrient maps, management zones, seed-row-safe product rates, files for the controller.',
    )
    .requiredOption('--plan <file>', 'plan file (see `tilth plan init`)')
    .requiredOption(
      '--out <dir>',
      'output folder (created; an existing one is replaced only with --force and only when empty or written by tilth)',
    )
    .option('--tables <file>', 'your edited agronomy tables (see `tilth tables`)')
    .option('--cell <m>', 'grid cell size in metres (default: about 200 cells across the field, 1-20 m)')
    .option(
      '--force',
      'replace an earlier tilth output folder (never one holding other files, an input, the current or home folder)',
    )
    .option('--json', 'print summary.json on stdout for scripts')
    .option('--quiet', 'no progress messages')
    .addHelpText(
      'after',
      `\nExample:\n  tilth plan init --crop canola > plan.yaml\n  tilth build --samples sample-fields/quarter/samples.csv --boundary sample-fields/quarter/boundary.geojson \\\n    --plan plan.yaml --out rx-quarter\n\nWrites prescription.geojson (one per zone set when there are several), zones.csv, summary.json, report.html;\nshapefiles/ and ISO 11783-10 task data (TASKDATA/ and taskdata.zip) as the plan's output.formats asks.\nExit 0 ok; 1 when some zone's targets cannot be met (the files are still written, the list is printed); 2 bad input.\n\n${CAUTION}`,
    )
    .action(async (o: BuildFlags) => {
      const term = createTerminal({ quiet: o.quiet });
      const bars = progressBars(term);
      const r = await runBuild(o, {
        say: (s) => term.line(s),
        onProgress: bars.update,
        stepDone: bars.finish,
      });
      out(o.json ? JSON.stringify(r.summary, null, 2) : r.text);
      printWarnings(r.warnings);
      info(
        `wrote ${r.files.length} files to ${o.out}: ${[...new Set(r.files.map((f) => f.replace(/\/.*/, '/')))].join(', ')}`,
      );
      info(CAUTION);
      if (r.infeasible.length > 0) {
        info(`\n${r.infeasible.length} zone(s) cannot meet their targets within the plan's limits:`);
        for (const f of r.infeasible) info(`  zone set ${f.zoneSet}, zone ${f.zone}: ${f.reason}`);
        process.exitCode = 1;
      }
    });
}

/** What one build did, for the build and batch commands to print. */
export interface BuildOutcome {
  summary: PrescriptionFolder['summary'];
  /** the printed summary (summaryText) */
  text: string;
  warnings: Prescription['warnings'];
  infeasible: Prescription['infeasible'];
  totals: Prescription['totals'];
  field: { name: string; areaAc: number };
  /** zones over all zone sets */
  zones: number;
  /** files written, relative to the output folder */
  files: string[];
}

/** Progress hooks of {@link runBuild}: step lines, progress of long steps, the end of the last one. */
export interface BuildHooks {
  say: (line: string) => void;
  onProgress: (step: string, done: number) => void;
  stepDone: () => void;
}

/**
 * One `tilth build` (also each field of `tilth batch`): reads the inputs, builds the prescription and writes
 * every file into `o.out` (temporary folder renamed into place). Prints nothing itself; throws UserError for
 * bad input.
 * @example const r = await runBuild({ samples, boundary, plan, out: 'rx' }, { say() {}, onProgress() {}, stepDone() {} })
 */
export async function runBuild(o: BuildFlags, hooks: BuildHooks): Promise<BuildOutcome> {
  const inputFiles = [o.samples, o.boundary, o.plan, o.zones, o.tables].filter((f): f is string => !!f);
  checkOutputDir(o.out, { force: o.force, inputs: inputFiles }); // before any work: a long build should not end in a refusal
  const tables = tablesFromOption(o.tables);
  const plan = parsePlan(readInput(o.plan, 'plan').toString('utf8'), o.plan, tables);
  const cell = numberOption('--cell', o.cell, { min: 0.5, max: 100 });
  const threads = surfaceThreads(o.threads);
  // the report's sulphate-S pages on a second core while the zones are drawn
  const ahead = sulphurAhead(plan, tables, threads.threads, threadsReport);
  hooks.say('reading and checking the inputs ...');
  const io = inputOptionsFrom(o as unknown as Record<string, unknown>);
  if (io.outliers === undefined && plan.soil_test.outliers === 'drop')
    Object.assign(io, { outliers: 'drop', outliersFrom: 'plan' });
  const inputs = await loadInputs(io);
  if (plan.field && !inputs.field.name) inputs.field.name = plan.field;
  refuseUnfit(inputs, plan, o.samples, o.boundary);
  // the grid covers the sampled parts (unsampled_parts), the whole boundary must still fit it (task data grids)
  checkBuildCells(inputs.field.bbox, cell ?? defaultCell(gridBbox(inputs, plan)));
  let rx: Prescription;
  try {
    rx = buildPrescription(inputs, plan, tables, {
      cell,
      threads,
      onProgress: hooks.onProgress,
      onSurfaces: ahead?.onSurfaces,
    });
  } catch (e) {
    ahead?.close();
    throw e;
  }
  hooks.stepDone();
  const sulphur = await ahead?.pages(inputs, rx);
  const named = (['samples', 'boundary', 'plan', 'zones', 'tables'] as const)
    .filter((k) => o[k])
    .map((k) => ({ name: k, bytes: readInput(o[k]!, k) }));
  // the writers (report, shapefiles, task data) load only now: the first progress lines come sooner
  const { prescriptionFolder } = await import('../prescription/folder.js');
  const { files, summary } = prescriptionFolder(rx, inputs, tables, {
    provenance: provenance(named),
    tablesEdited: !!o.tables,
    onStep: hooks.say,
    sulphur,
  });
  writeOutputDir(o.out, files, { force: o.force, inputs: inputFiles });
  const zones = rx.zoneSets.reduce((n, z) => n + z.zones.length, 0);
  return {
    summary,
    text: summaryText(rx),
    warnings: rx.warnings,
    infeasible: rx.infeasible,
    totals: rx.totals,
    field: { name: rx.field.name, areaAc: rx.field.areaAc },
    zones,
    files: [...files.keys()],
  };
}

/** One progress bar per build step on stderr. */
function progressBars(term: Terminal): { update: (step: string, done: number) => void; finish: () => void } {
  let last = '';
  let task: Task | null = null;
  return {
    update: (step, done) => {
      if (step !== last) {
        task?.done();
        last = step;
        task = term.task(step, 100);
      }
      task!.update(Math.round(done * 100), 100);
    },
    finish: () => task?.done(),
  };
}

/** Refuses, before the work, inputs that cannot make a prescription (src/cli/safety/readiness.ts) or a boundary over the vertex budget. */
function refuseUnfit(inputs: FieldInputs, plan: Plan, samplesFile: string, boundaryFile: string): void {
  checkBoundaryVertices(inputs.field, boundaryFile);
  const problems = readinessProblems(inputs, plan, samplesFile);
  if (problems.length)
    throw new UserError(`cannot make a prescription from these inputs:\n  ${problems.join('\n  ')}`);
}
