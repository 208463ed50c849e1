/**
 * Descriptive statistics of one set of numbers; NaN entries (not tested) are skipped.
 * (Placeholder shape agreed with the foundation work; the coordinator reconciles the two.)
 */

/** n, min, median, max, mean, sample SD (n - 1), CV = SD / mean (a fraction, NaN when the mean is 0). */
export interface Description {
  n: number;
  min: number;
  median: number;
  max: number;
  mean: number;
  /** sample standard deviation (divisor n - 1); NaN when n < 2 */
  sd: number;
  /** coefficient of variation sd / mean, as a fraction (0.25 = 25 %); NaN when n < 2 or the mean is 0 */
  cv: number;
}

/**
 * Describes the finite values of `values` (NaN skipped). All fields are NaN when nothing is left.
 * @example describe([1, 2, 3, NaN]) // { n: 3, min: 1, median: 2, max: 3, mean: 2, sd: 1, cv: 0.5 }
 */
export function describe(values: ArrayLike<number>): Description {
  const v: number[] = [];
  for (let i = 0; i < values.length; i++) if (Number.isFinite(values[i])) v.push(values[i]);
  const n = v.length;
  if (n === 0) return { n: 0, min: NaN, median: NaN, max: NaN, mean: NaN, sd: NaN, cv: NaN };
  v.sort((a, b) => a - b);
  let sum = 0;
  for (const x of v) sum += x;
  const mean = sum / n;
  let ss = 0;
  for (const x of v) ss += (x - mean) * (x - mean);
  const sd = n > 1 ? Math.sqrt(ss / (n - 1)) : NaN;
  const median = n % 2 ? v[(n - 1) / 2] : (v[n / 2 - 1] + v[n / 2]) / 2;
  return { n, min: v[0], median, max: v[n - 1], mean, sd, cv: n > 1 && mean !== 0 ? sd / Math.abs(mean) : NaN };
}
