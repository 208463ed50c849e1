/**
 * Which column (CSV / spreadsheet header or GeoJSON / shapefile property) holds what: the user's column map
 * (`--columns`, always first), then recognised headers (src/io/headers.ts), with a second header row's units
 * and methods. One idea: the file's columns become a column plan, each entry saying how it was decided.
 */
import { UserError } from '../errors.js';
import type { PMethod } from '../types.js';
import {
  classifyHeader,
  headerPieces,
  parseUnit,
  ROLES,
  SOIL_VALUES,
  UNIT_LABEL,
  type Role,
  type SoilValue,
  type ValueUnit,
} from './headers.js';

export { classifyHeader, parseUnit, ROLES, SOIL_VALUES, UNIT_LABEL };
export type { Role, SoilValue, ValueUnit };

export interface ColumnInfo {
  /** the column's name as in the file */
  name: string;
  role: Role;
  unit: ValueUnit | null;
  /** [top, bottom] in inches when the header (or the map) names a depth */
  depth: [number, number] | null;
  pMethod: PMethod | null;
  /** method / extraction for people ("1:2 water", "Olsen", "ammonium acetate"), if stated */
  method?: string | null;
  /** for a depth column: the unit of its values when its header says so */
  depthUnit?: 'in' | 'cm' | null;
  /** how the reading was decided, for people: "header", "header + second row", "column map" */
  how?: string;
}

export interface ColumnMapEntry {
  role: Role;
  name: string;
  unit: ValueUnit | null;
  /** depth given with `@0-6` (inches unless `cm`), converted to inches */
  depth?: [number, number] | null;
}

/** A user column map: entries in the order given. Soil-value keys may repeat (one column per depth). */
export type ColumnMap = ColumnMapEntry[];

const UNIQUE: Role[] = ['id', 'lat', 'lon', 'latlon', 'x', 'y', 'depth', 'zone', 'texture', 'pmethod'];

/**
 * Parses a depth interval such as "0-6", "6 - 24 in", "0-15 cm", "0-6\"" into inches (cm / 2.5, so the prairie
 * layers 0-15 and 15-60 cm are 0-6 and 6-24 in).
 * @param unit the unit when the text does not say (a depth column's header); null: inches
 * @example parseDepthText('15-60 cm', null) // [6, 24]
 */
