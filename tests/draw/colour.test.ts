import { describe, expect, it } from 'vitest';
import {
  classColours,
  QUALITATIVE,
  rampRgb,
  rateColours,
  textOn,
  type RampName,
} from '../../src/draw/colour.js';

/** CIE 1976 L* of an sRGB colour (sRGB transfer function IEC 61966-2-1; L* from CIE 15:2004). */
function lightness(hex: string): number {
  const n = parseInt(hex.slice(1), 16);
  const lin = [(n >> 16) & 255, (n >> 8) & 255, n & 255].map((v) => {
    const c = v / 255;
    return c <= 0.04045 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4;
  });
  const y = 0.2126 * lin[0]! + 0.7152 * lin[1]! + 0.0722 * lin[2]!;
  return y > 216 / 24389 ? 116 * Math.cbrt(y) - 16 : (24389 / 27) * y;
}

describe('colour ramps', () => {
  const ramps: RampName[] = ['viridis', 'magma', 'cividis'];

  it('lightness (CIE L*) rises steadily along each ramp, so classes read in order without hue (colour-blind safe)', () => {
    for (const r of ramps) {
      let prev = -1;
      for (let i = 0; i <= 100; i++) {
        const [R, G, B] = rampRgb(r, i / 100);
        const L = lightness('#' + [R, G, B].map((v) => v.toString(16).padStart(2, '0')).join(''));
        expect(L, `${r} at ${i / 100}`).toBeGreaterThan(prev - 0.5); // interpolation rounding of 8-bit channels
        prev = L;
      }
    }
  });

  it('neighbouring classes differ in lightness by at least 5 L* for up to 7 classes', () => {
    for (const r of ramps)
      for (let n = 2; n <= 7; n++) {
        const L = classColours(r, n).map(lightness);
        for (let i = 1; i < n; i++)
          expect(L[i]! - L[i - 1]!, `${r} n=${n} class ${i}`).toBeGreaterThanOrEqual(5);
      }
  });

  it("viridis ends at matplotlib's published end colours #440154 and #fde725 (matplotlib _cm_listed.py _viridis_data, first and last rows)", () => {
    expect(classColours('viridis', 2)).toEqual(['#440154', '#fde725']);
  });

  const channelsOff = (hex: string, rgb: readonly number[]): number => {
    const n = parseInt(hex.slice(1), 16);
    return Math.max(...[(n >> 16) & 255, (n >> 8) & 255, n & 255].map((v, k) => Math.abs(v - rgb[k]!)));
  };

  it('viridis and magma match R viridisLite viridis(9) and magma(9) within 2 of 255 per channel (from memory)', () => {
    // viridisLite interpolates matplotlib's 256-colour tables; d3 takes the nearest of the 256
    const published: Record<'viridis' | 'magma', string[]> = {
      viridis: [
        '#440154',
        '#472d7b',
        '#3b528b',
        '#2c728e',
        '#21918c',
        '#28ae80',
        '#5ec962',
        '#addc30',
        '#fde725',
      ],
      magma: [
        '#000004',
        '#1d1147',
        '#51127c',
        '#822681',
        '#b63679',
        '#e65164',
        '#fb8861',
        '#fec287',
        '#fcfdbf',
      ],
    };
    for (const [name, hexes] of Object.entries(published) as ['viridis' | 'magma', string[]][])
      hexes.forEach((h, i) =>
        expect(channelsOff(h, rampRgb(name, i / 8)), `${name} ${i}/8`).toBeLessThanOrEqual(2),
      );
  });

  it('cividis matches R viridisLite cividis(10) within 6 of 255 per channel, 13 near the dark end (from memory)', () => {
    // d3's cividis is a polynomial fit to the published table: it strays most at the dark end
    const published = [
      '#00204d',
      '#00336f',
      '#39486b',
      '#575c6d',
      '#707173',
      '#8a8779',
      '#a69d75',
      '#c4b56c',
      '#e4cf5b',
      '#ffea46',
    ];
    published.forEach((h, i) =>
      expect(channelsOff(h, rampRgb('cividis', i / 9)), `cividis ${i}/9`).toBeLessThanOrEqual(
        i === 1 ? 13 : 6,
      ),
    );
  });

  it('label text is black on light fills and white on dark (WCAG 2 contrast of at least 4.5:1)', () => {
    const contrast = (a: string, b: string): number => {
      const lum = (h: string): number => {
        const full = h.length === 4 ? '#' + [...h.slice(1)].map((c) => c + c).join('') : h;
        const n = parseInt(full.slice(1), 16);
        const [r, g, bl] = [(n >> 16) & 255, (n >> 8) & 255, n & 255].map((v) => {
          const c = v / 255;
          return c <= 0.03928 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4;
        });
        return 0.2126 * r! + 0.7152 * g! + 0.0722 * bl!;
      };
      const [x, y] = [lum(a), lum(b)].sort((p, q) => q - p);
      return (x! + 0.05) / (y! + 0.05);
    };
    for (const r of ramps)
      for (const c of classColours(r, 7)) expect(contrast(c, textOn(c))).toBeGreaterThanOrEqual(4.5);
    for (const c of QUALITATIVE) expect(contrast(c, textOn(c))).toBeGreaterThanOrEqual(4.5);
  });

  it('rate legends: equal rates share a colour, rates closer than the minimum difference stay close, far rates span the ramp', () => {
    // the ramp's end colours for the lowest and highest rate when the rates differ by far more than the minimum
    expect(rateColours('cividis', [0, 117], 5)).toEqual(classColours('cividis', 2));
    // the demo's old urea rates 206, 212, 215 with a minimum difference of 21: all within a quarter of the ramp,
    // measured as CIE L* (cividis' lightness spans about 80 L* units end to end)
    const [a, b, c] = rateColours('cividis', [206, 212, 215], 21).map(lightness);
    const span = Math.abs(
      lightness(classColours('cividis', 2)[1]!) - lightness(classColours('cividis', 2)[0]!),
    );
    expect(Math.max(a!, b!, c!) - Math.min(a!, b!, c!)).toBeLessThan(span / 4);
    // one rate: the ramp's middle, like a single class
    expect(rateColours('cividis', [87], 5)).toEqual(classColours('cividis', 1));
    // colours follow the rates' order (lightness rises with the rate)
    const ls = rateColours('cividis', [20, 40, 60, 90], 5).map(lightness);
    for (let i = 1; i < ls.length; i++) expect(ls[i]!).toBeGreaterThan(ls[i - 1]!);
  });
});
