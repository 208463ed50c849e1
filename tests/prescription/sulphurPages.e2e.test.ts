// The report's sulphate-S pages made ahead (BuildOptions.onSurfaces -> sulphurPages -> FolderOptions.sulphur, as the
// CLI does on a second thread) give the same folder as pages made in place; the hook sees the prescription's own
// inputs, grid and surfaces, once.
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { buildPrescription, type BuildOptions } from '../../src/prescription/index.js';
import { prescriptionFolder } from '../../src/prescription/folder.js';
import { sulphurPages, sulphurPagesInput } from '../../src/prescription/sulphurPages.js';
import { parsePlan, defaultTables } from '../../src/agronomy/index.js';
import { fieldInputs, quarterWithUnsampledPart } from '../helpers/inputs.js';
import { ROOT } from '../helpers/cli.js';

const src = (f: string) => ({ name: f, bytes: readFileSync(join(ROOT, 'sample-fields/quarter', f)) });
const inputs = await fieldInputs(src('samples.csv'), src('boundary.geojson'));
const tables = defaultTables();
const plan = parsePlan(
  readFileSync(join(ROOT, 'sample-fields/quarter/plan.yaml'), 'utf8'),
  'plan.yaml',
  tables,
);
const provenance = { tilth: 'test', created: 'test', inputs: [] } as never;

describe('sulphate-S pages made ahead', () => {
  it('onSurfaces hears the inputs, grid and surfaces of the prescription once; the folder is the same with the pages made from them', () => {
    const heard: Parameters<NonNullable<BuildOptions['onSurfaces']>>[0][] = [];
    const rx = buildPrescription(inputs, plan, tables, { cell: 5, onSurfaces: (m) => heard.push(m) });
    expect(heard).toHaveLength(1);
    expect(heard[0].inputs).toBe(inputs);
    expect(heard[0].grid).toBe(rx.grid);
    expect(heard[0].surfaces).toBe(rx.surfaces);
    // a structured clone stands in for the trip to the worker thread and back
    const pages = structuredClone(
      sulphurPages(structuredClone(sulphurPagesInput(inputs, plan, tables, rx.grid, rx.surfaces))),
    );
    expect(pages.chance?.raster).toBeDefined();
    expect(pages.charts.length).toBe(2);
    const inPlace = prescriptionFolder(rx, inputs, tables, { provenance });
    const ahead = prescriptionFolder(rx, inputs, tables, { provenance, sulphur: pages });
    expect(ahead.files.get('report.html')).toBe(inPlace.files.get('report.html'));
    expect(ahead.files.get('report-data.json')).toBe(inPlace.files.get('report-data.json'));
  });

  it('a field with an unsampled part hears the sampled part: not the inputs the folder gets, so the CLI makes the pages in place', async () => {
    const two = await fieldInputs(src('samples.csv'), {
      name: 'boundary.geojson',
      bytes: Buffer.from(quarterWithUnsampledPart()),
    });
    const p2 = parsePlan(
      readFileSync(join(ROOT, 'sample-fields/quarter/plan.yaml'), 'utf8').replace(
        /^unsampled_parts: null /m,
        'unsampled_parts: { urea: 80, map: 40 } ',
      ),
      'plan.yaml',
      tables,
    );
    const heard: Parameters<NonNullable<BuildOptions['onSurfaces']>>[0][] = [];
    const rx = buildPrescription(two, p2, tables, { cell: 5, onSurfaces: (m) => heard.push(m) });
    expect(heard).toHaveLength(1);
    expect(heard[0].inputs).not.toBe(two);
    // the surfaces were made on the sampled part only; the prescription covers the whole field
    expect(heard[0].inputs.field.areaM2).toBeLessThan(rx.field.areaM2 - 40_000);
  });
});
