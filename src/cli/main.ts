/**
 * tilth command line: one file per command under src/cli/, each exporting `register(program)`.
 * Exit codes: 0 ok, 1 a bug (stack printed) or a check that failed, 2 a user error (message only).
 */
import { isMainThread, workerData } from 'node:worker_threads';
import { Command, CommanderError } from 'commander';
import { isUserError } from '../errors.js';
import { installStdioGuards, terminalSafe } from './safety/stdio.js';
import { VERSION } from '../version.js';

/**
 * Every command, in the order of `tilth --help`, loaded with import() only when it runs: `tilth surface`
 * never loads the report, the shapefile writer or the product solver, and `tilth --version` loads none
 * (docs/performance.md, "Start-up").
 */
const COMMANDS: Record<string, () => Promise<{ register(program: Command): void }>> = {
  inspect: () => import('./inspect.js'),
  surface: () => import('./surface.js'),
  check: () => import('./check.js'),
  report: () => import('./report.js'),
  plan: () => import('./plan.js'),
  rates: () => import('./rates.js'),
  tables: () => import('./tables.js'),
  build: () => import('./build.js'),
  batch: () => import('./batch.js'),
  variability: () => import('./variability.js'),
};

/** The commands to register for these arguments: the one named, none for --version, else all (help, typos). */
function commandsFor(argv: string[]): string[] {
  const first = argv.find((a) => !a.startsWith('-'));
  if (first !== undefined && Object.hasOwn(COMMANDS, first)) return [first];
  if (first === undefined && argv.length > 0 && argv.every((a) => a === '-V' || a === '--version')) return [];
  return Object.keys(COMMANDS);
}

if (!isMainThread && (workerData as { tilthBatchWorker?: boolean } | null)?.tilthBatchWorker) {
  // a worker of `tilth batch` (src/cli/batchPool.ts): serve field builds instead of parsing arguments
  (await import('./batchWorker.js')).serveBatch();
} else {
  installStdioGuards(); // `tilth ... | head` ends quietly

  const program = new Command();
  program
    .name('tilth')
    .description('Variable-rate fertilizer prescriptions from soil-test samples and a field boundary.')
    .version(VERSION)
    .showHelpAfterError()
    .exitOverride();

  try {
    const names = commandsFor(process.argv.slice(2));
    // the caution comes with the tables' vocabulary (zod, yaml): not loaded for --version
    if (names.length) program.addHelpText('after', `\n${(await import('../vocabulary.js')).CAUTION}`);
    for (const name of names) (await COMMANDS[name]()).register(program);
    await program.parseAsync(process.argv);
  } catch (e) {
    if (e instanceof CommanderError) {
      // --help and --version exit 0; usage errors are user errors
      process.exitCode = e.exitCode === 0 ? 0 : 2;
    } else if (isUserError(e)) {
      process.stderr.write(`tilth: ${terminalSafe((e as Error).message)}\n`);
      process.exitCode = 2;
    } else {
      process.stderr.write(
        `tilth: internal error (a bug; please report it with this trace):\n${(e as Error)?.stack ?? String(e)}\n`,
      );
      process.exitCode = 1;
    }
  }
}
