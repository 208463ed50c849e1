/** `tilth rates`: the full decision for one location's soil values. */
import type { Command } from 'commander';
import { decide, formatDecision, parsePlan, parseSoilSpec } from '../agronomy/index.js';
import { tablesFromOption } from './plan.js';
import { CAUTION, info, out, printWarnings, readInput } from './util.js';

export function register(program: Command): void {
  program
    .command('rates')
    .description(
      'Decide nutrient targets, seed-row-safe placements and least-cost product rates for one location.',
    )
    .requiredOption('--plan <file>', 'plan file (see `tilth plan init`)')
    .requiredOption(
      '--soil <values>',
      'soil test: "no3=25,p=8,k=140,s=12,om=4[,texture=medium,ph=7.5,p_method=olsen]" (no3, s lb/ac 0-24 in; p, k ppm 0-6 in; om %)',
    )
    .option('--tables <file>', 'your edited tables (see `tilth tables`)')
    .option('--json', 'print the decision as JSON for scripts')
    .addHelpText(
      'after',
      `\nExample:\n  tilth plan init --crop canola > plan.yaml\n  tilth rates --plan plan.yaml --soil "no3=25,p=8,k=140,s=12,om=4"\n\n${CAUTION}`,
    )
    .action((o: { plan: string; soil: string; tables?: string; json?: boolean }) => {
      const tables = tablesFromOption(o.tables);
      const plan = parsePlan(readInput(o.plan, 'plan').toString('utf8'), o.plan, tables);
      const soil = parseSoilSpec(o.soil, 'option --soil');
      const d = decide(soil, plan, tables);
      if (o.json) {
        out(JSON.stringify(d, (_k, v) => (typeof v === 'number' && !Number.isFinite(v) ? null : v), 2));
        printWarnings(d.warnings);
      } else {
        out(formatDecision(d));
        info(CAUTION);
      }
      if (d.status === 'infeasible') process.exitCode = 2;
    });
}
