/**
 * Which chance maps a nutrient gets, from the same tables the rate engine uses: for P and K the probability of
 * each response class and the expected response chance (classes and chances of the P method / the crop's K
 * class group), for sulphate-S the chance of being below the crop's low level. The maps themselves are
 * computed by src/surface/probability.ts from the kriging mean and variance (Gaussian assumption, see
 * docs/surface.md).
 */
import type { Analyte, PMethod } from '../types.js';
import type { CropTable, Tables } from '../agronomy/tables.js';
import { pClassTable } from '../agronomy/interpret.js';
import type { ResponseClasses } from '../surface/probability.js';

/** The chance maps of one nutrient: response classes (P, K), a threshold (S), or none. */
export type ChanceSpec =
  | { kind: 'classes'; classes: ResponseClasses; source: string }
  | { kind: 'below'; threshold: number; unit: string; source: string }
  | { kind: 'none' };

/** A soil test class table (name, upper bound, chance of a response, source) as a class-based chance map. */
function classesSpec(
  rows: readonly { name: string; below_ppm: number | null; response_probability: number; source: string }[],
): ChanceSpec {
  return {
    kind: 'classes',
    classes: {
      names: rows.map((r) => r.name),
      below: rows.map((r) => r.below_ppm),
      chance: rows.map((r) => r.response_probability),
    },
    source: rows.map((r) => `${r.name}: ${r.source}`).join('; '),
  };
}

/**
 * Chance maps for a nutrient and crop.
 * @param analyte the nutrient
 * @param crop the crop's table entry (thresholds, K class group)
 * @param tables the tables (P classes and their response chances)
 * @param pMethod the samples' P method (default 'olsen')
 * @param kelownaFactor modified Kelowna: Olsen class bounds without a published Kelowna bound are multiplied by
 *   this (plan key soil_test.kelowna_factor; default 1.3)
 * @example chanceSpec('so4_s', tables.crops.canola!, tables) // { kind: 'below', threshold: 20, ... }
 */
export function chanceSpec(
  analyte: Analyte,
  crop: CropTable,
  tables: Tables,
  pMethod: PMethod = 'olsen',
  kelownaFactor?: number,
): ChanceSpec {
  if (analyte === 'p') return classesSpec(pClassTable(pMethod, tables, kelownaFactor));
  if (analyte === 'k') return classesSpec(tables.k_classes[crop.k_class_group] ?? []);
  if (analyte === 'so4_s')
    return {
      kind: 'below',
      threshold: crop.s_low_below_lb.value,
      unit: 'lb S/ac 0-24 in',
      source: crop.s_low_below_lb.source,
    };
  return { kind: 'none' };
}
