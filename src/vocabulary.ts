/**
 * tilth's words, written down once. Read this before naming anything.
 *
 * - **analyte = soil test, nutrient = N/P2O5/K2O/S.** An analyte is a soil test value: nitrate-N, P, K,
 *   sulphate-S, organic matter, pH (`Analyte`, src/types.ts), in its canonical unit (ppm, lb/ac, %). A nutrient
 *   is what a fertilizer supplies and a rate is given in: N, P2O5, K2O, S (`Nutrient`, below).
 *   A surface is an analyte map; a target is a nutrient rate. Old names that mix the two (`nutrientSurface`,
 *   the `--nutrient` flag naming an analyte) are kept where they are public, and new code follows this rule.
 * - Every analyte, nutrient and placement name a person reads comes from the maps below (`ANALYTE_NAME`,
 *   `ANALYTE_LABEL`, `ANALYTE_DEPTH_LABEL`, `ANALYTE_SAMPLED`, `ANALYTE_UNIT`, `NUTRIENT_NAME`,
 *   `PLACEMENT_NAME`, `placementName`, `PLACEMENT_KIND_NAME`); never write a local map of them.
 * - **placement** = where a product goes: seed_row, side_band, mid_row_band, broadcast (`PLACEMENTS`).
 * - **rate column** = `<product stem>_<unit>` with unit lbac, kgha, galac or lha (src/prescription/shapefiles.ts
 *   `RX_UNITS`; `tilth check` finds rate columns by the same suffixes).
 * - **warning code** = lower-case words joined by hyphens, naming the finding, not the fix: `outside-boundary`,
 *   `same-place`, `few-samples`; a stage after the input check puts its name first: `surface-few-samples`,
 *   `variability-no-fit`, `soil-saline`, `zones-min-area-below-sample` (`Warning.code`, src/errors.ts).
 * - **grid** = the one grid geometry: cell size, north-west corner (`xmin`, `ymax`), `cols` x `rows`, row-major,
 *   north-up (`Grid`, src/types.ts); every per-cell array has this layout.
 * - Unit conversion factors live only in src/units/; machine settings with a unit (`8mph`, `18m`) are read there
 *   too (`parseSpeed`, `parseLength`).
 */
import { ANALYTES, type Analyte } from './types.js';

/** Where a product goes: in the seed row, a side or mid-row band, or broadcast. */
export const PLACEMENTS = ['seed_row', 'side_band', 'mid_row_band', 'broadcast'] as const;
export type Placement = (typeof PLACEMENTS)[number];
/** The nutrients a product supplies, as the tables name them (N, P2O5, K2O, S). */
export const NUTRIENTS = ['n', 'p2o5', 'k2o', 's'] as const;
export type Nutrient = (typeof NUTRIENTS)[number];

/** One analyte's words. */
export interface AnalyteTerms {
  /** in messages and tables: "P", "sulphate-S" */
  short: string;
  /** written out: "phosphorus", "sulphate-S" */
  name: string;
  /** the depth sampled */
  depth: string;
  /** the canonical unit of the values in `Samples` ('' for pH) */
  unit: string;
  /** the unit naming the element, for charts: "lb S/ac" ("pH" for pH) */
  amount: string;
}

/** Each analyte's words: the one table every label below is made from. */
export const ANALYTE_TERMS: Readonly<Record<Analyte, AnalyteTerms>> = {
  no3_n: { short: 'nitrate-N', name: 'nitrate-N', depth: '0-24 in', unit: 'lb/ac', amount: 'lb N/ac' },
  p: { short: 'P', name: 'phosphorus', depth: '0-6 in', unit: 'ppm', amount: 'ppm' },
  k: { short: 'K', name: 'potassium', depth: '0-6 in', unit: 'ppm', amount: 'ppm' },
  so4_s: { short: 'sulphate-S', name: 'sulphate-S', depth: '0-24 in', unit: 'lb/ac', amount: 'lb S/ac' },
  om: { short: 'organic matter', name: 'organic matter', depth: '0-6 in', unit: '%', amount: '%' },
  ph: { short: 'pH', name: 'pH', depth: '0-6 in', unit: '', amount: 'pH' },
};

/** The topsoil depth most analytes are sampled at; labels name a depth only when it differs. */
const TOPSOIL = '0-6 in';

function byAnalyte(word: (t: AnalyteTerms, a: Analyte) => string): Readonly<Record<Analyte, string>> {
  return Object.fromEntries(ANALYTES.map((a) => [a, word(ANALYTE_TERMS[a], a)])) as Record<Analyte, string>;
}

