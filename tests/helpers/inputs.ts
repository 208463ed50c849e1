/**
 * Inputs the way every command loads them: read (src/io readInputs), then judged (src/validate prepareInputs);
 * and the demo quarter's files and plan.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { parse as parseYaml, stringify } from 'yaml';
import { parsePlan, type Plan } from '../../src/agronomy/index.js';
import type { Tables } from '../../src/agronomy/tables.js';
import type { FieldInputs } from '../../src/types.js';
import { readInputs } from '../../src/io/inputs.js';
import type { InputFile } from '../../src/io/records.js';
import { prepareInputs, type PrepareOptions } from '../../src/validate/inputs.js';

/**
 * Reads and judges samples, boundary and optional zones given as files (name + bytes).
 * @example const inputs = await fieldInputs({ name: 'samples.csv', bytes }, { name: 'boundary.geojson', bytes: b });
 */
export async function fieldInputs(
  samples: InputFile,
  boundary: InputFile,
  zones?: InputFile,
  opts: PrepareOptions & { assumeWgs84?: boolean } = {},
): Promise<FieldInputs> {
  return prepareInputs(await readInputs({ samples, boundary, zones }, opts), opts);
}

const QUARTER = join(import.meta.dirname, '..', '..', 'sample-fields', 'quarter');

/** A file of the demo quarter (sample-fields/quarter) as an input file. @example quarterFile('samples.csv') */
export const quarterFile = (name: string): InputFile => ({ name, bytes: readFileSync(join(QUARTER, name)) });

/**
 * The demo quarter's plan with `edit` applied to its YAML object, parsed with `tables`.
 * @example quarterPlanWith((p) => (p.zoning.basis = 'response_chance'), defaultTables())
 */
export function quarterPlanWith(edit: (p: Record<string, any>) => void, tables: Tables): Plan {
  const p = parseYaml(readFileSync(join(QUARTER, 'plan.yaml'), 'utf8'));
  edit(p);
  return parsePlan(stringify(p), 'plan.yaml', tables);
}

/**
 * The demo quarter's boundary (GeoJSON text) with a detached square part about 1.4 km east of it that no sample
 * speaks for (the plan key unsampled_parts decides what it gets).
 * @example writeFileSync(b, quarterWithUnsampledPart())
 */
export function quarterWithUnsampledPart(): string {
  const d = JSON.parse(readFileSync(join(QUARTER, 'boundary.geojson'), 'utf8'));
  const g = d.features[0].geometry;
  const square = [
    [-106.385, 52.315],
    [-106.382, 52.315],
    [-106.382, 52.317],
    [-106.385, 52.317],
    [-106.385, 52.315],
  ];
  d.features[0].geometry = { type: 'MultiPolygon', coordinates: [g.coordinates, [square]] };
  return JSON.stringify(d);
}
