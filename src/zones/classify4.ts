/**
 * The k-means passes over every cell, written out for four dimensions: the shared zone set's usual case (N,
 * P2O5, K2O and S targets all vary). Each gives what the general loops in classify.ts give, bit for bit: the
 * same sums added in the same cell order, the same distances (a four-term sum starting from its first term equals
 * one that starts from 0), the same comparisons. Written out, the four columns, means and centres sit in locals;
 * the general loops index an array of columns for every value, which costs about twice the time on 2.6 M cells
 * (docs/zones.md, "Classes"). tests/zones/classify.test.ts checks each against the general loops.
 */

/**
 * Cells with a positive weight (when weights are given) and a number in each of the four columns.
 * @example validCells4([a, b, c, d], fraction) // Int32Array of cell indices, ascending
 */
export function validCells4(dims: ArrayLike<number>[], weights: ArrayLike<number> | undefined): Int32Array {
  const a0 = dims[0],
    a1 = dims[1],
    a2 = dims[2],
    a3 = dims[3],
    n = a0.length;
  const ok = new Uint8Array(n);
  let nValid = 0;
  for (let i = 0; i < n; i++) {
    if (weights !== undefined && !(weights[i] > 0)) continue;
    const x0 = a0[i],
      x1 = a1[i],
      x2 = a2[i],
      x3 = a3[i];
    // x !== x: NaN
    if (x0 !== x0 || x1 !== x1 || x2 !== x2 || x3 !== x3) continue;
    ok[i] = 1;
    nValid++;
  }
  const valid = new Int32Array(nValid);
  for (let i = 0, t = 0; i < n; i++) if (ok[i] === 1) valid[t++] = i;
  return valid;
}

/**
 * The weighted mean of each of the four columns over the valid cells (`mu`, sums added in cell order, divided by
 * the total weight `tw`), and the weighted sum of squared deviations from it (`q`): what standardization's
 * one-column-at-a-time sums give. Fills `mu` and `q` (length 4).
 * @example moments4(dims, valid, weights, tw, mu, q)
 */
export function moments4(
  dims: ArrayLike<number>[],
  valid: Int32Array,
  weights: ArrayLike<number> | undefined,
  tw: number,
  mu: Float64Array,
  q: Float64Array,
): void {
  const a0 = dims[0],
    a1 = dims[1],
    a2 = dims[2],
    a3 = dims[3];
  let s0 = 0,
    s1 = 0,
    s2 = 0,
    s3 = 0;
  for (let t = 0; t < valid.length; t++) {
    const i = valid[t];
    const w = weights ? weights[i] : 1;
    s0 += w * a0[i];
    s1 += w * a1[i];
    s2 += w * a2[i];
    s3 += w * a3[i];
  }
  const m0 = s0 / tw,
    m1 = s1 / tw,
    m2 = s2 / tw,
    m3 = s3 / tw;
  let q0 = 0,
    q1 = 0,
    q2 = 0,
    q3 = 0;
  for (let t = 0; t < valid.length; t++) {
    const i = valid[t];
    const w = weights ? weights[i] : 1;
    q0 += w * (a0[i] - m0) ** 2;
    q1 += w * (a1[i] - m1) ** 2;
    q2 += w * (a2[i] - m2) ** 2;
    q3 += w * (a3[i] - m3) ** 2;
  }
  mu.set([m0, m1, m2, m3]);
  q.set([q0, q1, q2, q3]);
}

/**
 * Each valid cell's nearest centre (centres flat, four values each; ties to the first), as its rank, into
 * `classOf`; per class the weight (`sw`) and the weighted value sums (`smf`, four per class) added in cell order.
 * A cell whose four values equal the previous valid cell's takes its class without the distances.
 * @example assign4(dims, valid, weights, cf, cf.length / 4, rank, mu, sd, classOf, sw, smf)
 */
export function assign4(
  dims: ArrayLike<number>[],
  valid: Int32Array,
  weights: ArrayLike<number> | undefined,
  cf: Float64Array,
  kc: number,
  rank: Int16Array,
  mu: Float64Array,
  sd: Float64Array,
  classOf: Int16Array,
  sw: Float64Array,
  smf: Float64Array,
): void {
  const a0 = dims[0],
    a1 = dims[1],
    a2 = dims[2],
    a3 = dims[3];
  const m0 = mu[0],
    m1 = mu[1],
    m2 = mu[2],
    m3 = mu[3];
  const d0 = sd[0],
    d1 = sd[1],
    d2 = sd[2],
    d3 = sd[3];
  let p0 = NaN,
    p1 = NaN,
    p2 = NaN,
    p3 = NaN,
    c = 0;
  for (let t = 0; t < valid.length; t++) {
    const i = valid[t];
    const x0 = a0[i],
      x1 = a1[i],
      x2 = a2[i],
      x3 = a3[i];
    if (x0 !== p0 || x1 !== p1 || x2 !== p2 || x3 !== p3) {
      p0 = x0;
      p1 = x1;
      p2 = x2;
      p3 = x3;
      const z0 = (x0 - m0) / d0,
        z1 = (x1 - m1) / d1,
        z2 = (x2 - m2) / d2,
        z3 = (x3 - m3) / d3;
      let best = Infinity,
        arg = 0;
      for (let k = 0, o = 0; k < kc; k++, o += 4) {
        const dd = (z0 - cf[o]) ** 2 + (z1 - cf[o + 1]) ** 2 + (z2 - cf[o + 2]) ** 2 + (z3 - cf[o + 3]) ** 2;
        if (dd < best) {
          best = dd;
          arg = k;
        }
      }
      c = rank[arg];
    }
    classOf[i] = c;
    const w = weights ? weights[i] : 1;
    sw[c] += w;
    const o = c * 4;
    smf[o] += w * x0;
    smf[o + 1] += w * x1;
    smf[o + 2] += w * x2;
    smf[o + 3] += w * x3;
  }
}
