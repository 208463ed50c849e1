/**
 * Every soil value of every sample: each cell parsed (censoring kept), given its depth (the row's depth column
 * beats a depth in the header), converted to the canonical unit, and the layers merged per sample. Cells that are
 * "not tested" marks are kept as refused (shown in the column reading); text that is no value fails with every
 * such cell named.
 */
import { UserError, type Warning } from '../errors.js';
import {
  ANALYTES,
  EXTRA_VALUES,
  type Analyte,
  type Censor,
  type ExtraValue,
  type LimeRating,
} from '../types.js';
import type { ColumnInfo, SoilValue, ValueUnit } from '../io/columns.js';
import { UNIT_LABEL } from '../io/columns.js';
import type { RawTable } from '../io/records.js';
import { checkRange, mergeLayers, SOIL_NAMES, toCanonical, type Layer, type LayerContext } from './layers.js';
import { parseLabValue } from './values.js';

export interface ValueArrays {
  values: Record<Analyte, Float64Array>;
  censored: Record<Analyte, Int8Array>;
  extra: Record<ExtraValue, Float64Array>;
  limeRating: (LimeRating | null)[];
  /** per column: cells read as "not tested" marks */
  refused: Map<string, { where: string; value: string }[]>;
}

export interface ValueInput {
  table: RawTable;
  ids: string[];
  groups: Map<string, number[]>;
  soilCols: (ColumnInfo & { role: SoilValue })[];
  recDepth: ([number, number] | null)[];
  depthCol: ColumnInfo | undefined;
  opts: { depthFactor?: number };
  warnings: Warning[];
}

