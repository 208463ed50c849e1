/** `tilth inspect`: what was loaded: area, UTM zone, sample density, nutrient statistics, warnings. */
import type { Command } from 'commander';
import { addInputOptions, inputOptionsFrom, loadInputs } from './inputs.js';
import { info, out, printWarnings } from './util.js';
import { readinessProblems } from './safety/readiness.js';
import { inspectInputs, formatInspection } from '../stats/inspect.js';
import { formatReading } from '../validate/reading.js';

export function register(program: Command): void {
  addInputOptions(
    program
      .command('inspect')
      .description(
        'Summarise a field boundary and its soil samples: area, UTM zone, density, nutrient statistics, how each column was read, warnings.',
      ),
  )
    .option('--json', 'print JSON for scripts')
    .addHelpText(
      'after',
      '\nExamples:\n  tilth inspect --samples sample-fields/quarter/samples.csv --boundary sample-fields/quarter/boundary.geojson\n' +
        '  tilth inspect --samples sample-fields/zoned/samples.geojson --boundary sample-fields/zoned/boundary.geojson --zones sample-fields/zoned/zones.geojson --json',
    )
    .action(async (o) => {
      const inputs = await loadInputs(inputOptionsFrom(o));
      const r = inspectInputs(inputs);
      const problems = readinessProblems(inputs, null, o.samples);
      if (o.json)
        out(
          JSON.stringify(
            { ...r, columns: inputs.reading ?? [], cannotPrescribe: problems },
            (_k, v) => (typeof v === 'number' && !Number.isFinite(v) ? null : v),
            2,
          ),
        );
      else {
        out(formatInspection(r));
        if (inputs.reading) out(`\n${formatReading(inputs.reading, `columns of ${o.samples}`)}`);
        printWarnings(inputs.warnings);
      }
      // inspect only looks: what would stop a build is a warning block, and the exit stays 0
      if (problems.length)
        info(`\nwarning: these inputs cannot make a prescription:\n  ${problems.join('\n  ')}`);
    });
}
