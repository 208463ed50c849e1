/**
 * From raw records (CSV / spreadsheet rows, GeoJSON or shapefile points) to samples: one per sampling location,
 * depths merged, values in tilth's canonical units (src/types.ts Analyte), censoring kept, EC and carbonate kept
 * beside them, and the column reading for people. Positions are not yet projected or checked against the boundary
 * (src/validate/inputs.ts does that).
 */
import { ANALYTE_NAME } from '../vocabulary.js';
import { UserError, type Warning } from '../errors.js';
import {
  ANALYTES,
  EXTRA_VALUES,
  type ColumnReading,
  type LimeRating,
  type PMethod,
  type Samples,
  type Texture,
} from '../types.js';
import {
  isUsed,
  parseDepthText,
  planColumns,
  type ColumnInfo,
  type ColumnMap,
  type Role,
  type SoilValue,
} from '../io/columns.js';
import type { RawRecord, RawTable } from '../io/records.js';
import { decidePMethod } from './pmethod.js';
import { readSampleValues, type ValueArrays } from './sampleValues.js';
import { columnReading } from './reading.js';

export interface SampleOptions {
  /** user column map (parseColumnMap) */
  map?: ColumnMap;
  /** factor from 0-6 in nitrate / sulphate lb/ac to 0-24 in; no default: without it 0-6 in only is an error */
  depthFactor?: number;
  /** P test method when the file does not say; must agree with the file when it does */
  pMethod?: PMethod;
}

/** Samples before projection (xy is filled by src/validate/inputs.ts). */
export type SamplesLonLat = Omit<Samples, 'xy'>;

const TEXTURES: Record<string, Texture> = {
  light: 'light',
  coarse: 'light',
  sand: 'light',
  'loamy sand': 'light',
  'sandy loam': 'light',
  l: 'light',
  medium: 'medium',
  loam: 'medium',
  'silt loam': 'medium',
  silt: 'medium',
  'sandy clay loam': 'medium',
  'fine sandy loam': 'medium',
  m: 'medium',
  heavy: 'heavy',
  fine: 'heavy',
  clay: 'heavy',
  'clay loam': 'heavy',
  'silty clay': 'heavy',
  'silty clay loam': 'heavy',
  'sandy clay': 'heavy',
  'heavy clay': 'heavy',
  h: 'heavy',
};

/**
 * Parses a texture class word (light/medium/heavy, or a soil texture class name); null when blank, 'bad' when unknown.
 * @example parseTexture('Clay Loam') // 'heavy'
 */
export function parseTexture(raw: unknown): Texture | null | 'bad' {
  if (raw === null || raw === undefined) return null;
  const s = String(raw)
    .trim()
    .toLowerCase()
    .replace(/[\s_-]+/g, ' ');
  if (s === '') return null;
  return TEXTURES[s] ?? 'bad';
}

/**
 * Parses a depth interval such as "0-6", "6 - 24 in", "0-15 cm" into inches (cm / 2.5: the prairie layers).
 * @param unit the depth column's unit from its header, if stated
 * @example parseDepth('15-60 cm', null) // [6, 24]
 */
export const parseDepth = parseDepthText;

/**
 * Builds samples from a table of records.
 * @returns samples, warnings, for each sample the index of its first record in the table, and the column reading
 * @throws UserError for anything that cannot be read unambiguously (see docs/method.md "Reading samples")
 * @example const { samples, warnings } = buildSamples(readCsvRecords(text, 'samples.csv', []), {});
 */
