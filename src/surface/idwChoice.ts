/**
 * IDW power and neighbour count for nutrients measured at the same sites: chosen by one shared
 * leave-one-out cross-validation (crossValidate.ts) or taken as given, with the table and the sentence
 * for people.
 */
import type { Warning } from '../errors.js';
import {
  crossValidateMany,
  DEFAULT_NEIGHBOURS,
  DEFAULT_POWERS,
  type CvResult,
  type CvRow,
} from './crossValidate.js';
import type { NutrientPoints } from './prepare.js';

/**
 * Above this many samples "all" is left out of the automatic neighbour choice; a warning says so. Its
 * leave-one-out costs samples^2 / 2 pairs x powers x nutrients, and its map cells x samples; with this many
 * samples a few nearest predict the left-out ones better anyway (docs/surface.md, "Cross-validation cost").
 */
export const ALL_CV_LIMIT = 2000;

/** The IDW choice for one nutrient: its cross-validation table (null without one), power, neighbours, and why. */
export type IdwChoice = { cv: CvResult | null; power: number; neighbours: number; choice: string };

/** The options of nutrientSurface that the IDW choice reads. */
export interface IdwChoiceOptions {
  /** IDW power, or 'auto' = lowest cross-validation RMSE among `powers` (default 'auto'); a number is the only candidate */
  power?: number | 'auto';
  /** nearest samples used (Infinity = all), or 'auto' (default 'auto') */
  neighbours?: number | 'auto';
  /** candidate powers for 'auto' (default 1, 1.5, 2, 3) */
  powers?: number[];
  /** candidate neighbour counts for 'auto' (default 8, 12, 16, all) */
  neighbourChoices?: number[];
  /** search radius in metres (default none) */
  radius?: number;
  /** NaN where fewer samples lie within the radius (default 1) */
  minNeighbours?: number;
  /** skip cross-validation when power and neighbours are both given (default false: a one-row table for the given pair is made) */
  skipCv?: boolean;
}

/** What the choice needs of a nutrient waiting for interpolation. */
interface Candidate {
  label: string;
  pts: NutrientPoints;
  base: { warnings: Warning[] };
}

/**
 * IDW power and neighbours for nutrients at the same sites: by one shared cross-validation ('auto') or as
 * given; per nutrient the table and the sentence for people.
 */
export function chooseIdw(group: Candidate[], opts: IdwChoiceOptions): IdwChoice[] {
  const n = group[0].pts.z.length;
  const fixedP = typeof opts.power === 'number' ? opts.power : null;
  const fixedK = typeof opts.neighbours === 'number' ? opts.neighbours : null;
  let choices = opts.neighbourChoices ?? DEFAULT_NEIGHBOURS;
  if (fixedK === null && n > ALL_CV_LIMIT && choices.some((k) => !Number.isFinite(k))) {
    // leave-one-out with every sample costs n^2 distance pairs, and its map cells x samples: too slow for dense data
    choices = choices.filter((k) => Number.isFinite(k));
    for (const p of group)
      p.base.warnings.push({
        code: 'surface-cv-all-skipped',
        message: `${p.label}: ${n} samples; "all neighbours" is not among the cross-validation candidates above ${ALL_CV_LIMIT} samples (its cost grows with the square of the sample count; give --neighbours all to use it).`,
        field: p.label,
      });
  }
  // a fixed value is the only candidate on its axis: with both given, the table is the one row that says
  // how well the given pair predicts left-out samples (cheap), not a search
  const cvs =
    opts.skipCv && fixedP !== null && fixedK !== null
      ? group.map(() => null)
      : crossValidateMany(
          group[0].pts.xy,
          group.map((p) => p.pts.z),
          {
            powers: fixedP !== null ? [fixedP] : (opts.powers ?? DEFAULT_POWERS),
            neighbours: fixedK !== null ? [fixedK] : choices,
            radius: opts.radius,
            minNeighbours: opts.minNeighbours,
          },
        );
  return group.map((p, i) => idwFromCv(cvs[i], fixedP, fixedK, n, p));
}

/** Power and neighbours from one nutrient's table (restricted to the given values), and why. */
function idwFromCv(
  cv: CvResult | null,
  fixedP: number | null,
  fixedK: number | null,
  n: number,
  p: Candidate,
): IdwChoice {
  let power = fixedP ?? 2,
    neighbours = fixedK ?? 12;
  if (!cv) {
    if (n < 3)
      p.base.warnings.push({
        code: 'surface-few-samples',
        message: `${p.label}: only ${n} samples; power ${power} and ${kName(neighbours)} neighbours are used without cross-validation.`,
        field: p.label,
      });
    const choice =
      n < 3
        ? `power ${power} and ${kName(neighbours)} neighbours (fewer than 3 samples: no cross-validation)`
        : `power ${power} and ${kName(neighbours)} neighbours as given (cross-validation skipped)`;
    return { cv, power, neighbours, choice };
  }
  const rows = cv.table.filter(
    (r) => (fixedP === null || r.power === fixedP) && (fixedK === null || r.neighbours === fixedK),
  );
  let best: CvRow = rows[0];
  for (const r of rows) if (r.rmse < best.rmse || Number.isNaN(best.rmse)) best = r;
  power = best.power;
  neighbours = best.neighbours;
  const what =
    fixedP === null && fixedK === null
      ? 'power and neighbours'
      : fixedP === null
        ? 'power'
        : fixedK === null
          ? 'neighbours'
          : '';
  const choice = what
    ? `${what} chosen by leave-one-out cross-validation: lowest RMSE ${fmt(best.rmse)} at power ${power}, ${kName(neighbours)} neighbours`
    : `power ${power} and ${kName(neighbours)} neighbours as given (leave-one-out RMSE ${fmt(best.rmse)}; use --power auto --neighbours auto to compare others)`;
  return { cv: { table: cv.table, best }, power, neighbours, choice };
}

/** "all" for Infinity, else the count. */
export function kName(k: number): string {
  return Number.isFinite(k) ? String(k) : 'all';
}

export function fmt(v: number): string {
  return Number.isFinite(v) ? String(Number(v.toPrecision(4))) : 'n/a';
}
