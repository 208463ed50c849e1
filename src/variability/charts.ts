/**
 * What the variability study's hand-written SVG charts share (no chart library: small, fixed layouts; see
 * docs/variability.md): the font and number formats (axis ticks, word wrapping, escaping and colours come from src/draw/). The charts
 * are semivariogramChart.ts, sampleMap.ts and chanceChart.ts; each returns a complete, standalone SVG document.
 */

/** The charts' font attribute. */
export const FONT = 'font-family="DejaVu Sans, Arial, Helvetica, sans-serif"';

/** 3 significant digits without exponent for everyday magnitudes. */
export function fmtNum(x: number): string {
  if (!Number.isFinite(x)) return '-';
  if (x === 0) return '0';
  const a = Math.abs(x);
  return a >= 1000 ? x.toFixed(0) : a >= 0.001 ? String(Number(x.toPrecision(3))) : x.toExponential(2);
}
