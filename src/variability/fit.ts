/**
 * Weighted least-squares fits of semivariogram models (nugget + one structure) to an empirical
 * semivariogram, reaching the same solution as R's gstat `fit.variogram()` (gstat 2.1.0).
 *
 * gstat minimises SSErr = sum_j w_j (gamma_j - model(h_j))^2 by Gauss-Newton steps from the starting model.
 * Its weights (fit.method):
 *   1: N_j   2: N_j / model(h_j)^2 (Cressie 1985)   6: 1 (ordinary least squares)   7: N_j / h_j^2 (default)
 * For method 2 gstat evaluates model(h_j) once, with the STARTING model, and keeps those weights (src/fit.c
 * fills the weights on the first iteration only); this module does the same, so results depend on the start
 * exactly as gstat's do. When gstat's fit gives a negative nugget or partial sill, R's fit.variogram sets it
 * to 0, resets the range to the starting range and fits again; so does this module.
 *
 * Method here (why not a general optimiser: see docs/variability.md): for a fixed range the model is linear in
 * nugget and partial sill, so those come from a 2 x 2 weighted normal-equation solve, and the range is found by
 * a log-spaced scan followed by golden-section refinement of that profile. This finds the global minimum over
 * the searched ranges, where Gauss-Newton finds the one near its start; on well-behaved data they agree.
 */
import type { Semivariogram } from './semivariogram.js';
import { effectiveRange, unitVariogram, type ModelKind } from './models.js';

/** gstat's fit.method numbers that tilth supports. */
export type FitMethod = 1 | 2 | 6 | 7;

/** A starting model (gstat's `vgm(psill, model, range, nugget)`). */
export interface StartModel {
  nugget: number;
  psill: number;
  /** range parameter a, metres */
  range: number;
}

export interface FitOptions {
  /** gstat fit.method: 7 (N_j / h_j^2, default), 2 (Cressie N_j / gamma(h_j)^2), 1 (N_j) or 6 (unweighted) */
  method?: FitMethod;
  /** starting model; default {@link defaultStart} (gstat's own fill-in for vgm(NA, model, NA, NA)) */
  start?: StartModel;
  /** range search interval as multiples of the largest lag distance: default [1e-3, 100] */
  rangeSearch?: [number, number];
}

/** A fitted model. `ok` is false (with `problem` saying why) when no usable fit exists. */
export interface FittedModel {
  kind: ModelKind;
  method: FitMethod;
  nugget: number;
  /** partial sill (sill minus nugget) */
  psill: number;
  /** nugget + partial sill */
  sill: number;
  /** gstat's range parameter a, metres */
  range: number;
  /** distance where the sill (spherical) or 95 % of it (exponential 3a, Gaussian sqrt(3) a) is reached, metres */
  effectiveRange: number;
  /** weighted sum of squared errors with the weights used (gstat's attr(fit, "SSErr")) */
  ssErr: number;
  /** true when the nugget came out negative and was refitted at 0 (as gstat does) */
  nuggetFixedAtZero: boolean;
  /** true when the best range lies at the end of the search interval: no sill is reached within the data */
  rangeAtLimit: boolean;
  ok: boolean;
  problem?: string;
  start: StartModel;
}

/**
 * gstat's starting values for `vgm(NA, model, NA, NA)`: range = max(h) / 3, nugget = mean of the first three
 * gammas, partial sill = mean of the last five.
 * @example defaultStart(v) // { nugget: 0.214, psill: 0.620, range: 514.4 } for Meuse log(zinc)
 */
export function defaultStart(v: Pick<Semivariogram, 'dist' | 'gamma'>): StartModel {
  const g = v.gamma;
  const head = g.slice(0, 3);
  const tail = g.slice(Math.max(0, g.length - 5));
  const mean = (a: number[]) => a.reduce((s, x) => s + x, 0) / a.length;
  return { nugget: mean(head), psill: mean(tail), range: Math.max(...v.dist) / 3 };
}

interface Lin {
  nugget: number;
  psill: number;
  sse: number;
}

