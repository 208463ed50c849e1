/**
 * Inputs that cannot make a prescription: no nutrient values at all, no usable value for a nutrient the plan
 * needs, every sample at one place, a boundary part far from every sample. Commands that compute rates or maps
 * refuse them; `tilth inspect` shows them as a warning block and exits 0. Pure.
 */
import { ringsBbox } from '../../geo/area.js';
import type { Plan } from '../../agronomy/index.js';
import type { Analyte, FieldInputs } from '../../types.js';
import { farParts, MAX_UNSAMPLED_DISTANCE_M } from './budgets.js';
import {
  dropOutlierValues,
  findNeighbourOutliers,
  implausibleValues,
  neighbourOutliers,
  type OutlierMode,
} from './plausible.js';
import { ANALYTE_NAME } from '../../vocabulary.js';

/** Samples all within this distance of each other count as one place: 1 m (GPS error of a sampling probe). */
export const ONE_PLACE_M = 1;

const SOIL_NUTRIENTS: Analyte[] = ['no3_n', 'p', 'k', 'so4_s'];

/** Soil values a plan's strategy reads (a strategy of `none`, or P by removal, reads none). */
export function nutrientsNeeded(plan: Plan): Analyte[] {
  const s = plan.strategy;
  const need: Analyte[] = [];
  if (s.n.method !== 'none') need.push('no3_n');
  if (s.p.method === 'response_class' || s.p.method === 'build') need.push('p');
  if (s.k.method !== 'none') need.push('k');
  if (s.s.method !== 'none') need.push('so4_s');
  return need;
}

const usable = (v: Float64Array) => v.some((x) => Number.isFinite(x));

/**
 * Why these inputs cannot make a prescription or map (empty when they can).
 * @param need the plan (build: every nutrient its strategy reads), one analyte (surface, variability), or null
 *   (inspect: at least one soil nutrient)
 * @example readinessProblems(inputs, plan, 'samples.csv') // ['samples.csv: no usable K value, and the plan's K strategy needs one ...']
 */
export function readinessProblems(
  inputs: FieldInputs,
  need: Plan | Analyte | null,
  samplesFile = 'the samples file',
): string[] {
  const out: string[] = [];
  const v = inputs.samples.values;
  if (typeof need === 'string') {
    if (!v[need] || !usable(v[need]))
      out.push(
        `${samplesFile}: no usable ${(ANALYTE_NAME as Record<string, string>)[need] ?? need} value (no such column was recognised, or every value is empty). Fix: check the header row (see \`tilth inspect\`), or map the column with --columns.`,
      );
  } else if (!SOIL_NUTRIENTS.some((a) => v[a] && usable(v[a]))) {
    out.push(
      `${samplesFile}: no usable nitrate-N, P, K or sulphate-S value (no nutrient column was recognised, or every value is empty). Fix: check the header row (see \`tilth inspect\`), or map the columns with --columns.`,
    );
  } else if (need) {
    for (const a of nutrientsNeeded(need)) {
      if (!v[a] || !usable(v[a]))
        out.push(
          `${samplesFile}: no usable ${ANALYTE_NAME[a]} value, and the plan's ${ANALYTE_NAME[a]} strategy needs one. Fix: add the ${ANALYTE_NAME[a]} results, or set strategy.${a === 'no3_n' ? 'n' : a === 'so4_s' ? 's' : a}.method to none in the plan.`,
        );
    }
  }
  out.push(...implausibleValues(inputs.samples));
  const xy = inputs.samples.xy;
  const [x0, y0, x1, y1] = ringsBbox([xy]);
  if (xy.length >= 4 && !inputs.zones && Math.hypot(x1 - x0, y1 - y0) <= ONE_PLACE_M) {
    out.push(
      `${samplesFile}: all ${xy.length / 2} samples lie within ${ONE_PLACE_M} m of one place; they cannot show how the field varies. Fix: check the coordinates (copied from one row?).`,
    );
  }
  // a build whose plan names rates for unsampled parts goes ahead knowingly (src/prescription/unsampled.ts)
  const planned = need !== null && typeof need === 'object' && need.unsampled_parts !== null;
  if (!inputs.zones && !planned) {
    const far = farParts(inputs.field.parts, xy);
    if (far.length)
      out.push(
        `boundary part${far.length > 1 ? 's' : ''} ${far.join(', ')} of ${inputs.field.parts.length} lie${far.length > 1 ? '' : 's'} more than ${MAX_UNSAMPLED_DISTANCE_M} m from every sample; the samples say nothing about ${far.length > 1 ? 'them' : 'it'}. Fix: give the boundary of the sampled field only, or add samples there${need !== null && typeof need === 'object' ? '; or, to apply a rate there knowingly, set the plan key unsampled_parts (none, a rate, or { product: rate })' : ''}.`,
      );
  }
  return out;
}

/** Where the outlier mode came from: the default, the --outliers option, or the plan key soil_test.outliers. */
export type OutlierSource = 'default' | 'option' | 'plan';

/**
 * The neighbour outlier test (src/cli/safety/plausible.ts) on loaded inputs: its warnings join the inputs'
 * warnings, so they reach every output built from them (summary, report) and the terminal; with `mode` drop the
 * flagged values are also left out of interpolation (made "not tested" for their analyte). Values are never
 * dropped when some value is implausible (the command refuses those, naming them) or for zone-composite samples
 * (each composite is its zone's only value): the warning then says they are kept and why.
 * @param mode default keep; `source` says where the mode came from
 * @example applyOutlierTest(inputs, 'samples.csv', 'drop', 'option')
 */
export function applyOutlierTest(
  inputs: FieldInputs,
  samplesFile: string,
  mode: OutlierMode = 'keep',
  source: OutlierSource = 'default',
): void {
  const s = inputs.samples;
  const found = findNeighbourOutliers(s);
  if (!found.length) return;
  const asked =
    source === 'default'
      ? 'the default'
      : source === 'option'
        ? `--outliers ${mode}`
        : `plan key soil_test.outliers: ${mode}`;
  let why = asked;
  if (mode === 'drop' && inputs.zones)
    why = `${asked} does not apply to zone-composite samples: each is its zone's only value`;
  else if (mode === 'drop' && implausibleValues(s, 1).length)
    why = `${asked} waits until the values outside the plausible ranges are corrected`;
  const drop = mode === 'drop' && why === asked;
  inputs.warnings.push(...neighbourOutliers(s, samplesFile, drop ? 'drop' : 'keep', why, found));
  if (drop) dropOutlierValues(s, found);
}
