/**
 * Summary statistics of one variable: n, min, median, max, mean, sample standard deviation, CV.
 * NaN values (not tested) are skipped.
 */

export interface Description {
  /** number of values that are not NaN */
  n: number;
  min: number;
  /** middle value; the mean of the two middle values when n is even */
  median: number;
  max: number;
  mean: number;
  /** sample standard deviation (n - 1 in the denominator); NaN when n < 2 */
  sd: number;
  /** coefficient of variation sd / mean, as a fraction (0.25 = 25 %); NaN when n < 2 or mean is 0 */
  cv: number;
}

/**
 * Describes the non-NaN values of an array. All fields are NaN when there are none.
 * @example describe(new Float64Array([2, 4, 4, 4, 5, 5, 7, 9])) // { n: 8, min: 2, median: 4.5, max: 9, mean: 5, sd: 2.138, cv: 0.428 }
 */
export function describe(values: ArrayLike<number>): Description {
  const v: number[] = [];
  for (let i = 0; i < values.length; i++) if (!Number.isNaN(values[i])) v.push(values[i]);
  const n = v.length;
  if (n === 0) return { n: 0, min: NaN, median: NaN, max: NaN, mean: NaN, sd: NaN, cv: NaN };
  v.sort((a, b) => a - b);
  let sum = 0;
  for (const x of v) sum += x;
  const mean = sum / n;
  // two-pass variance for accuracy
  let ss = 0;
  for (const x of v) ss += (x - mean) ** 2;
  const sd = n > 1 ? Math.sqrt(ss / (n - 1)) : NaN;
  const median = n % 2 ? v[(n - 1) / 2] : (v[n / 2 - 1] + v[n / 2]) / 2;
  return { n, min: v[0], median, max: v[n - 1], mean, sd, cv: n > 1 && mean !== 0 ? sd / mean : NaN };
}
