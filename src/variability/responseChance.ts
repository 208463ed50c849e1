/**
 * Zoning on the expected chance of a yield response (plan key `zoning.basis: response_chance`): per cell, for P
 * and K, the sum over the response classes of the class's probability (from the kriging mean and variance, under
 * the Gaussian assumption of src/surface/probability.ts) x the class's chance of a response (the tables the rate
 * engine uses: the P method's classes, the crop's K class group). The zone stage classifies this layer in place
 * of the P2O5 or K2O target, so zones follow where a response is likely and how sure the soil test is there,
 * rather than the target's steps at the class limits. See docs/zones.md, "Zones on the chance of a response".
 */
import type { Warning } from '../errors.js';
import type { CropTable, Tables } from '../agronomy/tables.js';
import type { Analyte, Grid, PMethod, Samples } from '../types.js';
import { classProbabilities } from '../surface/probability.js';
import { ANALYTE_NAME, NUTRIENT_NAME } from '../vocabulary.js';
import { chanceSpec } from './chance.js';
import { krigedCells, type ChanceMapOptions, type KrigedSurface } from './chanceMap.js';

/** The plan's nutrient (target) a response-chance layer stands in for. */
export type ResponseNutrient = 'p2o5' | 'k2o';

const ANALYTE: Record<ResponseNutrient, Analyte> = { p2o5: 'p', k2o: 'k' };

/** One nutrient's expected response chance per cell, and how it was made. */
export interface ResponseChanceLayer {
  /** expected chance of a yield response, 0..1 per cell (NaN outside the field) */
  values: Float64Array;
  /** for people: "expected chance of a yield response to P (ordinary kriging, ...; P classes of ...)" */
  label: string;
}

/** What the zone stage needs: a layer per nutrient kriging could carry, warnings for the others. */
export interface ResponseChanceBasis {
  layers: Partial<Record<ResponseNutrient, ResponseChanceLayer>>;
  warnings: Warning[];
}

/** Inputs of {@link responseChanceBasis}. */
export interface ResponseChanceInputs {
  samples: Pick<Samples, 'xy' | 'values' | 'ids' | 'zone' | 'pMethod'>;
  grid: Grid;
  /** the build's surfaces (their kriging, or its model or refusal, is used) */
  surfaces: (KrigedSurface & { analyte: Analyte })[];
  crop: CropTable;
  tables: Tables;
  /** plan keys surface.log, surface.kriging_neighbours and soil_test.kelowna_factor */
  log?: boolean;
  neighbours?: number;
  kelownaFactor?: number;
}

/**
 * The expected response chance of P and K per cell, for the nutrients in `nutrients` that have samples; a warning
 * (code `zones-response-chance-refused`) names each one kriging cannot carry, whose zones then stay on the target.
 * @param nutrients the targets that drive zone sets (p2o5, k2o; others are ignored)
 * @example const b = responseChanceBasis({ samples, grid, surfaces, crop, tables }, ['p2o5']); b.layers.p2o5?.values
 */
export function responseChanceBasis(
  inp: ResponseChanceInputs,
  nutrients: readonly string[],
): ResponseChanceBasis {
  const out: ResponseChanceBasis = { layers: {}, warnings: [] };
  for (const n of ['p2o5', 'k2o'] as const) {
    if (!nutrients.includes(n)) continue;
    const analyte = ANALYTE[n];
    if (!Array.from(inp.samples.values[analyte]).some(Number.isFinite)) continue;
    const layer = responseLayer(inp, n);
    if ('refused' in layer)
      out.warnings.push({
        code: 'zones-response-chance-refused',
        message: `zoning.basis is response_chance, but the ${ANALYTE_NAME[ANALYTE[n]]} zones are drawn from the ${NUTRIENT_NAME[n]} target: the expected chance of a response needs kriging of ${ANALYTE_NAME[ANALYTE[n]]}, and ${layer.refused}. Fix: add samples, or use zoning.basis: targets.`,
        field: analyte,
      });
    else out.layers[n] = layer;
  }
  return out;
}

/** One nutrient's layer: class probabilities from its kriging x the classes' response chances. */
function responseLayer(
  inp: ResponseChanceInputs,
  n: ResponseNutrient,
): ResponseChanceLayer | { refused: string } {
  const analyte = ANALYTE[n];
  const spec = chanceSpec(analyte, inp.crop, inp.tables, inp.samples.pMethod as PMethod, inp.kelownaFactor);
  if (spec.kind !== 'classes' || spec.classes.names.length === 0)
    return { refused: `the tables hold no response classes for ${ANALYTE_NAME[ANALYTE[n]]}` };
  const opts: ChanceMapOptions = {
    log: inp.log,
    neighbours: inp.neighbours,
    surface: inp.surfaces.find((s) => s.analyte === analyte),
  };
  const k = krigedCells(inp.samples, analyte, inp.grid, opts);
  if ('refused' in k) return { refused: k.refused };
  const { expected } = classProbabilities(k.cells, spec.classes);
  return {
    values: Float64Array.from(expected),
    label: `expected chance of a yield response to ${ANALYTE_NAME[ANALYTE[n]]} (from ${k.method})`,
  };
}