export function buildSamples(
  table: RawTable,
  opts: SampleOptions = {},
): { samples: SamplesLonLat; warnings: Warning[]; firstRecord: number[]; reading: ColumnReading[] } {
  const file = table.file;
  const warnings: Warning[] = [];
  const plan = planColumns(table.columns, opts.map ?? [], file, table.headerNotes);
  const used = plan.filter(isUsed);
  const col = (role: Role) => used.find((c) => c.role === role);
  if (table.records.length === 0) {
    throw new UserError(
      `${file} holds no samples. Fix: check that the file is the lab results with one row (or point) per sample.`,
      { file },
    );
  }
  const depthCol = col('depth');
  const recDepth = recordDepths(table, depthCol);
  const idCol = col('id');
  const groups = groupRecords(table, idCol, depthCol, warnings);
  const ids = [...groups.keys()];
  const pMethod = decidePMethod(table, used, col('pmethod'), opts.pMethod);
  const soilCols = used.filter((c) =>
    (['no3_n', 'p', 'k', 'so4_s', 'om', 'ph', 'ec', 'carbonate'] as Role[]).includes(c.role),
  ) as (ColumnInfo & { role: SoilValue })[];
  const arrays = readSampleValues({ table, ids, groups, soilCols, recDepth, depthCol, opts, warnings });
  const texture: (Texture | null)[] = ids.map((id) =>
    firstText(table, groups.get(id)!, col('texture'), (v) => {
      const t = parseTexture(v);
      if (t === 'bad')
        throw new UserError(
          `${file} sample "${id}", column "${col('texture')!.name}": "${v}" is not a texture class tilth knows. Fix: write light, medium or heavy (or a class such as sandy loam, loam, clay loam).`,
          { file, where: id, field: col('texture')!.name, value: v },
        );
      return t;
    }),
  );
  const zone = ids.map((id) => firstText(table, groups.get(id)!, col('zone'), (v) => v));
  const origin = ids.map((id) => {
    const recs = groups.get(id)!;
    const a = table.records[recs[0]].where,
      b = table.records[recs[recs.length - 1]].where;
    return recs.length === 1 ? `${file} ${a}` : `${file} ${a}-${b.replace(/^\D+/, '')}`;
  });
  const lonlat = new Float64Array(2 * ids.length);
  ids.forEach((id, s) => {
    const r = table.records[groups.get(id)![0]];
    lonlat[2 * s] = r.lon;
    lonlat[2 * s + 1] = r.lat;
  });
  missingWarnings(arrays, soilCols, ids, file, warnings);
  const samples: SamplesLonLat = {
    ids,
    lonlat,
    values: arrays.values,
    censored: arrays.censored,
    texture,
    zone,
    pMethod,
    origin,
  };
  const extra = Object.fromEntries(
    EXTRA_VALUES.filter((e) => soilCols.some((c) => c.role === e)).map((e) => [e, arrays.extra[e]]),
  );
  if (Object.keys(extra).length) samples.extra = extra;
  if (soilCols.some((c) => c.role === 'ec'))
    samples.ecMethod = soilCols.find((c) => c.role === 'ec')!.method ?? null;
  if (arrays.limeRating.some((r) => r !== null))
    samples.limeRating = arrays.limeRating as (LimeRating | null)[];
  return {
    samples,
    warnings,
    firstRecord: ids.map((id) => groups.get(id)![0]),
    reading: columnReading(table, plan, arrays.refused, depthCol),
  };
}

/** Each record's depth from the depth column (the row's depth beats a depth in a header). */
function recordDepths(table: RawTable, depthCol: ColumnInfo | undefined): ([number, number] | null)[] {
  if (!depthCol) return table.records.map(() => null);
  const unit = depthCol.depthUnit ?? guessDepthUnit(table.records, depthCol);
  return table.records.map((r) => {
    const raw = r.props[depthCol.name];
    if (raw === null || raw === undefined) return null;
    const d = parseDepthText(raw, unit);
    if (!d) {
      throw new UserError(
        `${table.file} ${r.where}, column "${depthCol.name}": "${raw}" is not a depth interval. Fix: write it as top-bottom, e.g. 0-6 or 6-24 (inches) or 0-15 cm.`,
        { file: table.file, where: r.where, field: depthCol.name, value: raw },
      );
    }
    return d;
  });
}

