/**
 * Hand-written SVG charts for the variability study (no chart library: two small, fixed layouts; see
 * docs/variability.md). Exported so the report can embed the same charts. Both return a complete,
 * standalone SVG document as a string.
 */
import type { Grid, RingsPart } from '../types.js';
import type { Semivariogram } from './semivariogram.js';
import { modelAt, type FittedModel } from './fit.js';

const FONT = 'font-family="DejaVu Sans, Arial, Helvetica, sans-serif"';

/** Escapes text for SVG/XML. */
export function esc(s: string): string {
  return s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');
}

/**
 * "Nice" axis ticks (1, 2, 2.5, 5 x 10^k steps) inside [lo, hi], or, with `cover`, reaching just past both ends.
 * @example niceTicks(0, 0.7) // [0, 0.1, 0.2, ..., 0.7]
 * @example niceTicks(0, 1597, 6, true) // [0, 500, 1000, 1500, 2000]
 */
export function niceTicks(lo: number, hi: number, target = 6, cover = false): number[] {
  if (!(hi > lo)) return [lo];
  const raw = (hi - lo) / target;
  const mag = Math.pow(10, Math.floor(Math.log10(raw)));
  const step = [1, 2, 2.5, 5, 10].map((m) => m * mag).find((s) => s >= raw) ?? 10 * mag;
  const out: number[] = [];
  const first = cover ? Math.floor(lo / step + 1e-9) : Math.ceil(lo / step - 1e-9);
  const last = cover ? Math.ceil(hi / step - 1e-9) : Math.floor(hi / step + 1e-9);
  for (let k = first; k <= last; k++) {
    const t = k * step;
    out.push(Math.abs(t) < step * 1e-9 ? 0 : Number(t.toPrecision(12)));
  }
  return out;
}

/** 3 significant digits without exponent for everyday magnitudes. */
export function fmtNum(x: number): string {
  if (!Number.isFinite(x)) return '-';
  if (x === 0) return '0';
  const a = Math.abs(x);
  return a >= 1000 ? x.toFixed(0) : a >= 0.001 ? String(Number(x.toPrecision(3))) : x.toExponential(2);
}

function fmtTick(t: number, step: number): string {
  const d = step >= 1 ? 0 : Math.min(6, Math.ceil(-Math.log10(step) - 1e-9));
  return t.toFixed(d);
}

/** Viridis colour map (matplotlib's anchors, linearly interpolated) at t in 0..1. */
export function viridis(t: number): string {
  const a = [
    [68, 1, 84],
    [72, 40, 120],
    [62, 74, 137],
    [49, 104, 142],
    [38, 130, 142],
    [31, 158, 137],
    [53, 183, 121],
    [109, 205, 89],
    [180, 222, 44],
    [253, 231, 37],
  ];
  const x = Math.min(1, Math.max(0, Number.isFinite(t) ? t : 0)) * (a.length - 1);
  const i = Math.min(a.length - 2, Math.floor(x));
  const f = x - i;
  const c = a[i].map((v, k) => Math.round(v + (a[i + 1][k] - v) * f));
  return `rgb(${c[0]},${c[1]},${c[2]})`;
}

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

/**
 * The empirical semivariogram (points sized by pair count, labelled with it; hollow where fewer than 30 pairs)
 * with the fitted models (the best one bold), its nugget, sill and effective range marked.
 * @example writeFileSync('semivariogram.svg', semivariogramSvg({ semivariogram: r.semivariogram, fits: r.fits, best: r.best, label: r.label, unit: r.unit }))
 */