/** Weighted linear fit of gamma = c0 * [fit nugget] + c1 * u. */
function linearFit(g: number[], u: Float64Array, w: Float64Array, fitNugget: boolean): Lin {
  let sw = 0,
    su = 0,
    suu = 0,
    sg = 0,
    sug = 0;
  for (let j = 0; j < g.length; j++) {
    sw += w[j];
    su += w[j] * u[j];
    suu += w[j] * u[j] * u[j];
    sg += w[j] * g[j];
    sug += w[j] * u[j] * g[j];
  }
  let c0 = 0,
    c1: number;
  if (fitNugget) {
    const det = sw * suu - su * su;
    if (!(Math.abs(det) > 1e-300 * Math.max(1, sw * suu))) return { nugget: NaN, psill: NaN, sse: Infinity };
    c0 = (suu * sg - su * sug) / det;
    c1 = (sw * sug - su * sg) / det;
  } else {
    if (!(suu > 0)) return { nugget: NaN, psill: NaN, sse: Infinity };
    c1 = sug / suu;
  }
  let sse = 0;
  for (let j = 0; j < g.length; j++) {
    const r = g[j] - c0 - c1 * u[j];
    sse += w[j] * r * r;
  }
  return { nugget: c0, psill: c1, sse };
}

function weightsFor(
  v: Pick<Semivariogram, 'np' | 'dist'>,
  kind: ModelKind,
  method: FitMethod,
  start: StartModel,
): Float64Array | string {
  const w = new Float64Array(v.np.length);
  for (let j = 0; j < w.length; j++) {
    if (method === 6) w[j] = 1;
    else if (method === 1) w[j] = v.np[j];
    else if (method === 7) {
      if (v.dist[j] === 0)
        return 'fit method 7 (N_j / h_j^2) cannot use a lag at distance 0; choose method 2';
      w[j] = v.np[j] / (v.dist[j] * v.dist[j]);
    } else {
      const s = start.nugget + start.psill * unitVariogram(kind, v.dist[j], start.range);
      if (!(Math.abs(s) > 1e-30))
        return 'the starting model is 0 at a lag, so Cressie weights are infinite; give another start';
      w[j] = v.np[j] / (s * s);
    }
  }
  return w;
}

/** Minimises the profile SSE over the range parameter; returns the best range and its linear fit. */
function profileFit(
  v: Pick<Semivariogram, 'dist' | 'gamma'>,
  kind: ModelKind,
  w: Float64Array,
  fitNugget: boolean,
  search: [number, number],
) {
  const hmax = Math.max(...v.dist);
  const lo = Math.log(search[0] * hmax);
  const hi = Math.log(search[1] * hmax);
  const u = new Float64Array(v.dist.length);
  const at = (a: number): Lin => {
    for (let j = 0; j < u.length; j++) u[j] = unitVariogram(kind, v.dist[j], a);
    return linearFit(v.gamma, u, w, fitNugget);
  };
  const steps = 400;
  let bestK = 0;
  let bestS = Infinity;
  for (let k = 0; k <= steps; k++) {
    const s = at(Math.exp(lo + ((hi - lo) * k) / steps)).sse;
    if (s < bestS) {
      bestS = s;
      bestK = k;
    }
  }
  // golden-section refinement on log(a) between the grid neighbours
  let a = lo + ((hi - lo) * Math.max(0, bestK - 1)) / steps;
  let b = lo + ((hi - lo) * Math.min(steps, bestK + 1)) / steps;
  const phi = (Math.sqrt(5) - 1) / 2;
  let c = b - phi * (b - a);
  let d = a + phi * (b - a);
  let fc = at(Math.exp(c)).sse;
  let fd = at(Math.exp(d)).sse;
  for (let it = 0; it < 200 && b - a > 1e-13; it++) {
    if (fc <= fd) {
      b = d;
      d = c;
      fd = fc;
      c = b - phi * (b - a);
      fc = at(Math.exp(c)).sse;
    } else {
      a = c;
      c = d;
      fc = fd;
      d = a + phi * (b - a);
      fd = at(Math.exp(d)).sse;
    }
  }
  let logA = (a + b) / 2;
  let lin = at(Math.exp(logA));
  // keep the grid point if refinement did not improve on it
  const gridLin = at(Math.exp(lo + ((hi - lo) * bestK) / steps));
  if (gridLin.sse < lin.sse) {
    logA = lo + ((hi - lo) * bestK) / steps;
    lin = gridLin;
  }
  const atLimit = bestK === 0 || bestK === steps;
  return { range: Math.exp(logA), lin, atLimit };
}

