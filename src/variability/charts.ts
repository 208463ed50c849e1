/**
 * What the variability study's hand-written SVG charts share (no chart library: small, fixed layouts; see
 * docs/variability.md): nice axis ticks, number formats and word wrapping (text escaping is src/draw/escape.ts, colours src/draw/colour.ts). The charts
 * are semivariogramChart.ts, sampleMap.ts and chanceChart.ts; each returns a complete, standalone SVG document.
 */

/** The charts' font attribute. */
export const FONT = 'font-family="DejaVu Sans, Arial, Helvetica, sans-serif"';

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

/** A tick label with as many decimals as the step needs. */
export function fmtTick(t: number, step: number): string {
  const d = step >= 1 ? 0 : Math.min(6, Math.ceil(-Math.log10(step) - 1e-9));
  return t.toFixed(d);
}

/**
 * Words wrapped into lines of at most `max` characters (a longer word gets a line of its own).
 * @example wrapWords('a b c', 3) // ['a b', 'c']
 */
export function wrapWords(text: string, max: number): string[] {
  const lines: string[] = [];
  let cur = '';
  for (const w of text.split(/\s+/).filter(Boolean)) {
    if (cur && cur.length + 1 + w.length > max) {
      lines.push(cur);
      cur = w;
    } else cur = cur ? `${cur} ${w}` : w;
  }
  if (cur) lines.push(cur);
  return lines;
}