export function semivariogramSvg(
  input: SemivariogramChartInput,
  size: { width?: number; height?: number } = {},
): string {
  const W = size.width ?? 860;
  const H = size.height ?? 520;
  const m = { l: 88, r: 250, t: 56, b: 64 };
  const pw = W - m.l - m.r;
  const ph = H - m.t - m.b;
  const v = input.semivariogram;
  const minPairs = input.minPairs ?? 30;
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
  const unit2 = input.transform === 'log' ? `(ln ${input.unit})²` : `(${input.unit})²`;
  const o: string[] = [];
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
  // grid and axes
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
  // cutoff marker
  if (v.cutoff > 0)
    o.push(
      `<line x1="${sx(v.cutoff)}" y1="${m.t}" x2="${sx(v.cutoff)}" y2="${m.t + ph}" stroke="#999" stroke-dasharray="3 3"/>`,
    );
  // models
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
  const b = input.best;
  if (b) {
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
  // points
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
  // legend
  const lx = m.l + pw + 18;
  let ly = m.t + 8;
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
  for (const f of input.fits) {
    const st = MODEL_STYLE[f.kind];
    const isBest = f === b;
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
    ly += 10;
  }
  o.push(
    `<line x1="${lx}" y1="${ly}" x2="${lx + 22}" y2="${ly}" stroke="#999" stroke-dasharray="3 3"/><text x="${lx + 28}" y="${ly + 4}" font-size="12">cutoff</text>`,
  );
  o.push('</svg>');
  return o.join('\n');
}

export interface SampleMapInput {
  /** field boundary parts in metres (Field.parts) */
  parts: RingsPart[];
  /** sample positions x0 y0 ... metres */
  xy: ArrayLike<number>;
  values: ArrayLike<number>;
  ids: string[];
  label: string;
  unit: string;
  /** "low" means below; null for no marking */
  threshold: number | null;
  /** the threshold value itself counts as low (default false) */
  thresholdInclusive?: boolean;
  /** optional interpolated surface drawn beneath the samples */
  surface?: {
    grid: Grid;
    values: ArrayLike<number>;
    /** legend text, default 'interpolated (IDW)' */ label?: string;
  };
}

/**
 * A map of the nutrient: the field outline, the samples coloured by value (viridis), low samples ringed in red
 * and labelled with their ids, a colour legend with the threshold, a scale bar and a north arrow.
 * @example writeFileSync('map.svg', sampleMapSvg({ parts: field.parts, xy: samples.xy, values: samples.values.so4_s, ids: samples.ids, label: 'sulphate-S', unit: 'lb S/ac', threshold: 20 }))
 */
export function sampleMapSvg(input: SampleMapInput, size: { width?: number; height?: number } = {}): string {
  const W = size.width ?? 860;
  const H = size.height ?? 640;
  const m = { l: 96, r: 236, t: 60, b: 56 };
  let xmin = Infinity,
    ymin = Infinity,
    xmax = -Infinity,
    ymax = -Infinity;
  const grow = (x: number, y: number) => {
    if (x < xmin) xmin = x;
    if (x > xmax) xmax = x;
    if (y < ymin) ymin = y;
    if (y > ymax) ymax = y;
  };
  for (const p of input.parts)
    for (let i = 0; i < p.exterior.length; i += 2) grow(p.exterior[i], p.exterior[i + 1]);
  for (let i = 0; i < input.xy.length; i += 2)
    if (Number.isFinite(input.values[i / 2])) grow(input.xy[i], input.xy[i + 1]);
  if (!Number.isFinite(xmin)) {
    xmin = 0;
    ymin = 0;
    xmax = 1;
    ymax = 1;
  }
  const pw = W - m.l - m.r;
  const ph = H - m.t - m.b;
  const scale = Math.min(pw / Math.max(xmax - xmin, 1e-9), ph / Math.max(ymax - ymin, 1e-9)) * 0.94;
  const ox = m.l + (pw - (xmax - xmin) * scale) / 2;
  const oy = m.t + (ph - (ymax - ymin) * scale) / 2;
  const sx = (x: number) => ox + (x - xmin) * scale;
  const sy = (y: number) => oy + (ymax - y) * scale;

  let vmin = Infinity,
    vmax = -Infinity;
  for (let i = 0; i < input.values.length; i++) {
    const v = input.values[i];
    if (!Number.isFinite(v)) continue;
    if (v < vmin) vmin = v;
    if (v > vmax) vmax = v;
  }
  if (input.surface)
    for (let i = 0; i < input.surface.values.length; i++) {
      const v = input.surface.values[i];
      if (Number.isFinite(v)) {
        if (v < vmin) vmin = v;
        if (v > vmax) vmax = v;
      }
    }
  if (!Number.isFinite(vmin)) {
    vmin = 0;
    vmax = 1;
  }
  if (vmax === vmin) vmax = vmin + 1;
  const col = (v: number) => viridis((v - vmin) / (vmax - vmin));

  const o: string[] = [];
  o.push(
    `<svg xmlns="http://www.w3.org/2000/svg" width="${W}" height="${H}" viewBox="0 0 ${W} ${H}" ${FONT}>`,
  );
  o.push(`<rect width="${W}" height="${H}" fill="white"/>`);
  o.push(
    `<text x="${m.l}" y="28" font-size="19" font-weight="bold">${esc(input.label)} (${esc(input.unit)})</text>`,
  );
  const isLow = (i: number) =>
    input.threshold !== null &&
    Number.isFinite(input.values[i]) &&
    (input.values[i] < input.threshold ||
      (Boolean(input.thresholdInclusive) && input.values[i] === input.threshold));
  let nLow = 0;
  for (let i = 0; i < input.values.length; i++) if (isLow(i)) nLow++;
  o.push(
    `<text x="${m.l}" y="46" font-size="13" fill="#444">${input.threshold === null ? 'samples coloured by value' : `${nLow} sample(s) ${input.thresholdInclusive ? 'at or below' : 'below'} ${input.threshold} ${esc(input.unit)} ringed in red`}</text>`,
  );
  let drawnNote = '';
  if (input.surface) {
    // drawn at display resolution: cells under 1.5 px are shown coarser by a whole factor, each coarse cell the
    // value of the fine cell at its centre (nearest); colours quantised to 48 steps and equal neighbours in a
    // row merged into one rectangle (small files)
    const g = input.surface.grid,
      vals = input.surface.values;
    const f = Math.max(1, Math.ceil(1.5 / (g.cell * scale)));
    if (f > 1) drawnNote = `, drawn at ${f * g.cell} m cells`;
    const cols = Math.ceil(g.cols / f),
      rows = Math.ceil(g.rows / f);
    const at = (r: number, c: number) =>
      Math.min(g.rows - 1, r * f + (f >> 1)) * g.cols + Math.min(g.cols - 1, c * f + (f >> 1));
    const q = (v: number) => Math.round(((v - vmin) / (vmax - vmin)) * 47);
    const shown = (k: number) => g.mask[k] && Number.isFinite(vals[k]);
    // opacity on the group, so the slight overlaps that hide seams do not darken
    o.push('<g opacity="0.75" shape-rendering="crispEdges">');
    for (let r = 0; r < rows; r++) {
      let c = 0;
      while (c < cols) {
        const k = at(r, c);
        if (!shown(k)) {
          c++;
          continue;
        }
        const b = q(vals[k]);
        let e = c + 1;
        while (e < cols && shown(at(r, e)) && q(vals[at(r, e)]) === b) e++;
        const x0 = g.xmin + c * f * g.cell;
        const y0 = g.ymax - r * f * g.cell;
        o.push(
          `<rect x="${sx(x0).toFixed(1)}" y="${sy(y0).toFixed(1)}" width="${((e - c) * f * g.cell * scale + 0.6).toFixed(1)}" height="${(f * g.cell * scale + 0.6).toFixed(1)}" fill="${viridis(b / 47)}"/>`,
        );
        c = e;
      }
    }
    o.push('</g>');
  }
  // boundary
  let d = '';
  for (const p of input.parts)
    for (const ring of [p.exterior, ...p.holes]) {
      for (let i = 0; i < ring.length; i += 2)
        d += `${i ? 'L' : 'M'}${sx(ring[i]).toFixed(1)} ${sy(ring[i + 1]).toFixed(1)}`;
      d += 'Z';
    }
  o.push(
    `<path d="${d}" fill="${input.surface ? 'none' : '#f4f1e8'}" fill-rule="evenodd" stroke="#222" stroke-width="2"/>`,
  );
  // samples: others first, low on top
  const order: number[] = [];
  for (let i = 0; i < input.values.length; i++) if (Number.isFinite(input.values[i])) order.push(i);
  order.sort((a, b) => Number(isLow(a)) - Number(isLow(b)));
  const labels: string[] = [];
  // sample dots are obstacles for labels too
  const taken: [number, number, number, number][] = order.map((i) => {
    const x = sx(input.xy[2 * i]);
    const y = sy(input.xy[2 * i + 1]);
    return [x - 8, y - 8, x + 8, y + 8];
  });
  for (const i of order) {
    const x = sx(input.xy[2 * i]);
    const y = sy(input.xy[2 * i + 1]);
    o.push(
      `<circle cx="${x.toFixed(1)}" cy="${y.toFixed(1)}" r="7" fill="${col(input.values[i])}" stroke="#222" stroke-width="1"/>`,
    );
    if (isLow(i)) {
      o.push(
        `<circle cx="${x.toFixed(1)}" cy="${y.toFixed(1)}" r="12" fill="none" stroke="#e31a1c" stroke-width="3"/>`,
      );
      const label = `${input.ids[i]}: ${fmtVal(input.values[i])}`;
      const w = label.length * 7.2;
      // first free spot of right, left, above, below (simple collision avoidance); else right
      const spots: [number, number, string][] = [
        [x + 15, y + 4, 'start'],
        [x - 15, y + 4, 'end'],
        [x, y - 17, 'middle'],
        [x, y + 25, 'middle'],
        [x + 12, y - 14, 'start'],
        [x - 12, y - 14, 'end'],
        [x + 12, y + 22, 'start'],
        [x - 12, y + 22, 'end'],
      ];
      const box = (sp: [number, number, string]): [number, number, number, number] => {
        const x0 = sp[2] === 'start' ? sp[0] : sp[2] === 'end' ? sp[0] - w : sp[0] - w / 2;
        return [x0, sp[1] - 11, x0 + w, sp[1] + 3];
      };
      const own = (t: [number, number, number, number]) =>
        Math.abs(t[0] + 8 - x) < 1e-6 && Math.abs(t[1] + 8 - y) < 1e-6;
      const free = (b: [number, number, number, number]) =>
        b[0] >= 4 &&
        b[2] <= W - m.r + 36 &&
        b[1] >= m.t - 4 &&
        b[3] <= H - m.b + 20 &&
        taken.every((t) => own(t) || b[2] < t[0] || b[0] > t[2] || b[3] < t[1] || b[1] > t[3]);
      const sp = spots.find((p) => free(box(p))) ?? spots[0];
      taken.push(box(sp));
      labels.push(
        `<text x="${sp[0].toFixed(1)}" y="${sp[1].toFixed(1)}" font-size="12" font-weight="bold" text-anchor="${sp[2]}" fill="#b10026" stroke="white" stroke-width="3" paint-order="stroke">${esc(label)}</text>`,
      );
    }
  }
  o.push(...labels);
  // colour legend
  const lx = W - m.r + 58;
  const ly = m.t + 20;
  const lh = Math.min(300, ph - 120);
  o.push(`<text x="${lx}" y="${ly - 8}" font-size="13" font-weight="bold">${esc(input.unit)}</text>`);
  const steps = 40;
  for (let k = 0; k < steps; k++) {
    const t = 1 - k / steps;
    o.push(
      `<rect x="${lx}" y="${(ly + (lh * k) / steps).toFixed(1)}" width="22" height="${(lh / steps + 0.5).toFixed(1)}" fill="${viridis(t)}"/>`,
    );
  }
  o.push(`<rect x="${lx}" y="${ly}" width="22" height="${lh}" fill="none" stroke="#333"/>`);
  const vy = (v: number) => ly + lh * (1 - (v - vmin) / (vmax - vmin));
  const ticks = niceTicks(vmin, vmax, 5).filter((t) => t >= vmin - 1e-9 && t <= vmax + 1e-9);
  const tstep = ticks.length > 1 ? ticks[1] - ticks[0] : 1;
  for (const t of ticks) {
    o.push(
      `<line x1="${lx + 22}" y1="${vy(t).toFixed(1)}" x2="${lx + 28}" y2="${vy(t).toFixed(1)}" stroke="#333"/>`,
    );
    o.push(`<text x="${lx + 32}" y="${(vy(t) + 4).toFixed(1)}" font-size="12">${fmtTick(t, tstep)}</text>`);
  }
  if (input.threshold !== null && input.threshold >= vmin && input.threshold <= vmax) {
    const y = vy(input.threshold);
    o.push(
      `<line x1="${lx - 6}" y1="${y.toFixed(1)}" x2="${lx + 28}" y2="${y.toFixed(1)}" stroke="#e31a1c" stroke-width="3"/>`,
    );
    o.push(
      `<text x="${lx + 32}" y="${(y + 4).toFixed(1)}" font-size="12" font-weight="bold" fill="#b10026" stroke="white" stroke-width="3" paint-order="stroke">${input.threshold} low</text>`,
    );
  }
  let ky = ly + lh + 40;
  o.push(
    `<circle cx="${lx + 10}" cy="${ky}" r="7" fill="${viridis(0.5)}" stroke="#222"/><text x="${lx + 26}" y="${ky + 4}" font-size="12">sample</text>`,
  );
  ky += 28;
  if (input.threshold !== null) {
    o.push(
      `<circle cx="${lx + 10}" cy="${ky}" r="7" fill="${viridis(0.1)}" stroke="#222"/><circle cx="${lx + 10}" cy="${ky}" r="12" fill="none" stroke="#e31a1c" stroke-width="3"/><text x="${lx + 28}" y="${ky + 4}" font-size="12">low sample (id: value)</text>`,
    );
    ky += 26;
  }
  o.push(
    `<line x1="${lx}" y1="${ky}" x2="${lx + 22}" y2="${ky}" stroke="#222" stroke-width="2"/><text x="${lx + 28}" y="${ky + 4}" font-size="12">field boundary</text>`,
  );
  if (input.surface) {
    ky += 26;
    o.push(
      `<rect x="${lx}" y="${ky - 8}" width="22" height="16" fill="${viridis(0.4)}" opacity="0.75"/><text x="${lx + 28}" y="${ky + 4}" font-size="12">${esc((input.surface.label ?? 'interpolated (IDW)') + drawnNote)}</text>`,
    );
  }
  // scale bar: a nice length about a quarter of the map width
  const target = (xmax - xmin) / 4;
  const mag = Math.pow(10, Math.floor(Math.log10(Math.max(target, 1))));
  const len =
    [1, 2, 5, 10]
      .map((k) => k * mag)
      .filter((l) => l <= target)
      .pop() ?? mag;
  const bx = 24;
  const by = H - 22;
  o.push(`<rect x="${bx}" y="${by - 6}" width="${(len * scale).toFixed(1)}" height="6" fill="#222"/>`);
  o.push(
    `<text x="${bx}" y="${by - 10}" font-size="12">0</text><text x="${(bx + len * scale).toFixed(1)}" y="${by - 10}" font-size="12" text-anchor="middle">${len >= 1000 ? len / 1000 + ' km' : len + ' m'}</text>`,
  );
  // north arrow under the legend (the map is drawn in UTM metres: grid north up)
  const nx = lx + 11;
  const ny = ky + 30;
  o.push(
    `<path d="M${nx} ${ny} l8 22 l-8 -6 l-8 6 Z" fill="#222"/><text x="${nx}" y="${ny + 38}" font-size="13" text-anchor="middle" font-weight="bold">N</text>`,
  );
  o.push('</svg>');
  return o.join('\n');
}

function fmtVal(v: number): string {
  return Math.abs(v) >= 100 ? v.toFixed(0) : v.toFixed(1);
}
