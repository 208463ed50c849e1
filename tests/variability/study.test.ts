/**
 * The variability study as a whole on a synthetic field: low spots and the sulphate-S findings, thresholds,
 * the text, the charts and their place in the report.
 */
import { describe, expect, it } from 'vitest';
import {
  analyzeVariability,
  areaShareBelow,
  defaultThreshold,
  sampleMapSvg,
  sampleShareBelow,
  semivariogramSvg,
} from '../../src/variability/index.js';
import { niceTicks } from '../../src/draw/ticks.js';
import { syntheticField } from '../helpers/variabilityField.js';

describe('analyzeVariability on sulphate-S', () => {
  it('lists the low samples, says a composite hides them, states the floor', () => {
    const { samples, field } = syntheticField();
    const r = analyzeVariability(samples, field, { nutrient: 'so4_s' });
    // default threshold: 20 lb S/ac ([published] Canola Encyclopedia, responses below 20-30 lb/ac)
    expect(r.threshold?.value).toBe(20);
    expect(defaultThreshold('so4_s')?.source).toMatch(/Canola Encyclopedia/);
    expect(r.low.map((l) => l.id).sort()).toEqual(['S36', 'S37', 'S43', 'S44']);
    expect(r.shareBelow?.samples).toBeCloseTo(4 / 49, 12);
    expect(r.sulphur?.compositeReadsNotLow).toBe(true);
    expect(r.sulphur?.compositeHidesLow).toBe(true);
    expect(r.sulphur?.notLowIsUncertain).toMatch(/not low says little/);
    expect(r.sulphur?.floor).toBe(10); // common practice: about 10 lb S/ac for canola regardless of test
    expect(r.semivariogram.np.length).toBeGreaterThan(3);
    expect(r.sampling.text).toMatch(/ac per sample/);
    // a surface with half its area below the threshold
    const r2 = analyzeVariability(
      samples,
      field,
      {},
      { values: [5, 30, 10, 40], fraction: [1, 1, 1, 1], cell: 400 },
    );
    expect(r2.shareBelow?.area).toBe(0.5);
    expect(r2.shareBelow?.areaAc).toBeCloseTo(320000 / 4046.8564224, 9);
  });

  it('no S statements for other nutrients; no threshold for nitrate', () => {
    const { samples, field } = syntheticField();
    samples.values.no3_n = samples.values.so4_s;
    const r = analyzeVariability(samples, field, { nutrient: 'no3_n' });
    expect(r.sulphur).toBeNull();
    expect(r.threshold).toBeNull();
    expect(r.low).toEqual([]);
  });

  it('charts carry titles, axis labels with units, legends and the low-sample marks', () => {
    const { samples, field } = syntheticField();
    const r = analyzeVariability(samples, field, { nutrient: 'so4_s' });
    const sv = semivariogramSvg({
      semivariogram: r.semivariogram,
      fits: r.fits,
      best: r.best,
      label: r.label,
      unit: r.unit,
    });
    expect(sv).toMatch(/^<svg[^>]+xmlns="http:\/\/www.w3.org\/2000\/svg"/);
    expect(sv).toContain('distance between samples (m)');
    expect(sv).toContain('semivariance (lb S/ac)²');
    expect(sv).toContain('(best fit)');
    const map = sampleMapSvg({
      parts: field.parts,
      xy: samples.xy,
      values: samples.values.so4_s,
      ids: samples.ids,
      label: r.label,
      unit: r.unit,
      threshold: 20,
    });
    const rings = map.slice(
      map.indexOf('class="low-rings"'),
      map.indexOf('</g>', map.indexOf('class="low-rings"')),
    );
    expect((rings.match(/<circle /g) ?? []).length).toBe(4); // 4 low rings
    expect((map.match(/r="9" fill="none" stroke="#e31a1c"/g) ?? []).length).toBe(1); // and the legend's
    expect(map).toContain('class="colour-bar"');
    expect(map).toContain('>20 low</text>');
    for (const l of r.low) expect(map).toContain(`${l.id}: `);
    expect(niceTicks(0, 1597, 6, true)).toEqual([0, 500, 1000, 1500, 2000]);
  });
});

