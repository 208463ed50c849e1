/**
 * The library's judgement of the inputs: raw tables and polygons (src/io/inputs.ts readInputs) -> validated,
 * projected FieldInputs. Reads nothing: no file system, no parsing of file formats.
 */
import { UserError, type Warning } from '../errors.js';
import { ANALYTES, type Field, type FieldInputs, type PMethod, type Samples } from '../types.js';
import { projectField } from '../geo/field.js';
import { parseColumnMap } from '../io/columns.js';
import type { RawInputs } from '../io/inputs.js';
import type { RawPolygons } from '../io/records.js';
import { buildSamples } from './samples.js';
import { checkPartsMetres, checkPolygonsLonLat } from './boundary.js';
import { checkPositions, placeSamples, samePlaceWarning } from './positions.js';
import { sampleZones } from './sampleZones.js';
import { soilFlagWarnings } from '../agronomy/soilFlags.js';
import { m2ToAc } from '../units/index.js';

export interface PrepareOptions {
  /** CSV column map "id=Sample ID,lat=Latitude,..." */
  columns?: string;
  /** 0-6 in to 0-24 in factor for nitrate and sulphate; no default */
  depthFactor?: number;
  /** drop samples outside the boundary (default false: keep them and warn) */
  dropOutside?: boolean;
  /** P test method when the samples file does not say */
  pMethod?: PMethod;
  /** fewest point samples for a map (default 3; zone composites need 1 per zone) */
  minSamples?: number;
  /** coordinate system of easting / northing columns in a table, e.g. "EPSG:26913" */
  crs?: string;
}

/**
 * Validates and projects samples, boundary and (optional) sample zones, as read by readInputs.
 * @throws UserError naming file, feature/row, field, value and fix for anything the user must correct
 * @example
 * const raw = await readInputs({ samples: { name: 'samples.geojson', bytes }, boundary: { name: 'boundary.geojson', bytes: b } });
 * const inputs = prepareInputs(raw);
 * inputs.field.areaM2; inputs.samples.values.p;
 */
export function prepareInputs(raw: RawInputs, opts: PrepareOptions = {}): FieldInputs {
  const warnings: Warning[] = [];
  const { field, forward } = boundaryField(raw.boundary, warnings);
  const table = raw.samples;
  const built = buildSamples(table, {
    map: parseColumnMap(opts.columns),
    depthFactor: opts.depthFactor,
    pMethod: opts.pMethod,
  });
  warnings.push(...built.warnings);
  checkPositions(built.samples, table);
  const files = { samples: table.file, boundary: raw.boundary.file };
  const { s, xy, kept } = placeSamples(
    built.samples,
    forward(built.samples.lonlat),
    field,
    files,
    opts.dropOutside,
    warnings,
  );
  const same = samePlaceWarning(s, xy, table.file);
  if (same) warnings.push(same);
  const zones = sampleZones({
    table,
    s,
    xy,
    polygons: table.polygons && kept.map((i) => table.polygons![built.firstRecord[i]]),
    zonesSrc: raw.zones,
    forward,
    warnings,
  });
  enoughSamples(s, zones !== null, field.areaM2, table.file, opts.minSamples ?? 3, warnings);
  warnings.push(...soilFlagWarnings(s, table.file));
  const samples: Samples = { ...s, xy };
  return { samples, field, zones, warnings, reading: built.reading };
}

/** The boundary checked in longitude/latitude, projected to its UTM zone and checked again in metres. */
function boundaryField(
  rawB: RawPolygons,
  warnings: Warning[],
): { field: Field; forward: (a: ArrayLike<number>) => Float64Array } {
  const b = checkPolygonsLonLat(rawB, 'boundary');
  warnings.push(...b.warnings);
  const name = String(
    rawB.features[0].props.name ??
      rawB.file
        .split(/[\\/]/)
        .pop()!
        .replace(/\.[^.]+$/, ''),
  );
  const { projector, ...field } = projectField(b.coordinates, name);
  checkPartsMetres(field.parts, b.where, rawB.file, 'boundary');
  return { field, forward: (a) => projector.forward(a) };
}

/** Point samples: at least `min` for a map (refused below), a warning per analyte with too few values and below 10 samples. */
function enoughSamples(
  s: Omit<Samples, 'xy'>,
  composite: boolean,
  areaM2: number,
  file: string,
  min: number,
  warnings: Warning[],
): void {
  if (composite) return;
  if (s.ids.length < min) {
    throw new UserError(
      `${file}: ${s.ids.length} sample(s) in the field; a map needs at least ${min} point samples (more than 20 for a useful one). ` +
        'Fix: give all the samples of the field, or treat the field as zone composites with --zones.',
      { file },
    );
  }
  for (const a of ANALYTES) {
    const k = s.values[a].reduce((m, v) => m + (Number.isNaN(v) ? 0 : 1), 0);
    if (k > 0 && k < min)
      warnings.push({
        code: 'few-values',
        field: a,
        message: `only ${k} sample(s) have ${a}; too few to map it.`,
      });
  }
  const acres = m2ToAc(areaM2);
  if (s.ids.length < 10)
    warnings.push({
      code: 'few-samples',
      message: `only ${s.ids.length} samples for ${acres.toFixed(0)} ac: a map from so few is rough; check it against what you know of the field.`,
    });
}
