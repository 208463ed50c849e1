/**
 * Colour ramps for every map and chart: sequential, perceptually uniform and readable with colour-vision
 * deficiency, because their lightness rises steadily from one end to the other.
 *
 * The ramps come from d3-scale-chromatic: viridis and magma are matplotlib's 256-colour tables (van der Walt
 * and Smith, CC0), cividis is d3's polynomial fit to the table of Nuñez, Anderton and Renslow 2018 (PLoS ONE
 * 13(8)); tests/draw/colour.test.ts compares them with the values R's viridisLite prints.
 *
 * Our own assignment: soil surfaces use viridis, response probability magma (darker = more likely to
 * respond), product rates cividis (lighter = more product), binding limits the Okabe-Ito qualitative set.
 */
import { interpolateCividis, interpolateMagma, interpolateViridis } from 'd3-scale-chromatic';

export type RampName = 'viridis' | 'magma' | 'cividis';

const RAMPS: Record<RampName, (t: number) => string> = {
  viridis: interpolateViridis,
  magma: interpolateMagma,
  cividis: interpolateCividis,
};

/** Part of each ramp used, so that the darkest class is not black and the lightest not white. */
const RANGE: Record<RampName, [number, number]> = {
  viridis: [0, 1],
  magma: [0.2, 0.92],
  cividis: [0.05, 1],
};

/**
 * Okabe and Ito (2008) colour-universal-design palette, qualitative (from memory), without black:
 * orange, sky blue, bluish green, yellow, blue, vermillion, reddish purple.
 */
export const QUALITATIVE = ['#e69f00', '#56b4e9', '#009e73', '#f0e442', '#0072b2', '#d55e00', '#cc79a7'];

/** Red of low samples and of the threshold on a colour bar. */
export const LOW_RED = '#e31a1c';

/** Grey for "no value" / "no limit binds". */
export const NEUTRAL = '#d9d9d9';

/** "#rrggbb" or d3's "rgb(r, g, b)" to [r, g, b]. */
function toRgb(c: string): [number, number, number] {
  if (c.startsWith('#')) {
    const n = parseInt(c.slice(1), 16);
    return [(n >> 16) & 255, (n >> 8) & 255, n & 255];
  }
  const m = c.match(/\d+/g) ?? [];
  return [Number(m[0] ?? 0), Number(m[1] ?? 0), Number(m[2] ?? 0)];
}

/**
 * The colour at t (0..1, clamped; NaN reads as 0) of a ramp's full range, as [r, g, b] 0-255.
 * @example rampRgb('viridis', 0) // [68, 1, 84]
 */
export function rampRgb(name: RampName, t: number): [number, number, number] {
  return toRgb(RAMPS[name](Math.min(1, Math.max(0, Number.isFinite(t) ? t : 0))));
}

/**
 * The colour at t (0..1) of a ramp's full range as "#rrggbb": the one ramp function every map and chart uses.
 * @example ramp('viridis', 1) // '#fde725'
 */
export function ramp(name: RampName, t: number): string {
  return rgbHex(rampRgb(name, t));
}

/** [r, g, b] to "#rrggbb". */
export function rgbHex(c: readonly number[]): string {
  return '#' + c.map((v) => v.toString(16).padStart(2, '0')).join('');
}

/**
 * n class colours from a ramp, lowest class first, spread over the ramp's used range.
 * @example classColours('viridis', 3) // ['#440154', '#21918c', '#fde725']
 */
export function classColours(name: RampName, n: number): string[] {
  const [lo, hi] = RANGE[name];
  if (n <= 0) return [];
  if (n === 1) return [ramp(name, (lo + hi) / 2)];
  return Array.from({ length: n }, (_, i) => ramp(name, lo + ((hi - lo) * i) / (n - 1)));
}

/**
 * Colours for distinct rates (ascending), placed on the ramp by value rather than by rank, so that equal
 * rates share a colour and close rates get close colours: the ramp spans the larger of the rates' range and
 * four times `close` (the smallest difference that counts), so two rates less than `close` apart sit at most
 * a quarter of the ramp apart; a single rate takes the ramp's middle.
 * @example rateColours('cividis', [206, 212, 215], 21) // three dark blues, not dark blue, grey and yellow
 */
export function rateColours(name: RampName, rates: readonly number[], close = 0): string[] {
  if (rates.length === 0) return [];
  const [lo, hi] = RANGE[name];
  const min = Math.min(...rates),
    span = Math.max(Math.max(...rates) - min, 4 * close);
  if (rates.length === 1 || !(span > 0)) return rates.map(() => ramp(name, (lo + hi) / 2));
  return rates.map((v) => ramp(name, lo + ((hi - lo) * (v - min)) / span));
}

/**
 * Text colour that reads on a fill: black on light fills, white on dark (by WCAG relative luminance).
 * @example textOn('#fde725') // '#000'
 */
export function textOn(fill: string): string {
  const [r, g, b] = toRgb(fill).map((v) => {
    const c = v / 255;
    return c <= 0.04045 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4;
  }) as [number, number, number];
  const y = 0.2126 * r + 0.7152 * g + 0.0722 * b;
  return y > 0.18 ? '#000' : '#fff';
}
