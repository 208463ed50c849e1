/** `tilth inspect`: what was loaded (placeholder until the foundation issue lands). */
import type { Command } from 'commander';
import { loadInputs } from './inputs.js';

export function register(program: Command): void {
  program
    .command('inspect')
    .description('Summarise a field boundary and its soil samples: area, UTM zone, density, nutrient statistics, warnings.')
    .requiredOption('--samples <file>', 'soil samples (.geojson, .csv, .shp, .zip)')
    .requiredOption('--boundary <file>', 'field boundary (.geojson, .shp, .zip)')
    .option('--json', 'print JSON for scripts')
    .addHelpText('after', '\nExample:\n  tilth inspect --samples sample-fields/prairie-view-quarter/samples.geojson --boundary sample-fields/prairie-view-quarter/boundary.geojson')
    .action((o) => {
      loadInputs({ samples: o.samples, boundary: o.boundary });
    });
}
