/**
 * One lab header read as role + unit + depth + method, without confusing them: "pH (1:2)" is a pH by a
 * 1:2 soil:water extract, not a 1-2 in depth; "SO4-S 15-60 cm (ppm)" is sulphate-S in ppm for 15-60 cm;
 * "P (NaHCO3)" is Olsen P. The pieces are taken out of the header in a fixed order (units, ratios, method
 * words, chemical formulas, depths) so that what is left names the soil value.
 */
import type { Analyte, PMethod } from '../types.js';

/** Soil values tilth reads: the analytes used for rates, plus soluble salts (EC) and carbonate (free lime). */
export type SoilValue = Analyte | 'ec' | 'carbonate';
export const SOIL_VALUES: readonly SoilValue[] = ['no3_n', 'p', 'k', 'so4_s', 'om', 'ph', 'ec', 'carbonate'];

/**
 * What a column holds. `latlon` is "50.49, -102.01" in one column; `x` / `y` are easting / northing (or
 * longitude / latitude when the values are degrees and no --crs is given).
 */
export type Role =
  'id' | 'lat' | 'lon' | 'latlon' | 'x' | 'y' | 'depth' | 'zone' | 'texture' | 'pmethod' | SoilValue;
export const ROLES: readonly Role[] = [
  'id',
  'lat',
  'lon',
  'latlon',
  'x',
  'y',
  'depth',
  'zone',
  'texture',
  'pmethod',
  ...SOIL_VALUES,
];

/** Units a value column may state. */
export type ValueUnit = 'ppm' | 'lbac' | 'kgha' | 'pct' | 'dsm' | 'uscm' | 'meq100g';
/** How a unit is written for people. */
export const UNIT_LABEL: Record<ValueUnit, string> = {
  ppm: 'ppm',
  lbac: 'lb/ac',
  kgha: 'kg/ha',
  pct: '%',
  dsm: 'dS/m',
  uscm: 'µS/cm',
  meq100g: 'meq/100g',
};

/** What one header says. */
export interface HeaderReading {
  role: Role;
  unit: ValueUnit | null;
  /** the depth named in the header, as written ([top, bottom] in `depthUnit`, or unstated unit) */
  depth: [number, number] | null;
  /** unit of `depth`, or for a depth column the unit of its values; null when the header does not say */
  depthUnit: 'in' | 'cm' | null;
  /** the extraction / method named, for people: "Olsen", "1:2 water", "ammonium acetate", "CaCl2", "LOI" */
  method: string | null;
  /** P method when the header names one tilth's tables know */
  pMethod: PMethod | null;
}

const UNITS: [RegExp, ValueUnit][] = [
  [/\bmg\s*\/\s*kg\b|\bmg\s*kg-1\b|\bppm\b|[µu]g\s*\/\s*g\b|\bmgkg\b/g, 'ppm'],
  [/\blbs?\.?\s*\/\s*a(?:c(?:re)?)?\b\.?|\blbs?\s+ac\b|\blbac\b|\blbs?\b/g, 'lbac'],
  [/\bkg\s*\/\s*ha\b|\bkgha\b/g, 'kgha'],
  [/\bds\s*\/\s*m\b|\bmmhos?\s*\/\s*cm\b|\bms\s*\/\s*cm\b|\bdsm\b/g, 'dsm'],
  [/[µu]s\s*\/\s*cm\b|\bumhos?\s*\/\s*cm\b/g, 'uscm'],
  [/\bmeq\s*\/\s*100\s*g\b|\bcmol\s*(?:\(\+\)|c)?\s*\/\s*kg\b/g, 'meq100g'],
  [/%|\bpct\b|\bpercent\b/g, 'pct'],
];

/**
 * Parses a unit written alone (a cell of a units row, a `:unit` in --columns, a unit after a value).
 * @example parseUnit('lbs/A') // 'lbac'
 */
export function parseUnit(s: string): ValueUnit | null {
  const t = ` ${s
    .trim()
    .toLowerCase()
    .replace(/^\(|\)$/g, '')} `;
  for (const [re, unit] of UNITS) {
    const rest = t.replace(re, ' ').trim();
    if (rest === '' && re.test(t)) return unit;
  }
  return null;
}

/** Method words: [pattern, method for people, P method]. Order matters: longer names first. */
const METHODS: [RegExp, string, PMethod | null][] = [
  [/\b(?:modified|mod\.?)\s*kelowna\b|\bkelowna\b/g, 'modified Kelowna', 'kelowna'],
  [/\bsodium\s+bicarbonate\b|\bbicarbonate\b|\bbicarb\.?|\bnahco3\b|\bolsen\b/g, 'Olsen', 'olsen'],
  [/\bbray(?:[\s-]*p?\s*1)?\b/g, 'Bray', null],
  [/\bmehlich(?:[\s-]*(?:3|iii))?\b/g, 'Mehlich-3', null],
  [/\bammonium\s+acetate\b|\bamm\.?\s*acetate\b|\bnh4\s*-?\s*oac\b|\bnh4ac\b/g, 'ammonium acetate', null],
  [/\b(?:0\.01\s*m\s*)?cacl2?\b/g, 'CaCl2', null],
  [/\bsat(?:urated|\.)?\s*paste\b|\bpaste\b/g, 'saturated paste', null],
  [/\bwalkley[\s-]*black\b/g, 'Walkley-Black', null],
  [/\bloss\s+on\s+ignition\b/g, 'LOI', null],
];

