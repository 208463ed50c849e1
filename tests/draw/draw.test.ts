/**
 * The shared map renderer (src/draw/): frame fitting, scale bar, north arrow, legend, sample labels.
 */
import { describe, expect, it } from 'vitest';
import { makeFrame, mapSvg, northArrow, px, py, scaleBar } from '../../src/draw/frame.js';
import { labelsFit, MIN_LABEL_SPACING_PX, samplePoints } from '../../src/draw/layers.js';
import { legend } from '../../src/draw/legend.js';
import { trueNorthAtBox } from '../../src/draw/north.js';

describe('frame', () => {
  it('keeps the aspect ratio: one scale for x and y, the box whole inside the map area, centred across', () => {
    for (const [w, h] of [
      [800, 800],
      [1600, 400],
      [300, 1200],
      [0.5, 0.5],
    ] as const) {
      const bbox = [500000, 5700000, 500000 + w, 5700000 + h] as const;
      const f = makeFrame(bbox);
      // the drawn box's width / height in px equals the box's width / height in metres (one k for both axes)
      const dw = px(f, bbox[2]) - px(f, bbox[0]),
        dh = py(f, bbox[1]) - py(f, bbox[3]);
      if (w >= 1 && h >= 1) expect(dw / dh).toBeCloseTo(w / h, 9);
      expect(px(f, bbox[0])).toBeGreaterThanOrEqual(f.left);
      expect(px(f, bbox[2])).toBeLessThanOrEqual(f.left + f.w + 1e-9);
      expect(py(f, bbox[3])).toBeGreaterThanOrEqual(f.top);
      expect(py(f, bbox[1])).toBeLessThanOrEqual(f.top + f.h + 1e-9);
      // centred across: equal room left and right
      if (w >= 1 && h >= 1) expect(px(f, bbox[0]) - f.left).toBeCloseTo(f.left + f.w - px(f, bbox[2]), 6);
      expect(f.h).toBeLessThanOrEqual(700);
    }
  });

  it('an empty box (no geometry) still makes a frame', () => {
    const f = makeFrame([Infinity, Infinity, -Infinity, -Infinity]);
    expect(Number.isFinite(f.k) && f.k > 0).toBe(true);
  });
});

describe('scale bar', () => {
  it('its lengths are nice numbers (1, 2, 5 x 10^n; common practice) at most 30 % of the map wide', () => {
    for (const w of [50, 180, 804, 1609, 4000, 25000]) {
      const f = makeFrame([0, 0, w, w]);
      const s = scaleBar(f);
      const m = Number(s.match(/data-m="([\d.]+)"/)![1]);
      const ft = Number(s.match(/data-ft="([\d.]+)"/)![1]);
      for (const v of [m, ft]) {
        const mant = v / 10 ** Math.floor(Math.log10(v) + 1e-9);
        expect([1, 2, 5], `${v}`).toContain(Math.round(mant * 1e9) / 1e9);
      }
      expect(m * f.k).toBeLessThanOrEqual(0.3 * f.w + 1e-9);
      expect(ft * 0.3048 * f.k).toBeLessThanOrEqual(0.3 * f.w + 1e-9); // 1 ft = 0.3048 m exactly (NIST SP 811)
      expect(m * f.k).toBeGreaterThan(0.3 * f.w * 0.4); // the next nice length up would not fit
    }
  });
});

describe('north arrow', () => {
  it('turns by the true-north angle; west of the central meridian (northern hemisphere) it leans right', () => {
    const f = makeFrame([0, 0, 800, 800]);
    expect(northArrow(f, 0.78)).toContain('rotate(0.78 0 22)');
    expect(northArrow(f)).toContain('data-true-north-deg="0.000"');
    const utm = { zone: 13, south: false, epsg: 32613 };
    // zone 13's central meridian is 105° W; easting 431600 lies west of it, 568400 east of it
    expect(trueNorthAtBox(utm, [431000, 5741000, 432200, 5743000])).toBeGreaterThan(0.5);
    expect(trueNorthAtBox(utm, [568000, 5741000, 569200, 5743000])).toBeLessThan(-0.5);
    expect(trueNorthAtBox(undefined, [0, 0, 1, 1])).toBe(0);
  });
});