export function parseDepthText(raw: unknown, unit: 'in' | 'cm' | null | undefined): [number, number] | null {
  if (raw === null || raw === undefined) return null;
  const s = String(raw).trim().toLowerCase();
  const m = /^(\d+(?:\.\d+)?)\s*(?:-|to|–)\s*(\d+(?:\.\d+)?)\s*("|''|in\.?|inch|inches|cm)?$/.exec(s);
  if (!m) return null;
  const a = Number(m[1]),
    b = Number(m[2]);
  if (!(b > a)) return null;
  const u = m[3] === 'cm' ? 'cm' : m[3] ? 'in' : (unit ?? null);
  return u === 'cm' ? [a / 2.5, b / 2.5] : [a, b];
}

/** Splits a --columns text at commas outside double quotes. */
function splitMap(spec: string): string[] {
  const parts: string[] = [];
  let cur = '',
    q = false;
  for (const c of spec) {
    if (c === '"') q = !q;
    else if (c === ',' && !q) {
      parts.push(cur);
      cur = '';
    } else cur += c;
  }
  parts.push(cur);
  return parts.filter((p) => p.trim() !== '');
}

/**
 * Parses a column map such as `id=Sample ID,lat=Latitude,lon=Longitude,no3_n=Nitrate:ppm,ph=pH (1:2)@0-6`.
 * Keys are roles (see ROLES); a value may end in `:UNIT` (ppm, lb/ac, kg/ha, %, dS/m, meq/100g) and `@TOP-BOTTOM`
 * (inches, or `@0-15cm`); a name holding a comma is quoted: `latlon="Lat, Lon"`. Soil-value keys may repeat for
 * columns of different depths. The map always wins over header recognition, for CSV, spreadsheets, GeoJSON and
 * shapefile properties.
 * @example parseColumnMap('id=Sample,p=P Olsen:ppm')[1] // { role: 'p', name: 'P Olsen', unit: 'ppm', depth: null }
 */
export function parseColumnMap(spec: string | undefined): ColumnMap {
  const out: ColumnMap = [];
  if (!spec || !spec.trim()) return out;
  for (const part of splitMap(spec)) {
    const eq = part.indexOf('=');
    const key = (eq < 0 ? part : part.slice(0, eq)).trim().toLowerCase() as Role;
    if (eq < 0 || !ROLES.includes(key)) {
      throw new UserError(
        `option --columns: "${part.trim()}" is not KEY=COLUMN with KEY one of ${ROLES.join(', ')}. ` +
          'Fix: write e.g. --columns "id=Sample ID,lat=Latitude,lon=Longitude,p=P Olsen:ppm".',
      );
    }
    let name = part.slice(eq + 1).trim();
    let depth: [number, number] | null = null;
    const at = name.lastIndexOf('@');
    if (at > 0) {
      depth = parseDepthText(name.slice(at + 1).replace(/\s+/g, ' '), 'in');
      if (!depth)
        throw new UserError(
          `option --columns: "${part.trim()}": "${name.slice(at + 1)}" is not a depth. Fix: write it as @0-6 (inches) or @0-15cm.`,
        );
      name = name.slice(0, at).trim();
    }
    let unit: ValueUnit | null = null;
    const colon = name.lastIndexOf(':');
    if (colon > 0) {
      const u = parseUnit(name.slice(colon + 1));
      if (u) {
        unit = u;
        name = name.slice(0, colon).trim();
      }
    }
    name = name.replace(/^"(.*)"$/, '$1');
    if (!name)
      throw new UserError(
        `option --columns: "${part.trim()}" names no column. Fix: write ${key}=COLUMN NAME.`,
      );
    if (UNIQUE.includes(key) && out.some((e) => e.role === key))
      throw new UserError(`option --columns: "${key}" is given twice. Fix: map ${key} to one column.`);
    out.push({ role: key, name, unit, depth });
  }
  return out;
}

/** Header depth in inches: a stated unit, else the file's depth unit, else by the layer bounds prairie labs use. */
function headerDepthInches(
  d: [number, number],
  unit: 'in' | 'cm' | null,
  fileUnit: 'in' | 'cm' | null,
): { depth: [number, number]; note: string } {
  let u = unit ?? fileUnit;
  let note = '';
  if (!u) {
    u = [15, 30, 45, 60, 90, 120].includes(d[1]) && ![6, 12, 18, 24, 36, 48].includes(d[1]) ? 'cm' : 'in';
    note = ` (read as ${u}: no unit stated, ${d[1]} is a usual ${u === 'cm' ? 'centimetre' : 'inch'} layer bound)`;
  }
  return { depth: u === 'cm' ? [d[0] / 2.5, d[1] / 2.5] : d, note };
}

/**
 * Decides the column plan for a file: the user's map first, then recognised headers.
 * @param columns the file's column names
 * @param notes per column, a second header row's text (units, methods, depths), if the file has one
 * @throws UserError when a mapped column is missing or a role is claimed by two columns where it must be unique
 * @example planColumns(['Sample','Latitude','Longitude','P Olsen (ppm)'], [], 'samples.csv')
 */
export function planColumns(
  columns: string[],
  map: ColumnMap,
  file: string,
  notes?: (string | null)[],
): ColumnInfo[] {
  const plan: ColumnInfo[] = [];
  const mapped = new Set<string>();
  const text = (i: number) => (notes?.[i] ? `${columns[i]} ${notes[i]}` : columns[i]);
  const how = (i: number) => (notes?.[i] ? 'header + second row' : 'header');
  const fileUnit = columns.some((c, i) => headerPieces(text(i)).depthUnit === 'cm') ? 'cm' : null;
  for (const e of map) {
    const i =
      columns.findIndex((c) => c === e.name) >= 0
        ? columns.findIndex((c) => c === e.name)
        : columns.findIndex((c) => c.trim().toLowerCase() === e.name.toLowerCase());
    if (i < 0) {
      throw new UserError(
        `${file}: option --columns maps ${e.role} to "${e.name}", but there is no such column. Fix: use one of: ${columns.map((c) => `"${c}"`).join(', ')}.`,
        { file, field: e.name },
      );
    }
    const name = columns[i];
    const p = headerPieces(text(i));
    const hd = p.depth && !e.depth ? headerDepthInches(p.depth, p.depthUnit, fileUnit) : null;
    mapped.add(name);
    plan.push({
      name,
      role: e.role,
      unit: e.unit ?? (e.role === 'ph' ? null : p.unit),
      depth: e.role === 'depth' ? null : (e.depth ?? hd?.depth ?? null),
      pMethod: e.role === 'p' ? (classifyHeader(text(i))?.pMethod ?? p.pMethod) : null,
      method: p.methods.length ? p.methods.join(', ') : null,
      depthUnit: e.role === 'depth' ? p.depthUnit : undefined,
      how: `column map${e.unit ? '' : p.unit ? ', unit from header' : ''}${e.depth ? ', depth from map' : hd ? `, depth from header${hd.note}` : ''}`,
    });
  }
  columns.forEach((c, i) => {
    if (mapped.has(c)) return;
    const info = classifyHeader(text(i));
    if (!info || map.some((e) => e.role === info.role)) return;
    const hd = info.depth ? headerDepthInches(info.depth, info.depthUnit, fileUnit) : null;
    plan.push({
      name: c,
      role: info.role,
      unit: info.unit,
      depth: hd?.depth ?? null,
      pMethod: info.pMethod,
      method: info.method,
      depthUnit: info.role === 'depth' ? info.depthUnit : undefined,
      how: how(i) + (hd?.note ?? ''),
    });
  });
  return resolveDuplicates(plan, file);
}

/** Preferred unit when a lab prints one value in two units (first preferred). */
const PREFERRED: Partial<Record<Role, (ValueUnit | null)[]>> = {
  no3_n: ['lbac', 'kgha', 'ppm', null],
  so4_s: ['lbac', 'kgha', 'ppm', null],
  p: ['ppm', null, 'lbac', 'kgha'],
  k: ['ppm', null, 'meq100g', 'lbac', 'kgha'],
};

/**
 * Where two columns claim one thing: unique roles are refused with the --columns fix; a soil value printed twice
 * (in two units, or pH in water and in CaCl2, or P by a method tilth has no tables for) keeps the one tilth uses.
 */
function resolveDuplicates(plan: ColumnInfo[], file: string): ColumnInfo[] {
  for (const role of UNIQUE) {
    const cs = plan.filter((p) => p.role === role);
    if (cs.length > 1) {
      throw new UserError(
        `${file}: columns ${cs.map((c) => `"${c.name}"`).join(' and ')} both look like the ${role} column (ambiguous). ` +
          `Fix: say which one with --columns "${role}=${cs[0].name}".`,
        { file, field: cs[1].name },
      );
    }
  }
  const dropped = new Set<ColumnInfo>();
  for (const role of SOIL_VALUES) {
    const cs = plan.filter((p) => p.role === role && !p.how?.startsWith('column map'));
    const groups = new Map<string, ColumnInfo[]>();
    for (const c of cs) {
      const k = c.depth ? c.depth.join('-') : '';
      groups.set(k, [...(groups.get(k) ?? []), c]);
    }
    for (const g of groups.values()) {
      if (g.length < 2) continue;
      const rank = (c: ColumnInfo) => {
        if (role === 'ph') return /CaCl2/.test(c.method ?? '') ? 1 : 0;
        if (role === 'p' && !c.pMethod && c.method) return 9;
        return (PREFERRED[role] ?? [null]).indexOf(c.unit) + 0;
      };
      const sorted = [...g].sort((a, b) => rank(a) - rank(b));
      if (rank(sorted[0]) === rank(sorted[1]) && !(role === 'p' && sorted[0].pMethod !== sorted[1].pMethod)) {
        throw new UserError(
          `${file}: columns ${g.map((c) => `"${c.name}"`).join(' and ')} both look like ${role}${g[0].depth ? ` for ${g[0].depth.join('-')} in` : ''} (ambiguous). ` +
            `Fix: say which one with --columns "${role}=${g[0].name}".`,
          { file, field: g[1].name },
        );
      }
      if (role === 'p' && sorted[0].pMethod && sorted[1].pMethod) continue; // two methods: refused with its own message
      for (const c of sorted.slice(1)) dropped.add(c);
    }
  }
  return plan.map((c) => (dropped.has(c) ? { ...c, how: `${c.how}; not used: ${why(c, plan)}` } : c));
}

function why(c: ColumnInfo, plan: ColumnInfo[]): string {
  const kept = plan.find(
    (p) => p !== c && p.role === c.role && (p.depth?.join('-') ?? '') === (c.depth?.join('-') ?? ''),
  );
  if (c.role === 'ph') return `tilth uses pH in water ("${kept?.name}")`;
  if (c.role === 'p' && !c.pMethod)
    return `tilth's P tables are for Olsen or modified Kelowna ("${kept?.name}")`;
  return `the same value in ${c.unit ? UNIT_LABEL[c.unit] : 'no stated unit'}; "${kept?.name}" is used`;
}

/**
 * True when a plan entry is used (not set aside by resolveDuplicates).
 * @example planColumns(cols, [], 'f.csv').filter(isUsed)
 */
export const isUsed = (c: ColumnInfo): boolean => !/; not used: /.test(c.how ?? '');
