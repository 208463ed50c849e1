/** `tilth plan init` (a commented starter plan) and `tilth plan check` (validate one). */
import type { Command } from 'commander';
import { UserError } from '../errors.js';
import { loadTables, parsePlan, planTemplate, type Tables } from '../agronomy/index.js';
import { info, out, readInput } from './util.js';

/** The tables in force: the defaults, or a user's file merged over them (`--tables FILE`). */
export function tablesFromOption(path: string | undefined): Tables {
  return path === undefined ? loadTables() : loadTables(readInput(path, 'tables').toString('utf8'), path);
}

export function register(program: Command): void {
  const plan = program
    .command('plan')
    .description('Write or check a plan file (crop, yield, strategies, implement, products, zoning, output).')
    .addHelpText(
      'after',
      '\nExample:\n  tilth plan init --crop canola > plan.yaml\n  tilth plan check --plan plan.yaml',
    );
  plan
    .command('init')
    .description(
      'Print a commented starter plan with every default visible (redirect it to a file and edit it).',
    )
    .option(
      '--crop <crop>',
      'crop (canola, wheat, barley, malt_barley, peas, or one from --tables)',
      'canola',
    )
    .option('--units <units>', 'rate units: lb/ac or kg/ha', 'lb/ac')
    .option('--tables <file>', 'your edited tables (see `tilth tables`)')
    .addHelpText('after', '\nExample:\n  tilth plan init --crop canola > plan.yaml')
    .action((o: { crop: string; units: string; tables?: string }) => {
      const tables = tablesFromOption(o.tables);
      if (!tables.crops[o.crop])
        throw new UserError(`option --crop: "${o.crop}"; allowed: ${Object.keys(tables.crops).join(', ')}.`);
      if (o.units !== 'lb/ac' && o.units !== 'kg/ha')
        throw new UserError(`option --units: "${o.units}"; allowed: lb/ac, kg/ha.`);
      out(planTemplate(o.crop, tables, o.units));
    });
  plan
    .command('check')
    .description('Validate a plan file against the tables; prints the plan with every default filled in.')
    .requiredOption('--plan <file>', 'plan file (YAML)')
    .option('--tables <file>', 'your edited tables (see `tilth tables`)')
    .option('--json', 'print the validated plan as JSON')
    .addHelpText('after', '\nExample:\n  tilth plan check --plan plan.yaml')
    .action((o: { plan: string; tables?: string; json?: boolean }) => {
      const tables = tablesFromOption(o.tables);
      const p = parsePlan(readInput(o.plan, 'plan').toString('utf8'), o.plan, tables);
      if (o.json) out(JSON.stringify(p, null, 2));
      else info(`${o.plan}: valid (${p.crop}, ${p.target_yield_bu} bu/ac, ${p.products.length} products)`);
    });
}