describe('legend', () => {
  it('one entry per item, in two columns past three items, with the colour bar and the notes', () => {
    const f = makeFrame([0, 0, 800, 800]);
    const items = ['< 10', '10 – < 20', '≥ 20'].map((label, i) => ({
      fill: ['#440154', '#21918c', '#fde725'][i]!,
      label,
    }));
    const three = legend(f, 'P (ppm)', items);
    expect((three.svg.match(/class="swatch"/g) ?? []).length).toBe(3);
    const six = legend(
      f,
      'P (ppm)',
      [
        ...items,
        { fill: '#fff', symbol: 'point', label: 'sample' },
        { fill: '#fff', symbol: 'ring', label: 'low sample' },
        { fill: 'none', symbol: 'line', label: 'boundary' },
      ],
      ['a note'],
      { ramp: 'viridis', min: 0, max: 40, threshold: { value: 10, label: '10 low' } },
    );
    expect((six.svg.match(/class="swatch"/g) ?? []).length).toBe(3);
    expect((six.svg.match(/class="lg-t"/g) ?? []).length).toBe(6);
    expect(
      new Set([...six.svg.matchAll(/<text x="([\d.]+)" y="[\d.]+" class="lg-t"/g)].map((m) => m[1])).size,
    ).toBe(2);
    expect(six.svg).toContain('>10 low</text>');
    expect(six.svg).toContain('>a note</tspan>');
    expect(six.bottom).toBeGreaterThan(three.bottom);
    const svg = mapSvg(f, { id: 'm', kind: 'samples', aria: 'x', standalone: true }, '', six);
    expect(svg).toMatch(/^<svg class="map"[^>]+ width="732" height="\d+"/);
    expect(svg).toContain('<style>');
  });
});

describe('sample labels', () => {
  it('stay inside the drawing and clear of the north arrow', () => {
    const f = makeFrame([0, 0, 800, 800]);
    // a sample near the north-east corner, beside the north arrow, with a long label
    const s = samplePoints(f, [{ x: 700, y: 790, label: 'HQ-08: 13.0', low: true }], { lowLabels: true });
    const m = s.match(/<text x="([\d.]+)" y="([\d.]+)"(?: text-anchor="(end|middle)")?>/)!;
    const w = 'HQ-08: 13.0'.length * 7.2;
    const x0 = Number(m[1]) - (m[3] === 'end' ? w : m[3] === 'middle' ? w / 2 : 0);
    expect(x0 + w).toBeLessThanOrEqual(f.left + f.w + 16);
    expect(Number(m[2]) - 11 >= f.top + 74 || x0 + w <= f.left + f.w - 52).toBe(true);
  });

  it('are left out, dots kept, when the samples are too close together on the map to read them', () => {
    // an 800 m square drawn about 660 px wide: a grid of m x m samples lies 660 / m px apart
    const f = makeFrame([0, 0, 800, 800]);
    const grid = (m: number) =>
      Array.from({ length: m * m }, (_, i) => ({
        x: ((i % m) + 0.5) * (800 / m),
        y: (Math.floor(i / m) + 0.5) * (800 / m),
        label: '17.0',
      }));
    const spacing = (m: number) => Math.sqrt((f.w * f.h) / (m * m));
    for (const m of [8, 20, 27, 28, 40, 71]) {
      const s = samplePoints(f, grid(m));
      const texts = (s.match(/<text /g) ?? []).length;
      const dots = (s.match(/<circle /g) ?? []).length;
      expect(dots).toBe(m * m);
      expect(labelsFit(f, m * m)).toBe(spacing(m) >= MIN_LABEL_SPACING_PX);
      expect(texts).toBe(spacing(m) >= MIN_LABEL_SPACING_PX ? m * m : 0);
    }
    // only labelled samples count: 5041 dots with 31 labels keep their labels
    const many = grid(71).map((p, i) => ({ ...p, label: i % 168 === 0 ? 'L' : null }));
    expect((samplePoints(f, many).match(/<text /g) ?? []).length).toBe(31);
  });
});
