/**
 * The semivariogram chart: lags sized and labelled by pair count, the fitted models (the best bold) with its
 * nugget, sill and effective range marked, and a legend. A complete standalone SVG document as a string.
 */
import type { Semivariogram } from './semivariogram.js';
import { modelAt, type FittedModel } from './fit.js';
import { esc } from '../draw/escape.js';
import { fmtTick, niceTicks } from '../draw/ticks.js';
import { fmtNum, FONT } from './charts.js';

const MODEL_STYLE: Record<string, { color: string; dash: string; name: string }> = {
  spherical: { color: '#d95f02', dash: '', name: 'spherical' },
  exponential: { color: '#7570b3', dash: '8 5', name: 'exponential' },
  gaussian: { color: '#1b9e77', dash: '2 4', name: 'Gaussian' },
};

export interface SemivariogramChartInput {
  semivariogram: Semivariogram;
  fits: FittedModel[];
  best: FittedModel | null;
  /** e.g. 'sulphate-S (0-24 in)' */
  label: string;
  /** unit of the values, e.g. 'lb S/ac' (the semivariance is in its square) */
  unit: string;
  transform?: 'none' | 'log';
  /** lags with fewer pairs than this are drawn hollow; default 30 (common practice) */
  minPairs?: number;
}

/** The plot area and its scales: distance (x, m) and semivariance (y), both from nice ticks. */
interface Plot {
  W: number;
  H: number;
  m: { l: number; r: number; t: number; b: number };
  pw: number;
  ph: number;
  xt: number[];
  yt: number[];
  X1: number;
  Y1: number;
  sx: (x: number) => number;
  sy: (y: number) => number;
}

function plotOf(input: SemivariogramChartInput, W: number, H: number): Plot {
  const m = { l: 88, r: 250, t: 56, b: 64 };
  const pw = W - m.l - m.r;
  const ph = H - m.t - m.b;
  const v = input.semivariogram;
  const xmax = Math.max(v.cutoff || 0, ...v.dist, 1);
  let ymax = Math.max(...v.gamma, 0);
  for (const f of input.fits) if (f.ok && f.sill < 3 * Math.max(ymax, 1e-12)) ymax = Math.max(ymax, f.sill);
  if (!(ymax > 0)) ymax = 1;
  const xt = niceTicks(0, xmax, 6, true);
  const yt = niceTicks(0, ymax * 1.05, 6, true);
  const X1 = xt[xt.length - 1];
  const Y1 = yt[yt.length - 1];
  const sx = (x: number) => m.l + (x / X1) * pw;
  const sy = (y: number) => m.t + ph - (y / Y1) * ph;
  return { W, H, m, pw, ph, xt, yt, X1, Y1, sx, sy };
}

/** Title, grid lines, tick labels, axis titles and the cutoff marker. */
function axes(o: string[], p: Plot, input: SemivariogramChartInput): void {
  const { W, H, m, pw, ph, xt, yt, sx, sy } = p;
  const v = input.semivariogram;
  const unit2 = input.transform === 'log' ? `(ln ${input.unit})²` : `(${input.unit})²`;
  o.push(
    `<svg xmlns="http://www.w3.org/2000/svg" width="${W}" height="${H}" viewBox="0 0 ${W} ${H}" ${FONT}>`,
  );
  o.push(`<rect width="${W}" height="${H}" fill="white"/>`);
  o.push(
    `<text x="${m.l}" y="28" font-size="19" font-weight="bold">Semivariogram of ${esc(input.transform === 'log' ? 'ln ' + input.label : input.label)}</text>`,
  );
  o.push(
    `<text x="${m.l}" y="46" font-size="13" fill="#444">${v.n} samples; lags of ${v.width.toFixed(0)} m up to ${v.cutoff.toFixed(0)} m; Matheron estimator</text>`,
  );
  const xs = xt.length > 1 ? xt[1] - xt[0] : 1;
  const ys = yt.length > 1 ? yt[1] - yt[0] : 1;
  for (const t of xt) {
    o.push(`<line x1="${sx(t)}" y1="${m.t}" x2="${sx(t)}" y2="${m.t + ph}" stroke="#e4e4e4"/>`);
    o.push(
      `<text x="${sx(t)}" y="${m.t + ph + 20}" font-size="13" text-anchor="middle">${fmtTick(t, xs)}</text>`,
    );
  }
  for (const t of yt) {
    o.push(`<line x1="${m.l}" y1="${sy(t)}" x2="${m.l + pw}" y2="${sy(t)}" stroke="#e4e4e4"/>`);
    o.push(`<text x="${m.l - 8}" y="${sy(t) + 4}" font-size="13" text-anchor="end">${fmtTick(t, ys)}</text>`);
  }
  o.push(`<rect x="${m.l}" y="${m.t}" width="${pw}" height="${ph}" fill="none" stroke="#333"/>`);
  o.push(
    `<text x="${m.l + pw / 2}" y="${H - 18}" font-size="14" text-anchor="middle">distance between samples (m)</text>`,
  );
  o.push(
    `<text transform="translate(22 ${m.t + ph / 2}) rotate(-90)" font-size="14" text-anchor="middle">semivariance ${esc(unit2)}</text>`,
  );
  if (v.cutoff > 0)
    o.push(
      `<line x1="${sx(v.cutoff)}" y1="${m.t}" x2="${sx(v.cutoff)}" y2="${m.t + ph}" stroke="#999" stroke-dasharray="3 3"/>`,
    );
}

