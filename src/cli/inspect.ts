/** `tilth inspect`: what was loaded: area, UTM zone, sample density, nutrient statistics, warnings. */
import type { Command } from 'commander';
import { loadInputs } from './inputs.js';
import { numberOption, out, printWarnings } from './util.js';
import { inspectInputs, formatInspection } from '../stats/inspect.js';
import { UserError } from '../errors.js';
import type { PMethod } from '../types.js';

export function register(program: Command): void {
  program
    .command('inspect')
    .description('Summarise a field boundary and its soil samples: area, UTM zone, density, nutrient statistics, warnings.')
    .requiredOption('--samples <file>', 'soil samples (.geojson, .csv, .shp, .zip)')
    .requiredOption('--boundary <file>', 'field boundary (.geojson, .shp, .zip)')
    .option('--zones <file>', 'zone polygons that zone-composite samples are keyed to (.geojson, .shp, .zip)')
    .option('--columns <map>', 'CSV column map, e.g. "id=Sample ID,lat=Lat,lon=Long,p=P Olsen:ppm" (headers are recognised otherwise)')
    .option('--p-method <method>', 'P test method when the file does not name it: olsen or kelowna')
    .option('--depth-factor <x>', 'factor from 0-6 in to 0-24 in nitrate and sulphate when only 0-6 in was sampled (no default: ask your lab or agronomist)')
    .option('--drop-outside', 'leave out samples outside the boundary (default: keep them and warn)')
    .option('--assume-wgs84', 'read a shapefile that has no .prj as WGS 84 longitude/latitude (default: refuse)')
    .option('--json', 'print JSON for scripts')
    .addHelpText('after', '\nExample:\n  tilth inspect --samples sample-fields/quarter/samples.csv --boundary sample-fields/quarter/boundary.geojson\n' +
      '  tilth inspect --samples sample-fields/zoned/samples.geojson --boundary sample-fields/zoned/boundary.geojson --zones sample-fields/zoned/zones.geojson --json')
    .action((o) => {
      let pMethod: PMethod | undefined;
      if (o.pMethod !== undefined) {
        const m = String(o.pMethod).toLowerCase();
        if (m !== 'olsen' && m !== 'kelowna') throw new UserError(`option --p-method: "${o.pMethod}" is not olsen or kelowna. Fix: give --p-method olsen or --p-method kelowna.`);
        pMethod = m;
      }
      const inputs = loadInputs({
        samples: o.samples, boundary: o.boundary, zones: o.zones, columns: o.columns, pMethod,
        depthFactor: numberOption('--depth-factor', o.depthFactor, { min: 1, max: 10 }),
        dropOutside: Boolean(o.dropOutside), assumeWgs84: Boolean(o.assumeWgs84),
      });
      const r = inspectInputs(inputs);
      if (o.json) out(JSON.stringify(r, (_k, v) => (typeof v === 'number' && !Number.isFinite(v) ? null : v), 2));
      else {
        out(formatInspection(r));
        printWarnings(inputs.warnings);
      }
    });
}