/** Chemical formulas and spellings made into one word each (so their digits are not read as depths). */
const WORDS: [RegExp, string][] = [
  [/\bo\.\s*m\.?|\bo\/m\b/g, ' om '],
  [/\be\.\s*c\.?/g, ' ec '],
  [/\bno3\s*-?\s*n\b|\bno3\b|\bnitrate\s*-?\s*n\b|\bnitrate\s+nitrogen\b/g, ' nitrate '],
  [/\bso4\s*-?\s*s\b|\bso4\b|\bsul(?:ph|f)ate\s*-?\s*s\b|\bsul(?:ph|f)ate\s+sul(?:ph|f)ur\b/g, ' sulphate '],
  [/\bnh4\s*-?\s*n\b|\bnh4\b(?!\s*-?\s*o?ac)/g, ' ammonium '],
  [/\bpo4\s*-?\s*p\b/g, ' p '],
  [/\bcaco3\b/g, ' carbonate '],
  [/\bp2o5\b/g, ' oxide '],
  [/\bk2o\b/g, ' oxide '],
  [/\bh2o\b/g, ' water '],
  [/\bsoil\s+water\b/g, ' water '],
];

/** Words that make a column something tilth does not read (recommendations, ratings, other tests). */
const IGNORE = new Set([
  'rec',
  'recs',
  'recommend',
  'recommended',
  'recommendation',
  'applied',
  'apply',
  'target',
  'buffer',
  'smp',
  'saturation',
  'sat',
  'requirement',
  'oxide',
  'ammonium',
  'total',
  'carbon',
  'cec',
  'rating',
  'date',
  'lab',
  'grower',
  'farm',
  'client',
  'customer',
  'crop',
  'report',
  'invoice',
  'order',
  'field',
  'comment',
  'comments',
  'notes',
  'note',
  'ca',
  'mg',
  'na',
  'cu',
  'zn',
  'fe',
  'mn',
  'b',
  'cl',
  'chloride',
  'boron',
  'copper',
  'zinc',
  'iron',
  'manganese',
  'calcium',
  'magnesium',
  'sodium',
]);

/** Takes every match of `re` out of `s`; returns the text left and the matches. */
function take(s: string, re: RegExp): [string, RegExpMatchArray[]] {
  const found = [...s.matchAll(re)];
  return [found.length ? s.replace(re, ' ') : s, found];
}

/**
 * Splits a header into its stated unit, ratio/method, depth and remaining name words (whatever its role).
 * @example headerPieces('NO3 0-15 cm ppm').depth // [0, 15]
 */
