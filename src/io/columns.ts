/**
 * Which column (CSV header or GeoJSON property) holds what: automatic recognition of lab-style
 * headers ("NO3-N (lb/ac)", "P Olsen (ppm)", "so4_s_lbac_6_24", "Depth (in)") and a user column map
 * ("id=Sample,lat=Lat,no3_n=Nitrate:ppm"). One idea: a header becomes a role, a unit, a depth and a P method.
 */
import { UserError } from '../errors.js';
import type { Analyte, PMethod } from '../types.js';

export type Role = 'id' | 'lat' | 'lon' | 'depth' | 'zone' | 'texture' | 'pmethod' | Analyte;
export const ROLES: readonly Role[] = ['id', 'lat', 'lon', 'depth', 'zone', 'texture', 'pmethod', 'no3_n', 'p', 'k', 'so4_s', 'om', 'ph'];

/** Concentration units a column may hold. */
export type ValueUnit = 'ppm' | 'lbac' | 'kgha';
/** How a unit is written for people. */
export const UNIT_LABEL: Record<ValueUnit, string> = { ppm: 'ppm', lbac: 'lb/ac', kgha: 'kg/ha' };

export interface ColumnInfo {
  /** the column's name as in the file */
  name: string;
  role: Role;
  unit: ValueUnit | null;
  /** [top, bottom] in inches when the header names a depth */
  depth: [number, number] | null;
  pMethod: PMethod | null;
  /** "in" or "cm" when a depth column's header says so */
  depthUnit?: 'in' | 'cm' | null;
}

export interface ColumnMapEntry {
  role: Role;
  name: string;
  unit: ValueUnit | null;
}

/** A user column map: entries in the order given. Analyte keys may repeat (one column per depth). */
export type ColumnMap = ColumnMapEntry[];

/**
 * Parses a unit word; null when none is recognised.
 * @example parseUnit('lb/ac') // 'lbac'
 */
export function parseUnit(s: string): ValueUnit | null {
  const t = s.toLowerCase().replace(/\s+/g, '');
  if (/^(ppm|mg\/kg|mgkg|µg\/g|ug\/g)$/.test(t)) return 'ppm';
  if (/^(lb\/ac|lbac|lbs\/ac|lb\/acre|lbs\/acre|lb\/a)$/.test(t)) return 'lbac';
  if (/^(kg\/ha|kgha)$/.test(t)) return 'kgha';
  return null;
}

/**
 * Parses a column map such as `id=Sample ID,lat=Latitude,lon=Longitude,no3_n=Nitrate:ppm`.
 * Keys are roles (id, lat, lon, depth, zone, texture, pmethod, no3_n, p, k, so4_s, om, ph); a value may end in
 * `:ppm`, `:lb/ac` or `:kg/ha` to state its unit. Analyte keys may repeat for columns of different depths
 * (`no3_n=NO3 0-6:lb/ac,no3_n=NO3 6-24:lb/ac`); the depth then comes from each column's name.
 * @example parseColumnMap('id=Sample,p=P Olsen:ppm')[1] // { role: 'p', name: 'P Olsen', unit: 'ppm' }
 */
export function parseColumnMap(spec: string | undefined): ColumnMap {
  const out: ColumnMap = [];
  if (!spec || !spec.trim()) return out;
  for (const part of spec.split(',')) {
    const eq = part.indexOf('=');
    const key = (eq < 0 ? part : part.slice(0, eq)).trim().toLowerCase() as Role;
    if (eq < 0 || !ROLES.includes(key)) {
      throw new UserError(
        `option --columns: "${part.trim()}" is not KEY=COLUMN with KEY one of ${ROLES.join(', ')}. ` +
          'Fix: write e.g. --columns "id=Sample ID,lat=Latitude,lon=Longitude,p=P Olsen:ppm".',
      );
    }
    let name = part.slice(eq + 1).trim();
    let unit: ValueUnit | null = null;
    const colon = name.lastIndexOf(':');
    if (colon > 0) {
      const u = parseUnit(name.slice(colon + 1));
      if (u) { unit = u; name = name.slice(0, colon).trim(); }
    }
    if (!name) throw new UserError(`option --columns: "${part.trim()}" names no column. Fix: write ${key}=COLUMN NAME.`);
    const analyte = ['no3_n', 'p', 'k', 'so4_s'].includes(key);
    if (!analyte && out.some((e) => e.role === key)) throw new UserError(`option --columns: "${key}" is given twice. Fix: map ${key} to one column.`);
    out.push({ role: key, name, unit });
  }
  return out;
}