/** The fitted model curves, the best one last and bold. */
function modelCurves(o: string[], p: Plot, input: SemivariogramChartInput): void {
  const { X1, Y1, sx, sy } = p;
  const ordered = [
    ...input.fits.filter((f) => f.ok && f !== input.best),
    ...(input.best ? [input.best] : []),
  ];
  for (const f of ordered) {
    const st = MODEL_STYLE[f.kind];
    const pts: string[] = [];
    for (let k = 1; k <= 200; k++) {
      const h = (X1 * k) / 200;
      const g = modelAt(f, h);
      if (g > Y1 * 1.02) break;
      pts.push(`${sx(h).toFixed(1)},${sy(g).toFixed(1)}`);
    }
    const isBest = f === input.best;
    o.push(
      `<polyline points="${sx(0)},${sy(0)} ${pts.join(' ')}" fill="none" stroke="${st.color}" stroke-width="${isBest ? 3.2 : 1.8}"${st.dash ? ` stroke-dasharray="${st.dash}"` : ''}/>`,
    );
  }
}

/** The best fit's sill, nugget and effective range, marked in its colour. */
function bestMarks(o: string[], p: Plot, b: FittedModel | null): void {
  if (!b) return;
  const { m, pw, ph, X1, Y1, sx, sy } = p;
  const st = MODEL_STYLE[b.kind];
  if (b.sill <= Y1) {
    o.push(
      `<line x1="${m.l}" y1="${sy(b.sill)}" x2="${m.l + pw}" y2="${sy(b.sill)}" stroke="${st.color}" stroke-width="1" stroke-dasharray="6 4" opacity="0.7"/>`,
    );
    o.push(
      `<text x="${m.l + pw - 4}" y="${sy(b.sill) - 5}" font-size="12" text-anchor="end" fill="${st.color}">sill ${fmtNum(b.sill)}</text>`,
    );
  }
  o.push(`<circle cx="${sx(0)}" cy="${sy(b.nugget)}" r="4.5" fill="${st.color}"/>`);
  o.push(
    `<text x="${m.l + 8}" y="${sy(b.nugget) - 7}" font-size="12" fill="${st.color}">nugget ${fmtNum(b.nugget)}</text>`,
  );
  if (b.effectiveRange <= X1) {
    o.push(
      `<line x1="${sx(b.effectiveRange)}" y1="${m.t + ph}" x2="${sx(b.effectiveRange)}" y2="${m.t}" stroke="${st.color}" stroke-width="1" stroke-dasharray="6 4" opacity="0.7"/>`,
    );
    const right = sx(b.effectiveRange) > m.l + pw * 0.7;
    o.push(
      `<text x="${sx(b.effectiveRange) + (right ? -5 : 5)}" y="${m.t + ph - 8}" font-size="12" text-anchor="${right ? 'end' : 'start'}" fill="${st.color}" stroke="white" stroke-width="3" paint-order="stroke">effective range ${b.effectiveRange.toFixed(0)} m</text>`,
    );
  }
}

