/** Inputs the way every command loads them: read (src/io readInputs), then judged (src/validate prepareInputs). */
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
