/** `tilth build`: the whole prescription from samples, boundary and plan, written into one folder. */
import { createHash } from 'node:crypto';
import type { Command } from 'commander';
import { parsePlan } from '../agronomy/index.js';
import { buildPrescription } from '../prescription/index.js';
import { geojsonName, prescriptionGeojson, shapefileFeatures, summaryObject, summaryText, zonesCsv, type Provenance } from '../prescription/outputs.js';
import { reportInput } from '../prescription/reportInput.js';
import { prescriptionFiles } from '../io/shapefile/index.js';
import { zipFiles } from '../io/zip.js';
import { prescriptionTaskDataFiles } from '../prescription/taskdata.js';
import { renderReport, serializeReportInput } from '../report/index.js';
import { inputsHash } from './report.js';
import { VERSION } from '../version.js';
import { addInputOptions, inputOptionsFrom, loadInputs } from './inputs.js';
import { tablesFromOption } from './plan.js';
import { CAUTION, checkOutputDir, info, numberOption, out, printWarnings, readInput, writeOutputDir } from './util.js';
import { createTerminal, type Task } from './progress.js';
import { buildSulphurCharts } from '../variability/index.js';

interface BuildFlags {
  samples: string; boundary: string; zones?: string; plan: string; tables?: string; out: string;
  force?: boolean; json?: boolean; cell?: string; columns?: string; depthFactor?: string; dropOutside?: boolean;
  pMethod?: 'olsen' | 'kelowna'; assumeWgs84?: boolean; quiet?: boolean;
}