export function headerPieces(header: string) {
  let s = ` ${header
    .toLowerCase()
    .replace(/[_\s]+/g, ' ')
    .replace(/[″“”]/g, '"')
    .replace(/µ/g, 'u')} `;
  s = s.replace(/\b(no3|so4)(?=lbs?\b|ppm\b|kg)/g, '$1 ');
  for (const [re, w] of WORDS) s = s.replace(re, w);
  let unit: ValueUnit | null = null;
  for (const [re, u] of UNITS) {
    const [rest, m] = take(s, re);
    if (m.length && !unit) unit = u;
    s = rest;
  }
  const methods: string[] = [];
  let pMethod: PMethod | null = null;
  const [r1, ratio] = take(s, /\(?\s*\b1\s*:\s*(\d+(?:\.\d+)?)\s*\)?(?:\s*(water|w|cacl2?|paste)\b)?/g);
  s = r1;
  for (const [re, name, pm] of METHODS) {
    const [rest, m] = take(s, re);
    if (!m.length) continue;
    s = rest;
    if (!methods.some((x) => x.includes(name))) methods.push(name);
    if (pm && !pMethod) pMethod = pm;
  }
  const cacl = methods.includes('CaCl2');
  for (const m of ratio.reverse())
    methods.unshift(
      `1:${m[1]} ${cacl || (m[2] && /^cacl/.test(m[2])) ? 'CaCl2' : m[2] === 'paste' ? 'paste' : 'water'}`,
    );
  if (ratio.length && cacl) methods.splice(methods.indexOf('CaCl2'), 1);
  const [r2, d] = take(
    s,
    /(\d+(?:\.\d+)?)\s*(?:-|–|to|\s)\s*(\d+(?:\.\d+)?)\s*("|''|\bin\b\.?|\binch(?:es)?\b|\bcm\b)?/g,
  );
  s = r2;
  let depth: [number, number] | null = null;
  let depthUnit: 'in' | 'cm' | null = null;
  if (d.length && Number(d[0][2]) > Number(d[0][1])) {
    depth = [Number(d[0][1]), Number(d[0][2])];
    depthUnit = d[0][3] ? (d[0][3] === 'cm' ? 'cm' : 'in') : null;
  }
  const words = s.split(/[^a-z0-9#]+/).filter(Boolean);
  if (!depthUnit && words.includes('cm')) depthUnit = 'cm';
  if (
    !depthUnit &&
    (words.includes('in') || words.includes('inches') || words.includes('inch') || /"/.test(s))
  )
    depthUnit = 'in';
  return {
    unit,
    methods,
    pMethod,
    depth,
    depthUnit,
    words: words.filter((w) => !['in', 'inch', 'inches', 'cm', 'm'].includes(w)),
  };
}

/** The role the name words give; null when the column is not one tilth reads. */
function roleOf(w: string[], methods: string[], pMethod: PMethod | null): Role | null {
  const has = (...x: string[]) => x.some((v) => w.includes(v));
  const alone = (...x: string[]) =>
    has(...x) &&
    w.every(
      (v) =>
        x.includes(v) ||
        [
          'avail',
          'available',
          'extractable',
          'exch',
          'exchangeable',
          'soil',
          'test',
          'level',
          'value',
          'result',
        ].includes(v),
    );
  if (has('method') && (has('p', 'phosphorus') || w.length === 1)) return 'pmethod';
  if (has('depth', 'layer', 'horizon')) return has('field', 'date') ? null : 'depth';
  if (has('lat', 'latitude') && has('lon', 'long', 'longitude', 'lng')) return 'latlon';
  if (has('coordinates', 'coords', 'gps', 'location', 'position', 'latlon', 'latlong')) return 'latlon';
  if (has('lat', 'latitude')) return 'lat';
  if (has('lon', 'long', 'longitude', 'lng')) return 'lon';
  if (has('easting') || (has('utm') && has('e', 'east', 'x')) || alone('x')) return 'x';
  if (has('northing') || (has('utm') && has('n', 'north', 'y')) || alone('y')) return 'y';
  if (has('carbonate', 'carbonates', 'lime', 'cce') && !has('requirement', 'rec', 'recommended', 'applied'))
    return 'carbonate';
  if (w.some((v) => IGNORE.has(v))) return null;
  if (has('zone')) return 'zone';
  if (has('texture', 'textural')) return 'texture';
  if (has('ec', 'conductivity', 'salts', 'salt', 'salinity', 'cond')) return 'ec';
  if (has('nitrate') || alone('n', 'nitrogen')) return 'no3_n';
  if (has('sulphate', 'sulfate') || alone('s', 'sulphur', 'sulfur')) return 'so4_s';
  if (has('ph')) return 'ph';
  if (has('om', 'loi', 'orgmatter') || (has('organic', 'org') && !has('c'))) return 'om';
  if (methods.includes('LOI')) return 'om';
  if (
    alone('p', 'phosphorus', 'phos', 'phosphate') ||
    (w.length === 0 && (pMethod || methods.includes('Bray') || methods.includes('Mehlich-3')))
  )
    return 'p';
  if (alone('k', 'potassium', 'pot')) return 'k';
  if (has('sample', 'id', 'site', 'point', 'plot', 'sampleid', '#') && !has('type', 'size')) return 'id';
  return null;
}

/**
 * Reads one header; null when it is not a column tilth reads (it is then ignored and listed as such).
 * @example classifyHeader('pH (1:2)') // { role: 'ph', method: '1:2 water', depth: null, ... }
 * @example classifyHeader('SO4-S 15-60 cm (ppm)') // { role: 'so4_s', unit: 'ppm', depth: [15, 60], depthUnit: 'cm', ... }
 * @example classifyHeader('P (NaHCO3)') // { role: 'p', pMethod: 'olsen', method: 'Olsen', ... }
 */
export function classifyHeader(name: string): HeaderReading | null {
  const p = headerPieces(name);
  const role = roleOf(p.words, p.methods, p.pMethod);
  if (!role) return null;
  const soil = (SOIL_VALUES as readonly string[]).includes(role);
  if (p.words.includes('loi') && !p.methods.includes('LOI')) p.methods.push('LOI');
  const method = p.methods.length ? p.methods.join(', ') : null;
  if (role === 'depth')
    return { role, unit: null, depth: null, depthUnit: p.depthUnit, method: null, pMethod: null };
  return {
    role,
    unit: soil && role !== 'ph' ? p.unit : null,
    depth: soil ? p.depth : null,
    depthUnit: soil ? p.depthUnit : null,
    method: soil ? method : null,
    pMethod: role === 'p' ? p.pMethod : null,
  };
}

/**
 * True when a cell of a second header row only states units, methods or depths ("ppm", "(1:2)", "0-6\"").
 * @example isHeaderNote('lb/ac') // true
 */
export function isHeaderNote(cell: string): boolean {
  const c = cell.trim();
  if (c === '') return true;
  if (/^[<>]?\s*[-+]?\d+([.,]\d+)?$/.test(c)) return false;
  const p = headerPieces(c);
  return (
    p.words.every((w) => w === 'units' || w === 'unit') &&
    (p.unit !== null || p.methods.length > 0 || p.depth !== null || p.depthUnit !== null)
  );
}