/**
 * Fits one model kind to an empirical semivariogram by weighted least squares (gstat's fit.variogram rules).
 * Needs at least three lags.
 *
 * @example
 * const v = semivariogram(xy, logZinc);
 * const m = fitModel(v, 'spherical', { method: 7, start: { nugget: 1, psill: 1, range: 800 } });
 * // Meuse log(zinc): m.nugget 0.0507, m.psill 0.591, m.range 897 (as gstat)
 */
export function fitModel(
  v: Pick<Semivariogram, 'np' | 'dist' | 'gamma'>,
  kind: ModelKind,
  opts: FitOptions = {},
): FittedModel {
  const method = opts.method ?? 7;
  const start = opts.start ?? defaultStart(v);
  const search = opts.rangeSearch ?? [1e-3, 100];
  const fail = (problem: string): FittedModel => ({
    kind,
    method,
    nugget: NaN,
    psill: NaN,
    sill: NaN,
    range: NaN,
    effectiveRange: NaN,
    ssErr: NaN,
    nuggetFixedAtZero: false,
    rangeAtLimit: false,
    ok: false,
    problem,
    start,
  });
  if (v.np.length < 3)
    return fail(
      `only ${v.np.length} lag(s) hold pairs; a model with nugget, sill and range needs at least 3`,
    );
  let w = weightsFor(v, kind, method, start);
  if (typeof w === 'string') return fail(w);
  let r = profileFit(v, kind, w, true, search);
  let nuggetFixedAtZero = false;
  if (r.lin.nugget < 0) {
    // as R's fit.variogram: negative nugget -> 0, range back to the start, fit again (weights from that model)
    nuggetFixedAtZero = true;
    const restart: StartModel = {
      nugget: 0,
      psill: r.lin.psill > 0 ? r.lin.psill : start.psill,
      range: start.range,
    };
    w = weightsFor(v, kind, method, restart);
    if (typeof w === 'string') return fail(w);
    r = profileFit(v, kind, w, false, search);
    r.lin.nugget = 0;
  }
  if (!(r.lin.psill > 0) || !Number.isFinite(r.lin.sse)) {
    return fail(
      'no spatial structure: the fitted partial sill is not positive (a pure-nugget semivariogram)',
    );
  }
  const out: FittedModel = {
    kind,
    method,
    nugget: r.lin.nugget,
    psill: r.lin.psill,
    sill: r.lin.nugget + r.lin.psill,
    range: r.range,
    effectiveRange: effectiveRange(kind, r.range),
    ssErr: r.lin.sse,
    nuggetFixedAtZero,
    rangeAtLimit: r.atLimit,
    ok: true,
    start,
  };
  if (r.atLimit)
    out.problem =
      'the best range lies at the end of the searched interval: the semivariogram does not level off within the distances examined';
  return out;
}

/**
 * Fits spherical, exponential and Gaussian models and names the best: the smallest SSErr among usable fits
 * whose range is inside the searched interval (as gstat picks from a model list by SSErr).
 * @example const { fits, best } = fitModels(v); // best?.kind === 'spherical' for Meuse log(zinc)
 */
export function fitModels(
  v: Pick<Semivariogram, 'np' | 'dist' | 'gamma'>,
  opts: FitOptions = {},
): { fits: FittedModel[]; best: FittedModel | null } {
  const fits = (['spherical', 'exponential', 'gaussian'] as const).map((k) => fitModel(v, k, opts));
  let best: FittedModel | null = null;
  for (const f of fits) if (f.ok && !f.rangeAtLimit && (!best || f.ssErr < best.ssErr)) best = f;
  return { fits, best };
}

/** Value of a fitted model at distance h (0 at h = 0, as gstat). */
export function modelAt(m: Pick<FittedModel, 'kind' | 'nugget' | 'psill' | 'range'>, h: number): number {
  return h <= 0 ? 0 : m.nugget + m.psill * unitVariogram(m.kind, h, m.range);
}
