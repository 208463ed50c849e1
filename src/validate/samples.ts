/**
 * From raw records (CSV rows or GeoJSON points) to samples: one per sampling location, depths merged,
 * values in tilth's canonical units (src/types.ts Analyte), censoring kept. Positions are not yet
 * projected or checked against the boundary (src/validate/inputs.ts does that).
 */
import { UserError, type Warning } from '../errors.js';
import { ANALYTES, type Analyte, type Censor, type PMethod, type Samples, type Texture } from '../types.js';
import { kghaToLbac, lbacToPpm, ppmToLbac } from '../units/index.js';
import { planColumns, UNIT_LABEL, type ColumnInfo, type ColumnMap, type Role, type ValueUnit } from '../io/columns.js';
import type { RawRecord, RawTable } from '../io/records.js';
import { parseLabValue } from './values.js';

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

export const ANALYTE_NAMES: Record<Analyte, string> = {
  no3_n: 'nitrate-N', p: 'P', k: 'K', so4_s: 'sulphate-S', om: 'organic matter', ph: 'pH',
};

const TEXTURES: Record<string, Texture> = {
  light: 'light', coarse: 'light', sand: 'light', 'loamy sand': 'light', 'sandy loam': 'light', l: 'light',
  medium: 'medium', loam: 'medium', 'silt loam': 'medium', silt: 'medium', 'sandy clay loam': 'medium', 'fine sandy loam': 'medium', m: 'medium',
  heavy: 'heavy', fine: 'heavy', clay: 'heavy', 'clay loam': 'heavy', 'silty clay': 'heavy', 'silty clay loam': 'heavy', 'sandy clay': 'heavy', 'heavy clay': 'heavy', h: 'heavy',
};

/**
 * Parses a texture class word (light/medium/heavy, or a soil texture class name); null when blank, 'bad' when unknown.
 * @example parseTexture('Clay Loam') // 'heavy'
 */
export function parseTexture(raw: unknown): Texture | null | 'bad' {
  if (raw === null || raw === undefined) return null;
  const s = String(raw).trim().toLowerCase().replace(/[\s_-]+/g, ' ');
  if (s === '') return null;
  return TEXTURES[s] ?? 'bad';
}

/**
 * Parses a depth interval such as "0-6", "6 - 24 in", "0-15 cm" into inches.
 * @param unit the depth column's unit from its header, if stated
 * @example parseDepth('15-60 cm', null) // [6, 24]
 */
