/** `tilth batch FARM.yaml`: builds every field of a farm file on a pool of worker threads, then a farm summary. */
import { availableParallelism } from 'node:os';
import { dirname, isAbsolute, join } from 'node:path';
import type { Command } from 'commander';
import { farmTotals, parseFarm, type FarmField } from '../prescription/farm.js';
import { kgToTonnes, M2_PER_AC, m2ToHa } from '../units/index.js';
import type { BuildFlags } from './build.js';
import { runPool } from './batchPool.js';
import type { FieldJob, FieldResult } from './batchWorker.js';
import { CAUTION, info, numberOption, out, readInput } from './util.js';
import { PLACEMENT_NAME } from '../vocabulary.js';

interface BatchFlags {
  workers?: string;
  force?: boolean;
  json?: boolean;
  quiet?: boolean;
}

const EXAMPLE = `
Example farm file (paths relative to it; "defaults:" applies to every field):
  defaults:
    plan: plans/canola.yaml
    cell: 2
  fields:
    - name: North quarter
      samples: north/samples.csv
      boundary: north/boundary.geojson
      out: rx/north
    - samples: south/samples.geojson
      boundary: south/boundary.geojson
      plan: plans/wheat.yaml
      out: rx/south

  tilth batch farm.yaml --workers 2

Each field is built exactly as \`tilth build\` builds it (same files in its out folder). One line per field on
stderr as it finishes; then the farm summary on stdout: each field's result and the product totals per
placement summed over the fields (for ordering). Every field is attempted even when others fail.
Exit 0 all fields ok; 1 some field has zones whose targets cannot be met (or failed on a bug); 2 some
field's input is bad (each failure is listed). More than one machine: docs/performance.md, "Farm batches".`;

export function register(program: Command): void {
  program
    .command('batch')
    .argument('<farm>', 'farm file (YAML): fields with samples, boundary, plan and out')
    .description(
      'Build the prescriptions of many fields at once, on a pool of worker threads, with a farm summary of product totals.',
    )
    .option('--workers <n>', "fields built at once (default: the machine's cores)")
    .option('--force', 'replace earlier tilth output folders (as `tilth build --force`)')
    .option('--json', 'print the farm summary as JSON on stdout for scripts')
    .option('--quiet', 'no progress lines')
    .addHelpText('after', `${EXAMPLE}\n\n${CAUTION}`)
    .action(async (farm: string, o: BatchFlags) => {
      const fields = parseFarm(readInput(farm, 'farm file').toString('utf8'), farm);
      const base = dirname(farm);
      const at = (p: string | undefined) => (p === undefined ? undefined : isAbsolute(p) ? p : join(base, p));
      const jobs: FieldJob[] = fields.map((f, id) => ({ id, flags: flagsOf(f, at, o.force) }));
      const workers = Math.min(
        fields.length,
        numberOption('--workers', o.workers, { min: 1, integer: true }) ?? availableParallelism(),
      );
      if (!o.quiet) info(`building ${fields.length} field(s) on ${workers} worker thread(s) ...`);
      let n = 0;
      const results = await runPool(jobs, workers, (r) => {
        n++;
        if (!o.quiet) info(fieldLine(r, fields[r.id], n, fields.length));
      });
      const summary = farmSummary(fields, results);
      out(o.json ? JSON.stringify(summary, null, 2) : farmText(summary));
      const failed = summary.fields.filter((f) => f.status !== 'ok');
      if (failed.length) {
        info(`\n${failed.length} of ${fields.length} field(s) need attention:`);
        for (const f of failed)
          info(`  ${f.name} (${f.out}): ${f.status}${f.message ? `: ${f.message.split('\n')[0]}` : ''}`);
      }
      info(CAUTION);
      process.exitCode = summary.exitCode;
    });
}

function flagsOf(
  f: FarmField,
  at: (p: string | undefined) => string | undefined,
  force?: boolean,
): BuildFlags {
  return {
    samples: at(f.samples)!,
    boundary: at(f.boundary)!,
    plan: at(f.plan)!,
    out: at(f.out)!,
    zones: at(f.zones),
    tables: at(f.tables),
    cell: f.cell === undefined ? undefined : String(f.cell),
    force,
    quiet: true,
  };
}

/** "[3/20] North quarter: ok, 14 zones, 159.9 ac, 2.1 s" */
function fieldLine(r: FieldResult, f: FarmField, n: number, total: number): string {
  const s = (r.ms / 1000).toFixed(1);
  if (r.outcome)
    return `[${n}/${total}] ${f.name}: ${r.status === 'ok' ? 'ok' : `${r.outcome.infeasible.length} zone(s) cannot meet their targets`}, ${r.outcome.zones} zones, ${r.outcome.field.areaAc.toFixed(1)} ac, ${s} s -> ${f.out}`;
  return `[${n}/${total}] ${f.name}: ${r.status === 'bad-input' ? 'bad input' : 'failed (a bug; please report it)'}: ${(r.message ?? '').split('\n')[0]}`;
}

/** The farm summary: every field's result, product totals over the fields, and the exit code. */
export function farmSummary(fields: FarmField[], results: FieldResult[]) {
  const rows = fields.map((f, i) => {
    const r = results[i];
    return {
      name: f.name,
      out: f.out,
      status: r.status,
      message: r.message,
      zones: r.outcome?.zones ?? null,
      area_ac: r.outcome ? round(r.outcome.field.areaAc, 2) : null,
      infeasible_zones: r.outcome?.infeasible.length ?? null,
      seconds: round(r.ms / 1000, 2),
    };
  });
  const totals = farmTotals(results.map((r) => ({ totals: r.outcome?.totals ?? [] }))).map((t) => ({
    product: t.product,
    label: t.label,
    placement: t.placement,
    total_lb: round(t.totalLb, 0),
    total_kg: round(t.totalKg, 0),
    total_tonnes: round(kgToTonnes(t.totalKg), 3),
    applied_ac: round(t.appliedAc, 2),
    fields: t.fields,
  }));
  const exitCode = results.some((r) => r.status === 'bad-input')
    ? 2
    : results.some((r) => r.status !== 'ok')
      ? 1
      : 0;
  const areaAc = results.reduce((s, r) => s + (r.outcome?.field.areaAc ?? 0), 0);
  return {
    fields: rows,
    totals,
    area_ac: round(areaAc, 2),
    area_ha: round(m2ToHa(areaAc * M2_PER_AC), 2),
    exitCode,
  };
}

function farmText(s: ReturnType<typeof farmSummary>): string {
  const lines = [
    `farm: ${s.fields.length} field(s), ${s.fields.filter((f) => f.status === 'ok').length} ok, ${s.area_ac} ac built`,
    '',
  ];
  lines.push('  field                          result        zones      ac');
  for (const f of s.fields)
    lines.push(
      `  ${f.name.slice(0, 30).padEnd(30)} ${f.status.padEnd(12)} ${String(f.zones ?? '-').padStart(6)} ${f.area_ac === null ? '      -' : f.area_ac.toFixed(1).padStart(7)}`,
    );
  lines.push('', 'product totals over the farm (for ordering):');
  if (!s.totals.length) lines.push('  (no product is applied on any field built)');
  for (const t of s.totals)
    lines.push(
      `  ${t.label} (${PLACEMENT_NAME[t.placement]}): ${t.total_lb} lb = ${t.total_tonnes} t, ${t.applied_ac} ac on ${t.fields} field(s)`,
    );
  return lines.join('\n');
}

function round(x: number, d: number): number {
  const f = 10 ** d;
  return Math.round(x * f) / f;
}