/** Records grouped into samples by id (file order), checking that one id is one place. */
function groupRecords(
  table: RawTable,
  idCol: ColumnInfo | undefined,
  depthCol: ColumnInfo | undefined,
  warnings: Warning[],
): Map<string, number[]> {
  const file = table.file;
  if (!idCol && depthCol) {
    throw new UserError(
      `${file}: there is a depth column but no sample id column, so rows cannot be joined into samples. Fix: name it with --columns "id=YOUR ID COLUMN".`,
      { file },
    );
  }
  if (!idCol) {
    warnings.push({
      code: 'no-id-column',
      file,
      message: `${file}: no sample id column was recognised; samples are numbered in file order (1, 2, ...). Name it with --columns "id=COLUMN" if there is one.`,
    });
  }
  const groups = new Map<string, number[]>();
  table.records.forEach((r, i) => {
    let id = String(i + 1);
    if (idCol) {
      const raw = r.props[idCol.name];
      if (raw === null || String(raw).trim() === '') {
        throw new UserError(
          `${file} ${r.where}, column "${idCol.name}": the sample id is empty. Fix: give every row its sample id.`,
          { file, where: r.where, field: idCol.name },
        );
      }
      id = String(raw).trim();
    }
    const g = groups.get(id);
    if (!g) {
      groups.set(id, [i]);
      return;
    }
    const first = table.records[g[0]];
    if (Math.abs(r.lon - first.lon) > 5e-5 || Math.abs(r.lat - first.lat) > 5e-5) {
      throw new UserError(
        `${file}: sample id "${id}" is used twice, for two different places (${first.where}: ${first.lat}, ${first.lon}; ${r.where}: ${r.lat}, ${r.lon}). ` +
          'Fix: ids must be unique per sampling location; correct the id or the coordinates.',
        { file, where: r.where, field: idCol?.name, value: id },
      );
    }
    g.push(i);
  });
  return groups;
}

/** The first non-empty text of a column over a sample's records, parsed. */
function firstText<T>(
  table: RawTable,
  recs: number[],
  c: ColumnInfo | undefined,
  parse: (v: string) => T,
): T | null {
  if (!c) return null;
  for (const i of recs) {
    const raw = table.records[i].props[c.name];
    if (raw !== null && raw !== undefined && String(raw).trim() !== '') return parse(String(raw).trim());
  }
  return null;
}

function missingWarnings(
  arrays: ValueArrays,
  soilCols: ColumnInfo[],
  ids: string[],
  file: string,
  warnings: Warning[],
): void {
  for (const a of ANALYTES) {
    if (!soilCols.some((c) => c.role === a)) {
      warnings.push({
        code: 'missing-nutrient',
        file,
        field: a,
        message: `${file}: no ${ANALYTE_NAME[a]} column was found; ${ANALYTE_NAME[a]} is treated as not tested.`,
      });
      continue;
    }
    const miss = ids.filter((_, s) => Number.isNaN(arrays.values[a][s]));
    if (miss.length)
      warnings.push({
        code: 'missing-value',
        file,
        field: a,
        message: `${file}: ${miss.length} sample(s) have no ${ANALYTE_NAME[a]} value (${abbrev(miss)}).`,
      });
  }
}

/**
 * Shortens a list for a message.
 * @example abbrev(['a', 'b', 'c'], 2) // 'a, b and 1 more'
 */
export function abbrev(list: string[], max = 8): string {
  return list.length <= max
    ? list.join(', ')
    : `${list.slice(0, max).join(', ')} and ${list.length - max} more`;
}

/** Depth values without a unit: centimetre layers (bounds 15, 30, 60) or inches (6, 12, 24), by majority. */
function guessDepthUnit(records: RawRecord[], depthCol: ColumnInfo): 'in' | 'cm' {
  let cm = 0,
    inch = 0;
  for (const r of records) {
    const v = r.props[depthCol.name];
    if (v === null) continue;
    const m = /(\d+)\D+(\d+)/.exec(String(v));
    if (!m) continue;
    const b = Number(m[2]);
    if (b === 15 || b === 30 || b === 60 || b === 90) cm++;
    else if (b === 6 || b === 12 || b === 24) inch++;
  }
  return cm > inch ? 'cm' : 'in';
}