export function parseDepth(raw: unknown, unit: 'in' | 'cm' | null | undefined): [number, number] | null {
  if (raw === null || raw === undefined) return null;
  const s = String(raw).trim().toLowerCase();
  const m = /^(\d+(?:\.\d+)?)\s*(?:-|to|–)\s*(\d+(?:\.\d+)?)\s*("|in|inch|inches|cm)?$/.exec(s);
  if (!m) return null;
  const a = Number(m[1]), b = Number(m[2]);
  if (!(b > a)) return null;
  const u = m[3] === 'cm' ? 'cm' : m[3] ? 'in' : unit ?? null;
  if (u === 'cm') return [a / 2.5, b / 2.5];
  return [a, b];
}

interface Layer { top: number; bottom: number; value: number; censor: Censor; where: string }

/**
 * Builds samples from a table of records.
 * @returns samples, warnings, and for each sample the index of its first record in the table
 * @throws UserError for anything that cannot be read unambiguously (see docs/method.md "Reading samples")
 * @example const { samples, warnings } = buildSamples(readCsvRecords(text, 'samples.csv', []), {});
 */
export function buildSamples(table: RawTable, opts: SampleOptions = {}): { samples: SamplesLonLat; warnings: Warning[]; firstRecord: number[] } {
  const file = table.file;
  const warnings: Warning[] = [];
  const plan = planColumns(table.columns, opts.map ?? [], file);
  const col = (role: Role) => plan.find((c) => c.role === role);
  const idCol = col('id'), depthCol = col('depth'), zoneCol = col('zone'), texCol = col('texture'), pmCol = col('pmethod');
  if (table.records.length === 0) {
    throw new UserError(`${file} holds no samples. Fix: check that the file is the lab results with one row (or point) per sample.`, { file });
  }

  // depth of each record from the depth column
  const depthUnit = depthCol?.depthUnit ?? guessDepthUnit(table.records, depthCol);
  const recDepth = table.records.map((r) => {
    if (!depthCol) return null;
    const raw = r.props[depthCol.name];
    if (raw === null || raw === undefined) return null;
    const d = parseDepth(raw, depthUnit);
    if (!d) {
      throw new UserError(
        `${file} ${r.where}, column "${depthCol.name}": "${raw}" is not a depth interval. Fix: write it as top-bottom, e.g. 0-6 or 6-24 (inches) or 0-15 cm.`,
        { file, where: r.where, field: depthCol.name, value: raw },
      );
    }
    return d;
  });

  // group records into samples by id
  if (!idCol && depthCol) {
    throw new UserError(`${file}: there is a depth column but no sample id column, so rows cannot be joined into samples. Fix: name it with --columns "id=YOUR ID COLUMN".`, { file });
  }
  if (!idCol) {
    warnings.push({ code: 'no-id-column', file, message: `${file}: no sample id column was recognised; samples are numbered in file order (1, 2, ...). Name it with --columns "id=COLUMN" if there is one.` });
  }
  const groups = new Map<string, number[]>();
  table.records.forEach((r, i) => {
    let id: string;
    if (idCol) {
      const raw = r.props[idCol.name];
      if (raw === null || String(raw).trim() === '') {
        throw new UserError(`${file} ${r.where}, column "${idCol.name}": the sample id is empty. Fix: give every row its sample id.`, { file, where: r.where, field: idCol.name });
      }
      id = String(raw).trim();
    } else id = String(i + 1);
    const g = groups.get(id);
    if (g) g.push(i); else groups.set(id, [i]);
  });

  const ids = [...groups.keys()];
  const n = ids.length;
  const lonlat = new Float64Array(2 * n);
  const values = {} as Record<Analyte, Float64Array>;
  const censored = {} as Record<Analyte, Int8Array>;
  for (const a of ANALYTES) { values[a] = new Float64Array(n).fill(NaN); censored[a] = new Int8Array(n); }
  const texture: (Texture | null)[] = new Array(n).fill(null);
  const zone: (string | null)[] = new Array(n).fill(null);
  const origin: string[] = [];

  // P method: from headers, a method column, and the option; never mixed
  const methods = new Map<PMethod, string>();
  for (const c of plan) if (c.role === 'p' && c.pMethod) methods.set(c.pMethod, `column "${c.name}"`);
  if (pmCol) {
    for (const r of table.records) {
      const raw = r.props[pmCol.name];
      if (raw === null) continue;
      const s = String(raw).toLowerCase();
      const m: PMethod | null = /olsen|bicarb/.test(s) ? 'olsen' : /kelowna/.test(s) ? 'kelowna' : null;
      if (!m) throw new UserError(`${file} ${r.where}, column "${pmCol.name}": "${raw}" is not a P method tilth knows. Fix: write Olsen or modified Kelowna.`, { file, where: r.where, field: pmCol.name, value: raw });
      if (!methods.has(m)) methods.set(m, `${r.where}`);
    }
  }
  if (methods.size > 1) {
    const [a, b] = [...methods.entries()];
    throw new UserError(
      `${file}: P was tested by two methods in one file (${a[0]} in ${a[1]}, ${b[0]} in ${b[1]}). Olsen and modified Kelowna results are not interchangeable (Kelowna reads about 10-50 % higher). ` +
        'Fix: split the file by method and run each field with its own method, or convert with a local calibration before loading.',
      { file, field: 'P method' },
    );
  }
  const pCols = plan.filter((c) => c.role === 'p');
  let pMethod: PMethod;
  const fileMethod = [...methods.keys()][0];
  if (fileMethod && opts.pMethod && fileMethod !== opts.pMethod) {
    throw new UserError(`${file}: the file says P is by the ${fileMethod} method (${methods.get(fileMethod)}), but the option says ${opts.pMethod}. Fix: drop the option or correct it.`, { file, field: 'P method' });
  }
  if (fileMethod) pMethod = fileMethod;
  else if (opts.pMethod) pMethod = opts.pMethod;
  else if (pCols.length > 0) {
    throw new UserError(
      `${file}: column "${pCols[0].name}" holds P but does not say the test method. Fix: add --p-method olsen or --p-method kelowna (or name the method in the header, e.g. "P Olsen (ppm)").`,
      { file, field: pCols[0].name },
    );
  } else pMethod = 'olsen'; // no P column: no P values, the method is moot

  const analyteCols = plan.filter((c) => (ANALYTES as readonly string[]).includes(c.role)) as (ColumnInfo & { role: Analyte })[];
  let assumedPpm = new Set<string>();
  /** per column: the first unit printed in its cells and where, to catch mixed units */
  const cellUnits = new Map<string, { unit: ValueUnit; where: string }>();
  const depthFactorUsed: Record<string, string[]> = {};

  ids.forEach((id, s) => {
    const recs = groups.get(id)!;
    const first = table.records[recs[0]];
    origin.push(recs.length === 1 ? `${file} ${first.where}` : `${file} ${first.where}-${table.records[recs[recs.length - 1]].where.replace(/^\D+/, '')}`);
    lonlat[2 * s] = first.lon;
    lonlat[2 * s + 1] = first.lat;
    for (const i of recs.slice(1)) {
      const r = table.records[i];
      if (Math.abs(r.lon - first.lon) > 5e-5 || Math.abs(r.lat - first.lat) > 5e-5) {
        throw new UserError(
          `${file}: sample id "${id}" is used twice, for two different places (${first.where}: ${first.lat}, ${first.lon}; ${r.where}: ${r.lat}, ${r.lon}). ` +
            'Fix: ids must be unique per sampling location; correct the id or the coordinates.',
          { file, where: r.where, field: idCol?.name, value: id },
        );
      }
    }
    // texture and zone: first non-empty, must agree
    for (const [c, setter] of [[texCol, (v: string) => {
      const t = parseTexture(v);
      if (t === 'bad') throw new UserError(`${file} sample "${id}", column "${texCol!.name}": "${v}" is not a texture class tilth knows. Fix: write light, medium or heavy (or a class such as sandy loam, loam, clay loam).`, { file, where: id, field: texCol!.name, value: v });
      texture[s] = t;
    }], [zoneCol, (v: string) => { zone[s] = v; }]] as const) {
      if (!c) continue;
      for (const i of recs) {
        const raw = table.records[i].props[c.name];
        if (raw !== null && String(raw).trim() !== '') { (setter as (v: string) => void)(String(raw).trim()); break; }
      }
    }
    // analyte layers
    const layers: Record<string, Layer[]> = {};
    for (const i of recs) {
      const r = table.records[i];
      for (const c of analyteCols) {
        const raw = r.props[c.name];
        const v = parseLabValue(raw === undefined ? null : raw);
        if (v === null) continue;
        if (v === 'bad') {
          throw new UserError(
            `${file} ${r.where} (sample "${id}"), column "${c.name}": "${raw}" is not a number. Fix: enter the lab value (e.g. 12, <2 or >60), or leave the cell empty if it was not tested.`,
            { file, where: r.where, field: c.name, value: raw },
          );
        }
        if (v.limit < 0) {
          throw new UserError(`${file} ${r.where} (sample "${id}"), column "${c.name}": ${raw} is negative; soil test values cannot be. Fix: correct the value or leave it empty.`, { file, where: r.where, field: c.name, value: raw });
        }
        if (c.role === 'ph' && (v.limit < 2 || v.limit > 12)) {
          throw new UserError(`${file} ${r.where} (sample "${id}"), column "${c.name}": pH ${raw} is outside any soil's range (2-12). Fix: check the column; is it pH?`, { file, where: r.where, field: c.name, value: raw });
        }
        if (c.role === 'om' && v.limit > 100) {
          throw new UserError(`${file} ${r.where} (sample "${id}"), column "${c.name}": organic matter ${raw} % is over 100 %. Fix: check the column and its unit.`, { file, where: r.where, field: c.name, value: raw });
        }
        const d = c.depth ?? recDepth[i] ?? (c.role === 'no3_n' || c.role === 'so4_s' ? null : ([0, 6] as [number, number]));
        if (!d) {
          throw new UserError(
            `${file}: column "${c.name}" holds ${ANALYTE_NAMES[c.role]} but no depth is given (no depth in its header, no depth column on ${r.where}). ` +
              'Fix: add a depth column (e.g. "Depth (in)" with 0-6, 6-24) or name the depth in the header, e.g. "NO3-N 0-24 (lb/ac)".',
            { file, where: r.where, field: c.name },
          );
        }
        let value = v.value;
        let unit = c.unit;
        if (v.unit) {
          const seen = cellUnits.get(c.name);
          if ((c.unit && v.unit !== c.unit) || (seen && seen.unit !== v.unit)) {
            throw new UserError(
              `${file} ${r.where} (sample "${id}"), column "${c.name}": "${raw}" is in ${UNIT_LABEL[v.unit]}, but ${c.unit ? `the header says ${UNIT_LABEL[c.unit]}` : `${seen!.where} is in ${UNIT_LABEL[seen!.unit]}`}: mixed units in one column. ` +
                'Fix: convert the column to one unit (ppm or lb/ac) before loading.',
              { file, where: r.where, field: c.name, value: raw },
            );
          }
          if (!seen) cellUnits.set(c.name, { unit: v.unit, where: r.where });
          unit = v.unit;
        }
        if (c.role === 'no3_n' || c.role === 'so4_s') {
          if (!unit) {
            throw new UserError(
              `${file}: column "${c.name}" does not say whether ${ANALYTE_NAMES[c.role]} is in ppm or lb/ac. Fix: add the unit to the header, e.g. "${c.name} (lb/ac)", or state it with --columns "${c.role}=${c.name}:ppm".`,
              { file, field: c.name },
            );
          }
          if (unit === 'ppm') value = ppmToLbac(value, d[0], d[1]);
          else if (unit === 'kgha') value = kghaToLbac(value);
        } else if (c.role === 'p' || c.role === 'k') {
          if (unit === 'lbac') value = lbacToPpm(value, d[0], d[1]);
          else if (unit === 'kgha') value = lbacToPpm(kghaToLbac(value), d[0], d[1]);
          else if (!unit) assumedPpm.add(c.name);
        }
        const key = c.role;
        const list = (layers[key] ??= []);
        const dup = list.find((l) => l.top === d[0] && l.bottom === d[1]);
        if (dup) {
          throw new UserError(
            `${file}: sample id "${id}" has ${ANALYTE_NAMES[c.role]} for ${d[0]}-${d[1]} in twice (${dup.where} and ${r.where}). Fix: sample ids must be unique; give each sample its own id, or remove the repeated row.`,
            { file, where: r.where, field: idCol?.name, value: id },
          );
        }
        list.push({ top: d[0], bottom: d[1], value, censor: v.censor, where: r.where });
      }
    }
    for (const a of ANALYTES) {
      const list = layers[a];
      if (!list || list.length === 0) continue;
      list.sort((x, y) => x.top - y.top || x.bottom - y.bottom);
      if (a === 'no3_n' || a === 'so4_s') {
        let depth = 0, sum = 0, cens: Censor = 0;
        for (const l of list) {
          if (l.top !== depth || depth >= 24) break;
          sum += l.value; depth = l.bottom;
          if (!cens && l.censor) cens = l.censor;
        }
        if (depth === 24) { values[a][s] = sum; censored[a][s] = cens; }
        else if (depth === 6) {
          if (opts.depthFactor === undefined) {
            throw new UserError(
              `${file}: sample "${id}" has ${ANALYTE_NAMES[a]} for 0-6 in only; tilth's rates are calibrated to 0-24 in. ` +
                'Fix: give the 6-24 in results, or give --depth-factor X (your lab\'s or agronomist\'s factor from 0-6 in to 0-24 in; there is no published default).',
              { file, where: id, field: a },
            );
          }
          values[a][s] = sum * opts.depthFactor; censored[a][s] = cens;
          (depthFactorUsed[a] ??= []).push(id);
        } else {
          throw new UserError(
            `${file}: sample "${id}" has ${ANALYTE_NAMES[a]} for ${list.map((l) => `${l.top}-${l.bottom}`).join(', ')} in, which does not make 0-24 in from the surface. ` +
              'Fix: give 0-6 and 6-24 in (or 0-24 in), or 0-6 in with --depth-factor.',
            { file, where: id, field: a },
          );
        }
      } else {
        const top = list.find((l) => l.top === 0);
        if (!top) {
          throw new UserError(`${file}: sample "${id}" has ${ANALYTE_NAMES[a]} only below the surface (${list[0].top}-${list[0].bottom} in). Fix: give the 0-6 in result.`, { file, where: id, field: a });
        }
        values[a][s] = top.value; censored[a][s] = top.censor;
      }
    }
  });

  for (const [a, list] of Object.entries(depthFactorUsed)) {
    warnings.push({
      code: 'depth-factor', file, field: a,
      message: `${file}: ${ANALYTE_NAMES[a as Analyte]} was tested 0-6 in only for ${list.length} sample(s) (${abbrev(list)}); multiplied by --depth-factor ${opts.depthFactor} to estimate 0-24 in.`,
    });
  }
  assumedPpm.forEach((name) => warnings.push({ code: 'unit-assumed', file, field: name, message: `${file}: column "${name}" states no unit; read as ppm (mg/kg). If it is lb/ac, say so with --columns.` }));
  assumedPpm = new Set();
  for (const a of ANALYTES) {
    if (!analyteCols.some((c) => c.role === a)) {
      warnings.push({ code: 'missing-nutrient', file, field: a, message: `${file}: no ${ANALYTE_NAMES[a]} column was found; ${ANALYTE_NAMES[a]} is treated as not tested.` });
      continue;
    }
    const miss = ids.filter((_, s) => Number.isNaN(values[a][s]));
    if (miss.length) warnings.push({ code: 'missing-value', file, field: a, message: `${file}: ${miss.length} sample(s) have no ${ANALYTE_NAMES[a]} value (${abbrev(miss)}).` });
  }
  return { samples: { ids, lonlat, values, censored, texture, zone, pMethod, origin }, warnings, firstRecord: ids.map((id) => groups.get(id)![0]) };
}

/**
 * Shortens a list for a message.
 * @example abbrev(['a', 'b', 'c'], 2) // 'a, b and 1 more'
 */
export function abbrev(list: string[], max = 8): string {
  return list.length <= max ? list.join(', ') : `${list.slice(0, max).join(', ')} and ${list.length - max} more`;
}

function guessDepthUnit(records: RawRecord[], depthCol: ColumnInfo | undefined): 'in' | 'cm' {
  if (!depthCol) return 'in';
  // centimetre layers used in the prairies: 0-15, 15-30, 15-60, 30-60, 0-60
  let cm = 0, inch = 0;
  for (const r of records) {
    const v = r.props[depthCol.name];
    if (v === null) continue;
    const m = /(\d+)\D+(\d+)/.exec(String(v));
    if (!m) continue;
    const b = Number(m[2]);
    if (b === 15 || b === 30 || b === 60) cm++;
    else if (b === 6 || b === 12 || b === 24) inch++;
  }
  return cm > inch ? 'cm' : 'in';
}