describe('text and map with a surface', () => {
  it('the text names the dependence class with its source, the sampling verdict and the S statements', async () => {
    const { variabilityText } = await import('../../src/variability/index.js');
    const { samples, field } = syntheticField();
    const r = analyzeVariability(samples, field, { nutrient: 'so4_s' });
    const t = variabilityText(r);
    expect(t).toContain('Cambardella et al. 1994');
    expect(t).toContain('ac per sample');
    expect(t).toContain('S36');
    expect(t).toContain('not low says little');
    expect(t).toContain('at least 10 lb S/ac');
  });

  it('zone-composite samples are flagged', () => {
    const { samples, field } = syntheticField();
    samples.zone = samples.ids.map((_, i) => (i < 20 ? 'a' : 'b'));
    expect(analyzeVariability(samples, field).warnings.map((w) => w.code)).toContain(
      'variability-zone-composites',
    );
  });

  it('a surface is one image clipped to the field; a grid finer than a pixel is shown coarser, and says so', () => {
    const grid = {
      xmin: 0,
      ymax: 20,
      cell: 10,
      cols: 3,
      rows: 2,
      mask: new Uint8Array([1, 1, 1, 1, 1, 0]),
      fraction: new Float32Array(6).fill(1),
    };
    // one sample on a 30 m x 20 m field, with the given surface
    const mapWith = (surface: Parameters<typeof sampleMapSvg>[0]['surface']) =>
      sampleMapSvg({
        parts: [{ exterior: new Float64Array([0, 0, 30, 0, 30, 20, 0, 20, 0, 0]), holes: [] }],
        xy: new Float64Array([5, 5]),
        values: [1],
        ids: ['A'],
        label: 'x',
        unit: 'u',
        threshold: null,
        surface,
      });
    const svg = mapWith({ grid, values: [1, 1, 1, 1, 9, 9] });
    expect((svg.match(/<image class="raster"/g) ?? []).length).toBe(1);
    expect(svg).toContain('clip-path="url(#sample-map-clip)"');
    expect(svg).not.toContain('drawn at');
    // 0.01 m cells on a 30 m field (about 23 px per metre): 3000 x 2000 cells shown at 0.05 m
    const fine = { ...grid, cell: 0.01, cols: 3000, rows: 2000, mask: new Uint8Array(6e6).fill(1) };
    const coarse = mapWith({ grid: fine, values: new Float32Array(6e6).fill(3) });
    expect(coarse).toContain('interpolated (IDW), drawn at 0.05 m cells');
  });
});

describe('thresholds', () => {
  it('P "low" is <= 10 ppm Olsen, <= 17 ppm modified Kelowna ([published] Canola Encyclopedia), so 10 itself counts', () => {
    expect(defaultThreshold('p', 'olsen')).toMatchObject({ value: 10, inclusive: true });
    expect(defaultThreshold('p', 'kelowna')).toMatchObject({ value: 17, inclusive: true });
    expect(defaultThreshold('k')?.value).toBe(125); // common practice
    expect(defaultThreshold('no3_n')).toBeNull();
    const { samples, field } = syntheticField();
    samples.values.p = new Float64Array(samples.ids.length).fill(30);
    samples.values.p[3] = 10;
    samples.values.p[4] = 10.5;
    const r = analyzeVariability(samples, field, { nutrient: 'p' });
    expect(r.low.map((l) => l.id)).toEqual(['S4']);
    expect(sampleShareBelow([10, 11], 10, true)).toBe(0.5);
    expect(areaShareBelow([10, 11], [1, 1], 10, true).share).toBe(0.5);
  });
});

describe('report charts', () => {
  it('the report embeds the variability charts (the same SVG) with captions carrying the findings', async () => {
    const { variabilityReportCharts } = await import('../../src/prescription/sulphurCharts.js');
    const { renderReport } = await import('../../src/report/index.js');
    const { demoInput } = await import('../helpers/report-fixture.js');
    const { samples, field } = syntheticField();
    const r = analyzeVariability(samples, field, { nutrient: 'so4_s' });
    const charts = variabilityReportCharts(r, samples, field);
    expect(charts.map((c) => c.title)).toEqual([
      'Semivariogram of sulphate-S (0-24 in)',
      'sulphate-S (0-24 in): low spots',
    ]);
    expect(charts[1].caption).toContain('S36');
    const inp = demoInput();
    inp.charts = charts;
    const html = renderReport(inp);
    const uris = [...html.matchAll(/src="data:image\/svg\+xml;base64,([^"]+)"/g)].map((m) =>
      Buffer.from(m[1], 'base64').toString('utf8'),
    );
    expect(uris).toContain(charts[0].svg);
    expect(uris).toContain(charts[1].svg);
  });
});