/** The lag means, sized by pair count and labelled with it; hollow red under `minPairs`. */
function lagPoints(o: string[], p: Plot, v: Semivariogram, minPairs: number): void {
  const { sx, sy } = p;
  const npMax = Math.max(...v.np, 1);
  for (let j = 0; j < v.np.length; j++) {
    const r = 3 + 5 * Math.sqrt(v.np[j] / npMax);
    const few = v.np[j] < minPairs;
    o.push(
      `<circle cx="${sx(v.dist[j]).toFixed(1)}" cy="${sy(v.gamma[j]).toFixed(1)}" r="${r.toFixed(1)}" fill="${few ? 'white' : '#1f3b73'}" stroke="${few ? '#c0392b' : '#1f3b73'}" stroke-width="${few ? 2 : 1}"/>`,
    );
    o.push(
      `<text x="${sx(v.dist[j]).toFixed(1)}" y="${(sy(v.gamma[j]) - r - 4).toFixed(1)}" font-size="11" text-anchor="middle" fill="#333">${v.np[j]}</text>`,
    );
  }
}

/** The legend right of the plot: point styles, each model with its parameters, the cutoff. */
function legend(o: string[], p: Plot, input: SemivariogramChartInput, minPairs: number): void {
  const lx = p.m.l + p.pw + 18;
  let ly = p.m.t + 8;
  o.push(`<text x="${lx}" y="${ly + 4}" font-size="14" font-weight="bold">Legend</text>`);
  ly += 24;
  o.push(
    `<circle cx="${lx + 10}" cy="${ly}" r="6" fill="#1f3b73"/><text x="${lx + 24}" y="${ly + 4}" font-size="12">lag mean (number = pairs)</text>`,
  );
  ly += 22;
  o.push(
    `<circle cx="${lx + 10}" cy="${ly}" r="6" fill="white" stroke="#c0392b" stroke-width="2"/><text x="${lx + 24}" y="${ly + 4}" font-size="12">fewer than ${minPairs} pairs</text>`,
  );
  ly += 28;
  for (const f of input.fits) ly = legendModel(o, lx, ly, f, f === input.best);
  o.push(
    `<line x1="${lx}" y1="${ly}" x2="${lx + 22}" y2="${ly}" stroke="#999" stroke-dasharray="3 3"/><text x="${lx + 28}" y="${ly + 4}" font-size="12">cutoff</text>`,
  );
}

/** One model's legend entry; returns the next line's y. */
function legendModel(o: string[], lx: number, ly: number, f: FittedModel, isBest: boolean): number {
  const st = MODEL_STYLE[f.kind];
  o.push(
    `<line x1="${lx}" y1="${ly}" x2="${lx + 22}" y2="${ly}" stroke="${st.color}" stroke-width="${isBest ? 3.2 : 1.8}"${st.dash ? ` stroke-dasharray="${st.dash}"` : ''}/>`,
  );
  o.push(
    `<text x="${lx + 28}" y="${ly + 4}" font-size="12"${isBest ? ' font-weight="bold"' : ''}>${st.name}${isBest ? ' (best fit)' : ''}</text>`,
  );
  ly += 16;
  const detail = f.ok ? `nugget ${fmtNum(f.nugget)}, sill ${fmtNum(f.sill)}` : 'no usable fit';
  o.push(`<text x="${lx + 28}" y="${ly + 4}" font-size="11" fill="#444">${esc(detail)}</text>`);
  ly += 15;
  if (f.ok) {
    const rng = f.rangeAtLimit
      ? 'no sill within the data'
      : f.kind === 'spherical'
        ? `range ${f.range.toFixed(0)} m`
        : `a ${f.range.toFixed(0)} m, effective ${f.effectiveRange.toFixed(0)} m`;
    o.push(`<text x="${lx + 28}" y="${ly + 4}" font-size="11" fill="#444">${esc(rng)}</text>`);
    ly += 15;
  }
  return ly + 10;
}

/**
 * The empirical semivariogram (points sized by pair count, labelled with it; hollow where fewer than 30 pairs)
 * with the fitted models (the best one bold), its nugget, sill and effective range marked.
 * @param size width 860, height 520 px
 * @example writeFileSync('semivariogram.svg', semivariogramSvg({ semivariogram: r.semivariogram, fits: r.fits, best: r.best, label: r.label, unit: r.unit }))
 */
export function semivariogramSvg(
  input: SemivariogramChartInput,
  size: { width?: number; height?: number } = {},
): string {
  const p = plotOf(input, size.width ?? 860, size.height ?? 520);
  const minPairs = input.minPairs ?? 30;
  const o: string[] = [];
  axes(o, p, input);
  modelCurves(o, p, input);
  bestMarks(o, p, input.best);
  lagPoints(o, p, input.semivariogram, minPairs);
  legend(o, p, input, minPairs);
  o.push('</svg>');
  return o.join('\n');
}
