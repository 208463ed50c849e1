/**
 * tilth's words, written down once. Read this before naming anything.
 *
 * - **analyte** = a soil test value: nitrate-N, P, K, sulphate-S, organic matter, pH (`Analyte`, src/types.ts).
 *   **nutrient** = what a fertilizer supplies and a rate is given in: N, P2O5, K2O, S (`Nutrient`,
 *   below; the tables use it). A surface is an analyte map; a target is a nutrient rate. Old names that mix the
 *   two (`nutrientSurface`, `NUTRIENT_LABEL` for analytes) are kept where they are public, and new code follows
 *   this rule.
 * - **placement** = where a product goes: seed_row, side_band, mid_row_band, broadcast (`PLACEMENTS`).
 * - **rate column** = `<product stem>_<unit>` with unit lbac, kgha, galac or lha (src/prescription/shapefiles.ts
 *   `RX_UNITS`; `tilth check` finds rate columns by the same suffixes).
 * - **warning code** = lower-case words joined by hyphens, naming the finding, not the fix: `outside-boundary`,
 *   `same-place`, `few-samples` (`Warning.code`, src/errors.ts).
 * - **grid** = the one grid geometry: cell size, north-west corner (`xmin`, `ymax`), `cols` x `rows`, row-major,
 *   north-up (`Grid`, src/types.ts); every per-cell array has this layout.
 * - Unit conversion factors live only in src/units/.
 */
import type { Analyte } from './types.js';

/** Where a product goes: in the seed row, a side or mid-row band, or broadcast. */
export const PLACEMENTS = ['seed_row', 'side_band', 'mid_row_band', 'broadcast'] as const;
export type Placement = (typeof PLACEMENTS)[number];
/** The nutrients a product supplies, as the tables name them (N, P2O5, K2O, S). */
export const NUTRIENTS = ['n', 'p2o5', 'k2o', 's'] as const;
export type Nutrient = (typeof NUTRIENTS)[number];

/** Each analyte's words: short name, sampled depth and canonical unit (the values in `Samples`). */
export const ANALYTE_TERMS: Readonly<Record<Analyte, { short: string; depth: string; unit: string }>> = {
  no3_n: { short: 'nitrate-N', depth: '0-24 in', unit: 'lb/ac' },
  p: { short: 'P', depth: '0-6 in', unit: 'ppm' },
  k: { short: 'K', depth: '0-6 in', unit: 'ppm' },
  so4_s: { short: 'sulphate-S', depth: '0-24 in', unit: 'lb/ac' },
  om: { short: 'organic matter', depth: '0-6 in', unit: '%' },
  ph: { short: 'pH', depth: '0-6 in', unit: '' },
};

/**
 * The caution every command's help, the README and the report carry: seed-row injury, local guidelines, and a
 * licensed agronomist or certified crop adviser's check.
 */
export const CAUTION =
  'Caution: tilth computes suggestions from soil tests and editable default tables. Too much fertilizer with the\n' +
  'seed injures or kills seedlings; wrong rates cost money and can pollute water. Follow local guidelines, and\n' +
  'have a licensed agronomist or certified crop adviser check every prescription before it is applied.';