export function register(program: Command): void {
  addInputOptions(program
    .command('build'))
    .description('Build a variable-rate prescription: nutrient maps, management zones, seed-row-safe product rates, files for the controller.')
    .requiredOption('--plan <file>', 'plan file (see `tilth plan init`)')
    .requiredOption('--out <dir>', 'output folder (created; an existing one is replaced only with --force and only when empty or written by tilth)')
    .option('--tables <file>', 'your edited agronomy tables (see `tilth tables`)')
    .option('--cell <m>', 'grid cell size in metres (default: about 200 cells across the field, 1-20 m)')
    .option('--force', 'replace an earlier tilth output folder (never one holding other files, an input, the current or home folder)')
    .option('--json', 'print summary.json on stdout for scripts')
    .option('--quiet', 'no progress messages')
    .addHelpText('after', `\nExample:\n  tilth plan init --crop canola > plan.yaml\n  tilth build --samples sample-fields/quarter/samples.csv --boundary sample-fields/quarter/boundary.geojson \\\n    --plan plan.yaml --out rx-quarter\n\nWrites prescription.geojson (one per zone set when there are several), zones.csv, summary.json, report.html;\nshapefiles/ and ISO 11783-10 task data (TASKDATA/ and taskdata.zip) as the plan's output.formats asks.\nExit 0 ok; 1 when some zone's targets cannot be met (the files are still written, the list is printed); 2 bad input.\n\n${CAUTION}`)
    .action(async (o: BuildFlags) => {
      const inputFiles = [o.samples, o.boundary, o.plan, o.zones, o.tables].filter((f): f is string => !!f);
      checkOutputDir(o.out, { force: o.force, inputs: inputFiles }); // before any work: a long build should not end in a refusal
      const term = createTerminal({ quiet: o.quiet });
      const say = (s: string) => term.line(s);
      const tables = tablesFromOption(o.tables);
      const planText = readInput(o.plan, 'plan').toString('utf8');
      const plan = parsePlan(planText, o.plan, tables);
      say('reading and checking the inputs ...');
      const inputs = await loadInputs(inputOptionsFrom(o as unknown as Record<string, unknown>));
      if (plan.field && !inputs.field.name) inputs.field.name = plan.field;
      let last = '';
      let task: Task | null = null;
      const rx = buildPrescription(inputs, plan, tables, {
        cell: numberOption('--cell', o.cell, { min: 0.1 }),
        onProgress: (step, done) => {
          if (step !== last) { task?.done(); last = step; task = term.task(step, 100); }
          task!.update(Math.round(done * 100), 100);
        },
      });
      (task as Task | null)?.done();
      const hash = (s: string | Buffer) => createHash('sha256').update(s).digest('hex');
      const named: { name: string; bytes: Uint8Array }[] = [
        { name: 'samples', bytes: readInput(o.samples, 'samples') },
        { name: 'boundary', bytes: readInput(o.boundary, 'boundary') },
        { name: 'plan', bytes: Buffer.from(planText, 'utf8') },
      ];
      if (o.zones) named.push({ name: 'zones', bytes: readInput(o.zones, 'zones') });
      if (o.tables) named.push({ name: 'tables', bytes: readInput(o.tables, 'tables') });
      const prov: Provenance = { tilth: VERSION, created: new Date().toISOString(), inputs: Object.fromEntries(named.map((f) => [f.name, hash(Buffer.from(f.bytes))])), id: inputsHash(named) };
      const files = new Map<string, string | Uint8Array>();
      for (const set of rx.zoneSets) files.set(geojsonName(rx, set), prescriptionGeojson(rx, set));
      files.set('zones.csv', zonesCsv(rx));
      const summary = summaryObject(rx, prov);
      files.set('summary.json', JSON.stringify(summary, null, 2) + '\n');
      if (plan.output.formats.includes('shapefile')) say('writing shapefiles ...');
      for (const set of plan.output.formats.includes('shapefile') ? rx.zoneSets : []) {
        const fc = shapefileFeatures(rx, set);
        if (fc.features.length === 0) continue;
        const shp = prescriptionFiles(fc, {
          layout: plan.output.shapefile_layout,
          crs: plan.output.crs === 'utm' ? 'utm' : 'lonlat',
          utm: rx.field.utm,
          shortFileNames: plan.output.short_names,
          prefix: rx.zoneSets.length > 1 ? `rx_${set.name}` : 'rx',
          title: `${plan.farm ? plan.farm + ', ' : ''}${plan.field || rx.field.name}: ${plan.crop}, zone set ${set.name} (tilth ${VERSION}, inputs ${prov.id})`,
        });
        for (const [name, bytes] of Object.entries(shp.files)) files.set(`shapefiles/${name}`, bytes);
      }
      if (plan.output.formats.includes('isoxml')) {
        say('writing ISO 11783-10 task data ...');
        const td = prescriptionTaskDataFiles(rx, tables, { layout: plan.output.shapefile_layout, grid: plan.output.isoxml_grid, gridCellM: plan.output.isoxml_grid_cell_m ?? undefined });
        const inFolder = Object.fromEntries(Object.entries(td).map(([n, b]) => [`TASKDATA/${n}`, b]));
        for (const [n, b] of Object.entries(inFolder)) files.set(n, b);
        files.set('taskdata.zip', zipFiles(inFolder));
      }
      say('drawing the report ...');
      // the sulphate-S variability charts (issue 8), from the build's own S surface
      const sSurf = rx.surfaces.find((s) => s.analyte === 'so4_s');
      const charts = buildSulphurCharts(inputs.samples, inputs.field, tables.crops[plan.crop], plan.strategy.s.method,
        sSurf ? { grid: sSurf.grid, values: sSurf.values, note: sSurf.choice, zones: sSurf.method === 'zones' } : undefined);
      const ri = reportInput(rx, inputs, tables, prov, { tablesEdited: !!o.tables, charts });
      files.set('report-data.json', serializeReportInput(ri));
      files.set('report.html', renderReport(ri));
      writeOutputDir(o.out, files, { force: o.force, inputs: inputFiles });
      if (o.json) out(JSON.stringify(summary, null, 2));
      else out(summaryText(rx));
      printWarnings(rx.warnings);
      const top = [...new Set([...files.keys()].map((f) => f.replace(/\/.*/, '/')))];
      info(`wrote ${files.size} files to ${o.out}: ${top.join(', ')}`);
      info(CAUTION);
      if (rx.infeasible.length > 0) {
        info(`\n${rx.infeasible.length} zone(s) cannot meet their targets within the plan's limits:`);
        for (const f of rx.infeasible) info(`  zone set ${f.zoneSet}, zone ${f.zone}: ${f.reason}`);
        process.exitCode = 1;
      }
    });
}
