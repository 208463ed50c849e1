/**
 * tilth command line: one file per command under src/cli/, each exporting `register(program)`.
 * Exit codes: 0 ok, 1 a bug (stack printed) or a check that failed, 2 a user error (message only).
 */
import { isMainThread, workerData } from 'node:worker_threads';
import { Command, CommanderError } from 'commander';
import { isUserError } from '../errors.js';
import { CAUTION } from './util.js';
import { installStdioGuards, terminalSafe } from './safety/stdio.js';
import { VERSION } from '../version.js';
import * as inspect from './inspect.js';
import * as variability from './variability.js';
import * as surface from './surface.js';
import * as plan from './plan.js';
import * as rates from './rates.js';
import * as tables from './tables.js';
import * as build from './build.js';
import * as check from './check.js';
import * as report from './report.js';
import * as batch from './batch.js';

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
    .addHelpText('after', `\n${CAUTION}`)
    .exitOverride();

  for (const cmd of [inspect, surface, check, report, plan, rates, tables, build, batch, variability])
    cmd.register(program);

  try {
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