/** Short name, for messages. @example ANALYTE_NAME.so4_s // 'sulphate-S' */
export const ANALYTE_NAME = byAnalyte((t) => t.short);

/**
 * Short name with the canonical unit, and the depth where it is not the topsoil's, for maps and tables.
 * @example ANALYTE_LABEL.no3_n // 'nitrate-N (lb/ac, 0-24 in)'; ANALYTE_LABEL.p // 'P (ppm)'
 */
export const ANALYTE_LABEL = byAnalyte((t) =>
  t.unit ? `${t.short} (${t.unit}${t.depth === TOPSOIL ? '' : `, ${t.depth}`})` : t.short,
);

/** Full name with the depth sampled, for charts. @example ANALYTE_DEPTH_LABEL.p // 'phosphorus (0-6 in)' */
export const ANALYTE_DEPTH_LABEL = byAnalyte((t) => `${t.name} (${t.depth})`);

/**
 * Short name with the depth sampled (organic matter and pH without), for tables of soil tests.
 * @example ANALYTE_SAMPLED.no3_n // 'nitrate-N 0-24 in'; ANALYTE_SAMPLED.om // 'organic matter'
 */
export const ANALYTE_SAMPLED = byAnalyte((t, a) =>
  a === 'om' || a === 'ph' ? t.short : `${t.short} ${t.depth}`,
);

/** The unit naming the element. @example ANALYTE_UNIT.so4_s // 'lb S/ac' */
export const ANALYTE_UNIT = byAnalyte((t) => t.amount);

/** Nutrient names as people write them. @example NUTRIENT_NAME.p2o5 // 'P2O5' */
export const NUTRIENT_NAME: Readonly<Record<Nutrient, string>> = { n: 'N', p2o5: 'P2O5', k2o: 'K2O', s: 'S' };

/** Placement names as people write them. @example PLACEMENT_NAME.mid_row_band // 'mid-row band' */
export const PLACEMENT_NAME: Readonly<Record<Placement, string>> = {
  seed_row: 'seed row',
  side_band: 'side band',
  mid_row_band: 'mid-row band',
  broadcast: 'broadcast',
};

/** A placement's short tag in rate column names (`map_seed_lbac`) and zone tables. @example PLACEMENT_TAG.broadcast // 'bcast' */
export const PLACEMENT_TAG: Readonly<Record<Placement, string>> = {
  seed_row: 'seed',
  side_band: 'band',
  mid_row_band: 'midrow',
  broadcast: 'bcast',
};

/**
 * A placement's name for people, also for one read from a file that may name a placement tilth does not know
 * (written with its underscores as spaces).
 * @example placementName('side_band') // 'side band'; placementName('deep_band') // 'deep band'
 */
export function placementName(placement: string): string {
  return PLACEMENT_NAME[placement as Placement] ?? placement.split('_').join(' ');
}

/** The kinds of placement the N relative efficiency table is given for: the seed row, any band, broadcast. */
export const PLACEMENT_KINDS = ['seed_row', 'band', 'broadcast'] as const;
export type PlacementKind = (typeof PLACEMENT_KINDS)[number];
/** Placement kind names as people write them. @example PLACEMENT_KIND_NAME.seed_row // 'seed row' */
export const PLACEMENT_KIND_NAME: Readonly<Record<PlacementKind, string>> = {
  seed_row: 'seed row',
  band: 'band',
  broadcast: 'broadcast',
};

/**
 * The caution every command's help, the README, the report, the plan and tables files and the shapefile notes
 * carry, in these words: seed-row injury, local guidelines, and a licensed agronomist or certified crop
 * adviser's check. Never write another wording of it.
 */
export const CAUTION =
  'Caution: tilth computes suggestions from soil tests and editable default tables. Too much fertilizer with the\n' +
  'seed injures or kills seedlings; wrong rates cost money and can pollute water. Follow local guidelines, and\n' +
  'have a licensed agronomist or certified crop adviser check every prescription before it is applied.';

/**
 * The caution as comment lines of a file (`# ` before each line), for the plan and tables files tilth writes.
 * @example cautionComment().startsWith('# Caution: tilth computes') // true
 */
export function cautionComment(prefix = '# '): string {
  return CAUTION.split('\n')
    .map((l) => prefix + l)
    .join('\n');
}

/** The caution as one paragraph, without its "Caution:" lead (for lists under a heading, e.g. the report's). */
export const CAUTION_TEXT = CAUTION.replace(/^Caution: /, '').replace(/\n/g, ' ');
