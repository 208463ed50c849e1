/** `tilth report DIR`: re-renders DIR/report.html from the build's DIR/report-data.json. */
import type { Command } from 'commander';
import { statSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { UserError } from '../errors.js';
import { parseReportInput, renderReport } from '../report/index.js';
import { createTerminal } from './progress.js';
import { out, readInput, writeOutputFile } from './util.js';

/** A report page tilth rendered names tilth as its generator. */
const REPORT_OURS = (h: string) => h.includes('<meta name="generator" content="tilth');

/** File the build writes beside its outputs, and the report it re-renders. */
export const REPORT_DATA = 'report-data.json';
export const REPORT_HTML = 'report.html';

export function register(program: Command): void {
  program
    .command('report')
    .argument('<dir>', "a build's output folder (holding report-data.json)")
    .description(
      "Re-render the field report (report.html) from a build's output folder: one self-contained HTML page with maps, legends and tables that opens offline and prints on Letter or A4.",
    )
    .option('--out <file>', 'write the report here instead of DIR/report.html')
    .option('--force', 'replace an existing --out file that is not a tilth report')
    .option('--json', 'print what was written as JSON for scripts')
    .option('--quiet', 'print nothing but warnings and errors')
    .addHelpText(
      'after',
      '\nExample:\n  tilth report out/prairie-view\n  (reads out/prairie-view/report-data.json, writes out/prairie-view/report.html)',
    )
    .action((dir: string, o: { out?: string; json?: boolean; quiet?: boolean; force?: boolean }) => {
      const term = createTerminal({ quiet: o.quiet || o.json });
      let st;
      try {
        st = statSync(dir);
      } catch {
        throw new UserError(
          `output folder "${dir}" does not exist. Fix: give the folder \`tilth build --out\` wrote.`,
          { file: dir },
        );
      }
      if (!st.isDirectory())
        throw new UserError(
          `"${dir}" is a file, not a build's output folder. Fix: give the folder \`tilth build --out\` wrote.`,
          { file: dir },
        );
      const dataPath = join(dir, REPORT_DATA);
      const text = readInput(dataPath, 'report data (written by `tilth build`)').toString('utf8');
      const input = parseReportInput(text, dataPath);
      const task = term.task('rendering report');
      const html = renderReport(input);
      const target = o.out ?? join(dir, REPORT_HTML);
      writeOutputFile(target, html, { inputs: [dataPath], force: o.force, ours: REPORT_OURS });
      task.done();
      const zones = input.zoneSets.reduce((s, z) => s + z.zones.length, 0);
      const maps = (html.match(/<svg class="map"/g) ?? []).length;
      if (o.json)
        out(
          JSON.stringify({
            report: resolve(target),
            bytes: Buffer.byteLength(html),
            maps,
            zones,
            warnings: input.warnings.length,
          }),
        );
      else {
        term.summary(`Report written: ${target}`, [
          ['maps', String(maps)],
          ['zones', String(zones)],
          ['warnings', String(input.warnings.length)],
          ['size', `${(Buffer.byteLength(html) / 1024).toFixed(0)} KiB`],
        ]);
        for (const w of input.warnings) term.warn(w.message);
      }
    });
}