/** "Not tested" marks labs print: read as no value, listed as refused. */
const NOT_TESTED =
  /^(-|--|n\/?a|na|nd|n\.d\.|not tested|nt|none|null|\.|qns|insufficient|x|\*|#value!|#n\/a)$/i;
const LIME: Record<string, LimeRating> = {
  none: 'none',
  nil: 'none',
  no: 'none',
  trace: 'none',
  n: 'none',
  low: 'low',
  slight: 'low',
  l: 'low',
  weak: 'low',
  medium: 'medium',
  moderate: 'medium',
  med: 'medium',
  m: 'medium',
  high: 'high',
  strong: 'high',
  'very high': 'high',
  excessive: 'high',
  h: 'high',
  vh: 'high',
};

/** What reading the cells gathers across samples, for the checks and warnings after. */
interface CellTally {
  bad: { where: string; column: string; value: unknown; id: string }[];
  /** columns read without a unit (ppm or dS/m assumed) */
  assumed: Set<string>;
  /** per column, the first unit printed in a cell, and where */
  cellUnits: Map<string, { unit: ValueUnit; where: string }>;
}

/**
 * Reads all soil values of all samples.
 * @example readSampleValues({ table, ids, groups, soilCols, recDepth, depthCol: undefined, opts: {}, warnings: [] }).values.p
 */
export function readSampleValues(inp: ValueInput): ValueArrays {
  const { table, ids, groups, opts, warnings } = inp;
  const out = emptyValues(ids.length);
  checkUnitsStated(table, inp.soilCols);
  const tally: CellTally = { bad: [], assumed: new Set(), cellUnits: new Map() };
  const all = ids.map((id, s) => {
    const layers: Partial<Record<SoilValue, Layer[]>> = {};
    for (const i of groups.get(id)!) readRecord(inp, i, id, s, layers, out, tally);
    return layers;
  });
  if (tally.bad.length) throw badValues(table.file, tally.bad);
  const factorUsed: Partial<Record<SoilValue, string[]>> = {};
  all.forEach((layers, s) => {
    for (const [role, list] of Object.entries(layers) as [SoilValue, Layer[]][]) {
      const m = mergeLayers(list, role, ids[s], table.file, opts.depthFactor);
      if (!m) continue;
      if (role === 'ec' || role === 'carbonate') out.extra[role][s] = m[0];
      else {
        out.values[role][s] = m[0];
        out.censored[role][s] = m[1] as Censor;
      }
      if (m[2]) (factorUsed[role] ??= []).push(ids[s]);
    }
  });
  noteWarnings(table.file, factorUsed, tally.assumed, inp.soilCols, opts.depthFactor, warnings);
  return out;
}

/** Every value NaN (not tested), nothing censored, no lime rating, nothing refused. */
function emptyValues(n: number): ValueArrays {
  const out: ValueArrays = {
    values: {} as ValueArrays['values'],
    censored: {} as ValueArrays['censored'],
    extra: {} as ValueArrays['extra'],
    limeRating: new Array(n).fill(null),
    refused: new Map(),
  };
  for (const a of ANALYTES) {
    out.values[a] = new Float64Array(n).fill(NaN);
    out.censored[a] = new Int8Array(n);
  }
  for (const e of EXTRA_VALUES) out.extra[e] = new Float64Array(n).fill(NaN);
  return out;
}

/** The soil cells of record `i` (sample `id`, index `s`) as layers; lime ratings, not-tested marks and bad cells aside. */
function readRecord(
  inp: ValueInput,
  i: number,
  id: string,
  s: number,
  layers: Partial<Record<SoilValue, Layer[]>>,
  out: ValueArrays,
  tally: CellTally,
): void {
  const { table, recDepth } = inp;
  const r = table.records[i];
  for (const c of inp.soilCols) {
    const raw = r.props[c.name] ?? null;
    if (c.role === 'carbonate' && typeof raw === 'string' && LIME[raw.trim().toLowerCase()]) {
      out.limeRating[s] ??= LIME[raw.trim().toLowerCase()];
      continue;
    }
    if (typeof raw === 'string' && NOT_TESTED.test(raw.trim())) {
      refuse(out, c.name, r.where, raw);
      continue;
    }
    const v = parseLabValue(raw);
    if (v === null) continue;
    if (v === 'bad') {
      tally.bad.push({ where: r.where, column: c.name, value: raw, id });
      continue;
    }
    const ctx: LayerContext = { file: table.file, id, record: r, column: c };
    checkRange(v, raw, ctx);
    const d = recDepth[i] ?? c.depth ?? defaultDepth(c, r.where, table.file);
    const unit = cellUnit(v.unit, c, tally.cellUnits, ctx) ?? c.unit;
    if (!unit && (c.role === 'p' || c.role === 'k' || c.role === 'ec')) tally.assumed.add(c.name);
    const list = (layers[c.role] ??= []);
    const dup = list.find((l) => l.top === d[0] && l.bottom === d[1]);
    if (dup) {
      throw new UserError(
        `${table.file}: sample id "${id}" has ${SOIL_NAMES[c.role]} for ${d[0]}-${d[1]} in twice (${dup.where} and ${r.where}). Fix: sample ids must be unique; give each sample its own id, or remove the repeated row.`,
        { file: table.file, where: r.where, value: id },
      );
    }
    list.push({
      top: d[0],
      bottom: d[1],
      value: toCanonical(v, unit, d, ctx),
      censor: v.censor,
      where: r.where,
    });
  }
}

/** Nitrate and sulphate need a stated unit (ppm and lb/ac differ by 2-6 times): refused with every column to map. */
function checkUnitsStated(table: RawTable, soilCols: (ColumnInfo & { role: SoilValue })[]): void {
  const file = table.file;
  const inCells = (c: ColumnInfo) =>
    table.records.some((r) => {
      const v = parseLabValue(r.props[c.name] ?? null);
      return v !== null && v !== 'bad' && v.unit;
    });
  for (const role of ['no3_n', 'so4_s'] as const) {
    const cs = soilCols.filter((c) => c.role === role);
    const missing = cs.filter((c) => !c.unit && !inCells(c));
    if (!missing.length) continue;
    const fix = cs
      .map(
        (c) =>
          `${role}=${c.name}:${c.unit ? UNIT_LABEL[c.unit] : 'ppm'}${c.depth && c.how?.includes('read as') ? `@${c.depth.join('-')}` : ''}`,
      )
      .join(',');
    throw new UserError(
      `${file}: column${missing.length > 1 ? 's' : ''} ${missing.map((c) => `"${c.name}"`).join(', ')} hold${missing.length > 1 ? '' : 's'} ${SOIL_NAMES[role]} but do${missing.length > 1 ? '' : 'es'} not say ${missing.length > 1 ? 'their' : 'its'} unit (ppm and lb/ac differ 2-6 times). ` +
        `Fix: state it with --columns "${fix}" (or :lb/ac, :kg/ha; map every ${role} column, the map replaces the header reading for ${role}).`,
      { file, field: missing[0].name },
    );
  }
}

function refuse(out: ValueArrays, column: string, where: string, value: string): void {
  const l = out.refused.get(column) ?? [];
  l.push({ where, value });
  out.refused.set(column, l);
}

/** A layer with no depth from the row or the header: P, K, OM, pH, EC, carbonate are 0-6 in; nitrate and sulphate must say. */
function defaultDepth(c: ColumnInfo & { role: SoilValue }, where: string, file: string): [number, number] {
  if (c.role !== 'no3_n' && c.role !== 'so4_s') return [0, 6];
  throw new UserError(
    `${file}: column "${c.name}" holds ${SOIL_NAMES[c.role]} but no depth is given (no depth in its header, no depth column on ${where}). ` +
      `Fix: add a depth column (e.g. "Depth (in)" with 0-6, 6-24), or give the depth with --columns "${c.role}=${c.name}@0-24".`,
    { file, where, field: c.name },
  );
}

/** A unit printed in the cell itself ("12 ppm"): must agree with the header and the rest of the column. */
function cellUnit(
  u: ValueUnit | undefined,
  c: ColumnInfo,
  seen: Map<string, { unit: ValueUnit; where: string }>,
  ctx: LayerContext,
): ValueUnit | null {
  if (!u) return null;
  const prev = seen.get(c.name);
  if ((c.unit && u !== c.unit) || (prev && prev.unit !== u)) {
    const r = ctx.record;
    throw new UserError(
      `${ctx.file} ${r.where} (sample "${ctx.id}"), column "${c.name}": "${r.props[c.name]}" is in ${UNIT_LABEL[u]}, but ${c.unit ? `the header says ${UNIT_LABEL[c.unit]}` : `${prev!.where} is in ${UNIT_LABEL[prev!.unit]}`}: mixed units in one column. ` +
        'Fix: convert the column to one unit (ppm or lb/ac) before loading.',
      { file: ctx.file, where: r.where, field: c.name, value: r.props[c.name] },
    );
  }
  if (!prev) seen.set(c.name, { unit: u, where: ctx.record.where });
  return u;
}

function badValues(
  file: string,
  bad: { where: string; column: string; value: unknown; id: string }[],
): UserError {
  if (bad.length === 1) {
    const b = bad[0];
    return new UserError(
      `${file} ${b.where} (sample "${b.id}"), column "${b.column}": "${b.value}" is not a number. Fix: enter the lab value (e.g. 12, <2 or >60), or leave the cell empty if it was not tested.`,
      { file, where: b.where, field: b.column, value: b.value },
    );
  }
  const list = bad
    .slice(0, 10)
    .map((b) => `${b.where} (sample "${b.id}"), column "${b.column}": "${b.value}"`)
    .join('; ');
  return new UserError(
    `${file}: ${bad.length} cell(s) are not numbers: ${list}${bad.length > 10 ? `; and ${bad.length - 10} more` : ''}. ` +
      'Fix: enter the lab value (e.g. 12, <2 or >60), or leave the cell empty if it was not tested.',
    { file, where: bad[0].where, field: bad[0].column, value: bad[0].value },
  );
}

function noteWarnings(
  file: string,
  factorUsed: Partial<Record<SoilValue, string[]>>,
  assumed: Set<string>,
  soilCols: ColumnInfo[],
  factor: number | undefined,
  warnings: Warning[],
): void {
  for (const [a, list] of Object.entries(factorUsed) as [SoilValue, string[]][]) {
    const shown =
      list.length <= 8 ? list.join(', ') : `${list.slice(0, 8).join(', ')} and ${list.length - 8} more`;
    warnings.push({
      code: 'depth-factor',
      file,
      field: a,
      message: `${file}: ${SOIL_NAMES[a]} was tested 0-6 in only for ${list.length} sample(s) (${shown}); multiplied by --depth-factor ${factor} to estimate 0-24 in.`,
    });
  }
  assumed.forEach((name) => {
    const ec = soilCols.find((c) => c.name === name)?.role === 'ec';
    warnings.push({
      code: 'unit-assumed',
      file,
      field: name,
      message: `${file}: column "${name}" states no unit; read as ${ec ? 'dS/m (= mmhos/cm)' : 'ppm (mg/kg)'}. If it is ${ec ? 'µS/cm' : 'lb/ac'}, say so with --columns.`,
    });
  });
}
