/**
 * Share of the field's (interpolated) area whose value is below a threshold.
 * Cells are weighted by the share of their area inside the field (Grid.fraction), so edge cells count
 * only their inside part; cells with no value (NaN) are left out of both sums.
 */

export interface AreaShare {
  /** area-weighted share below the threshold, 0..1 (NaN when no cell has a value) */
  share: number;
  /** sum of the fractions of cells below the threshold (multiply by cell area for m2) */
  belowCells: number;
  /** sum of the fractions of all cells with a value */
  totalCells: number;
}

/**
 * @param values surface values per cell, row-major, NaN outside or without value
 * @param fraction share of each cell inside the field, 0..1 (Grid.fraction)
 * @param threshold value < threshold counts as below (value <= threshold when `inclusive`)
 * @example areaShareBelow([5, 15, NaN], [1, 0.5, 1], 10) // { share: 0.667, belowCells: 1, totalCells: 1.5 }
 */
export function areaShareBelow(
  values: ArrayLike<number>,
  fraction: ArrayLike<number>,
  threshold: number,
  inclusive = false,
): AreaShare {
  if (values.length !== fraction.length)
    throw new Error(`areaShareBelow: ${values.length} values for ${fraction.length} cells`);
  let below = 0;
  let total = 0;
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    const f = fraction[i];
    if (!Number.isFinite(v) || !(f > 0)) continue;
    total += f;
    if (v < threshold || (inclusive && v === threshold)) below += f;
  }
  return { share: total > 0 ? below / total : NaN, belowCells: below, totalCells: total };
}

/**
 * Share of samples below a threshold (at or below when `inclusive`; NaN values skipped).
 * @example sampleShareBelow([5, 15, NaN, 8], 10) // 2 / 3
 */
export function sampleShareBelow(values: ArrayLike<number>, threshold: number, inclusive = false): number {
  let n = 0;
  let below = 0;
  for (let i = 0; i < values.length; i++) {
    if (!Number.isFinite(values[i])) continue;
    n++;
    if (values[i] < threshold || (inclusive && values[i] === threshold)) below++;
  }
  return n ? below / n : NaN;
}
