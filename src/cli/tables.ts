/** `tilth tables`: print the agronomy tables in force (defaults, or merged with --tables) to edit. */
import type { Command } from 'commander';
import { tablesToYaml } from '../agronomy/index.js';
import { tablesFromOption } from './plan.js';
import { info, out, writeOutputFile } from './util.js';

export function register(program: Command): void {
  program
    .command('tables')
    .description(
      'Print the agronomy tables (crops, P classes, seed-row limits, products ...) with the source of every entry.',
    )
    .option('--tables <file>', 'show your edited tables merged over the defaults (validates them)')
    .option('--out <file>', 'write to a file instead of stdout')
    .option('--force', 'replace an existing --out file (your edited tables would be lost)')
    .option('--json', 'print JSON instead of YAML')
    .addHelpText(
      'after',
      '\nExample:\n  tilth tables > my-tables.yaml     # edit values and their source, then\n  tilth rates --tables my-tables.yaml --plan plan.yaml --soil "no3=25,p=8,k=140,s=12,om=4"',
    )
    .action((o: { tables?: string; out?: string; json?: boolean; force?: boolean }) => {
      const t = tablesFromOption(o.tables);
      const text = o.json ? JSON.stringify(t, null, 2) + '\n' : tablesToYaml(t);
      if (o.out) {
        writeOutputFile(o.out, text, { inputs: o.tables ? [o.tables] : [], force: o.force });
        info(`wrote ${o.out}`);
      } else out(text);
    });
}