/** Lower-case words of a header with chemical names and units made into single tokens. */
function tokens(header: string): string[] {
  let h = ` ${header.toLowerCase().replace(/_/g, ' ')} `;
  h = h
    .replace(/no3[\s_-]*n|no3|nitrate[\s_-]*n/g, ' nitrate ')
    .replace(/so4[\s_-]*s|so4|sulph?ate[\s_-]*s|sulfate[\s_-]*s/g, ' sulphate ')
    .replace(/lbs?\s*\/\s*ac(re)?|\blbs? ac\b|\blbac\b|lbs?\s*\/\s*a\b/g, ' lbac ')
    .replace(/\blbs?\b/g, ' lbac ')
    .replace(/kg\s*\/\s*ha|\bkgha\b/g, ' kgha ')
    .replace(/mg\s*\/\s*kg|\bmgkg\b/g, ' ppm ')
    .replace(/%/g, ' pct ')
    .replace(/(\d)\s*-\s*(\d)/g, '$1 $2')
    .replace(/"/g, ' in ');
  return h.split(/[^a-z0-9.]+/).filter(Boolean);
}

/**
 * Recognises one header; null when it is not a column tilth reads (it is then ignored).
 * @example classifyHeader('NO3-N 0-6 (lb/ac)') // { role: 'no3_n', unit: 'lbac', depth: [0, 6], ... }
 */
export function classifyHeader(name: string): Omit<ColumnInfo, 'name'> | null {
  const t = tokens(name);
  const has = (...w: string[]) => w.some((x) => t.includes(x));
  let unit: ValueUnit | null = has('ppm') ? 'ppm' : has('lbac') ? 'lbac' : has('kgha') ? 'kgha' : null;
  const nums = t.map(Number).map((v, i) => (/^\d+(\.\d+)?$/.test(t[i]) ? v : NaN));
  let depth: [number, number] | null = null;
  for (let i = 0; i + 1 < nums.length; i++) {
    if (Number.isFinite(nums[i]) && Number.isFinite(nums[i + 1]) && nums[i + 1] > nums[i]) {
      const cm = t[i + 2] === 'cm' || has('cm');
      depth = cm ? [nums[i] / 2.5, nums[i + 1] / 2.5] : [nums[i], nums[i + 1]];
      break;
    }
  }
  const pm: PMethod | null = has('olsen', 'bicarb', 'bicarbonate', 'nahco3') ? 'olsen' : has('kelowna') ? 'kelowna' : null;
  let role: Role | null = null;
  if (has('method') && (has('p', 'phosphorus') || t.length === 1)) role = 'pmethod';
  else if (has('lat', 'latitude', 'y_lat')) role = 'lat';
  else if (has('lon', 'long', 'longitude', 'lng')) role = 'lon';
  else if (has('depth')) role = 'depth';
  else if (has('zone')) role = 'zone';
  else if (has('texture', 'textural')) role = 'texture';
  else if (has('nitrate')) role = 'no3_n';
  else if (has('sulphate', 'sulfate')) role = 'so4_s';
  else if (has('ph') && !has('p', 'phosphorus')) role = 'ph';
  else if (has('om', 'organic')) role = 'om';
  else if (has('p', 'phosphorus', 'olsen', 'kelowna') && !has('k2o', 'p2o5', 'pct')) role = 'p';
  else if (has('k', 'potassium') && !has('k2o')) role = 'k';
  else if (has('id', 'sample', 'sampleid', 'point', 'site') && !has('lab', 'date')) role = 'id';
  if (!role) return null;
  if (role === 'om' || role === 'ph') unit = null;
  return { role, unit, depth: role === 'depth' ? null : depth, pMethod: role === 'p' ? pm : null, depthUnit: role === 'depth' ? (has('cm') ? 'cm' : has('in', 'inch', 'inches') ? 'in' : null) : undefined };
}

/**
 * Decides the column plan for a file: the user's map first, then recognised headers.
 * Throws a UserError when a mapped column is missing or a role is claimed twice where it must be unique.
 * @param columns the file's column names
 * @example planColumns(['Sample','Latitude','Longitude','P Olsen (ppm)'], [], 'samples.csv')
 */
export function planColumns(columns: string[], map: ColumnMap, file: string): ColumnInfo[] {
  const plan: ColumnInfo[] = [];
  const mapped = new Set<string>();
  for (const e of map) {
    const role = e.role;
    const name = columns.find((c) => c === e.name) ?? columns.find((c) => c.trim().toLowerCase() === e.name.toLowerCase());
    if (name === undefined) {
      throw new UserError(
        `${file}: option --columns maps ${role} to "${e.name}", but there is no such column. ` +
          `Fix: use one of: ${columns.map((c) => `"${c}"`).join(', ')}.`,
        { file, field: e.name },
      );
    }
    const auto = classifyHeader(name);
    mapped.add(name);
    plan.push({
      name, role,
      unit: e.unit ?? (auto && (auto.role === role) ? auto.unit : null),
      depth: auto && role !== 'depth' ? auto.depth : null,
      pMethod: role === 'p' ? (auto?.pMethod ?? null) : null,
      depthUnit: role === 'depth' ? (auto?.depthUnit ?? null) : undefined,
    });
  }
  for (const c of columns) {
    if (mapped.has(c)) continue;
    const info = classifyHeader(c);
    if (!info || map.some((e) => e.role === info.role)) continue;
    plan.push({ name: c, ...info });
  }
  for (const role of ['id', 'lat', 'lon', 'depth', 'zone', 'texture', 'pmethod', 'om', 'ph'] as Role[]) {
    const cs = plan.filter((p) => p.role === role);
    if (cs.length > 1) {
      throw new UserError(
        `${file}: columns ${cs.map((c) => `"${c.name}"`).join(' and ')} both look like the ${role} column. ` +
          `Fix: say which one with --columns "${role}=${cs[0].name}".`,
        { file, field: cs[1].name },
      );
    }
  }
  return plan;
}
