/**
 * The report's maps: raster classes and their dilation, label points inside zones (turf as reference), every map
 * with its legend, scale bar and north arrow, geometry in UTM metres, size on a fine grid.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { booleanPointInPolygon, polygon, point } from '@turf/turf';
import { parseReportInput, renderReport, serializeReportInput } from '../../src/report/index.js';
import { makeFrame } from '../../src/draw/frame.js';
import { breakLabels, classify, dilateClasses } from '../../src/draw/layers.js';
import { buildMaps, labelPoint } from '../../src/report/maps.js';
import { chanceClassLabels } from '../../src/draw/chanceClasses.js';
import { demoInput, demoInputAt } from '../helpers/report-fixture.js';

describe('maps', () => {
  it('classify puts each value in the class its breaks name (breaks[c-1] <= v < breaks[c])', () => {
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: -100, max: 100, noNaN: true }), { maxLength: 6 }),
        fc.array(fc.double({ min: -150, max: 150 })),
        (b, vals) => {
          const breaks = [...new Set(b)].sort((x, y) => x - y);
          const cls = classify(vals, breaks);
          vals.forEach((v, i) => {
            if (!Number.isFinite(v)) return expect(cls[i]).toBe(255);
            const c = cls[i]!;
            if (c > 0) expect(v).toBeGreaterThanOrEqual(breaks[c - 1]!);
            if (c < breaks.length) expect(v).toBeLessThan(breaks[c]!);
          });
          expect(breakLabels(breaks).length).toBe(breaks.length + 1);
        },
      ),
    );
  });

  it('dilateClasses only fills empty cells, each with the class of a neighbour (brute-force oracle)', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 12 }),
        fc.integer({ min: 1, max: 12 }),
        fc.array(fc.constantFrom(0, 1, 2, 255), { minLength: 144, maxLength: 144 }),
        (cols, rows, cells) => {
          const idx = Uint8Array.from(cells.slice(0, cols * rows));
          const out = dilateClasses(idx.slice(), cols, rows, 1);
          for (let r = 0; r < rows; r++)
            for (let c = 0; c < cols; c++) {
              const i = r * cols + c;
              if (idx[i] !== 255) {
                expect(out[i]).toBe(idx[i]);
                continue;
              }
              const nb: number[] = [];
              for (let dr = -1; dr <= 1; dr++)
                for (let dc = -1; dc <= 1; dc++) {
                  const rr = r + dr,
                    cc = c + dc;
                  if (rr >= 0 && cc >= 0 && rr < rows && cc < cols && idx[rr * cols + cc] !== 255)
                    nb.push(idx[rr * cols + cc]!);
                }
              if (nb.length === 0) expect(out[i]).toBe(255);
              else expect(nb).toContain(out[i]);
            }
        },
      ),
    );
  });

  it('labelPoint lies inside the zone, outside its holes (turf booleanPointInPolygon as reference)', () => {
    // random star-shaped rings around a centre, with a square hole near the centre
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: 20, max: 100, noNaN: true }), { minLength: 5, maxLength: 30 }),
        fc.boolean(),
        (radii, hole) => {
          const n = radii.length;
          const ext: number[] = [];
          radii.forEach((r, i) =>
            ext.push(
              500000 + r * Math.cos((2 * Math.PI * i) / n),
              5700000 + r * Math.sin((2 * Math.PI * i) / n),
            ),
          );
          const holes = hole
            ? [
                [
                  500000 - 8,
                  5700000 - 8,
                  500000 - 8,
                  5700000 + 8,
                  500000 + 8,
                  5700000 + 8,
                  500000 + 8,
                  5700000 - 8,
                ],
              ]
            : [];
          const [x, y] = labelPoint({ exterior: ext, holes });
          const ring = (a: number[]): number[][] => {
            const r = [];
            for (let i = 0; i < a.length; i += 2) r.push([a[i]!, a[i + 1]!]);
            r.push(r[0]!);
            return r;
          };
          expect(booleanPointInPolygon(point([x, y]), polygon([ring(ext), ...holes.map(ring)]))).toBe(true);
        },
      ),
      { numRuns: 60 },
    );
  });

  it('draws every map with a legend, a scale bar and a north arrow, and every zone of every set', () => {
    const inp = demoInput();
    const html = renderReport(inp);
    const svgs = [...html.matchAll(/<svg class="map"[^]*?<\/svg>/g)].map((m) => m[0]);
    // samples + one per surface + one per response map + per zone set: one per product placement and the binding map
    const placements = new Set(
      inp.zoneSets[0]!.zones.flatMap((z) => z.rates.map((r) => `${r.product}|${r.placement}`)),
    );
    expect(svgs.length).toBe(1 + inp.surfaces.length + inp.response.length + placements.size + 1);
    for (const s of svgs) {
      expect(s).toContain('<g class="legend">');
      expect(s).toContain('<g class="scalebar"');
      expect(s).toContain('<g class="north"');
    }
    const rateMap = svgs.find((s) => s.includes('data-kind="rate"'))!;
    expect(new Set([...rateMap.matchAll(/data-zone-id="([^"]*)"/g)].map((m) => m[1])).size).toBe(
      inp.zoneSets[0]!.zones.length,
    );
    expect((html.match(/<tr data-zone=/g) ?? []).length).toBe(inp.zoneSets[0]!.zones.length);
  });

  it('geometry in the SVG is the input UTM coordinates shifted by data-utm-origin (to 0.05 m)', () => {
    const inp = demoInput();
    const html = renderReport(inp);
    const svg = html.match(/<svg class="map"[^]*?<\/svg>/)![0];
    const [x0, y0] = svg
      .match(/data-utm-origin="([\d.]+) ([\d.]+)"/)!
      .slice(1)
      .map(Number) as [number, number];
    const d = svg.match(/<g class="geo boundary"[^>]*><path d="([^"]+)"/)![1]!;
    const first = d
      .match(/^M([\d.-]+) ([\d.-]+)/)!
      .slice(1)
      .map(Number) as [number, number];
    const ext = inp.field.parts[0]!.exterior;
    expect(x0 + first[0]).toBeCloseTo(ext[0]!, 1);
    expect(y0 - first[1]).toBeCloseTo(ext[1]!, 1);
  });

  it('a 2 m grid on a 160 ac field (~200 000 cells per surface) makes a report under 1 MB', () => {
    const inp = demoInputAt(2);
    expect(inp.surfaces[0]!.raster.grid.cols * inp.surfaces[0]!.raster.grid.rows).toBeGreaterThan(150_000);
    const html = renderReport(inp);
    expect(html.length).toBeLessThan(1_000_000);
  });

  it('a frame keeps the field whole: every boundary vertex maps inside the map area', () => {
    const f = makeFrame([431200, 5741600, 432005, 5742405]);
    expect(f.w).toBe(700);
    expect(f.h).toBeLessThanOrEqual(700);
    expect((432005 - f.x0) * f.k).toBeLessThanOrEqual(f.w);
    expect((f.y0 - 5741600) * f.k).toBeLessThanOrEqual(f.h);
  });

  it("a chance map follows its nutrient's surface: % classes and the assumption; without one, the reason in its place", () => {
    const inp = demoInput();
    const surf = inp.surfaces.find((x) => x.nutrient === 'so4_s')!;
    const values = Float64Array.from(surf.raster.values as ArrayLike<number>, (v) =>
      Number.isFinite(v) ? Math.min(1, Math.max(0, (30 - v) / 20)) : NaN,
    );
    const assumption = 'Assumes the true value in each cell is Gaussian (test).';
    inp.chance = [
      {
        nutrient: 'so4_s',
        threshold: 20,
        unit: 'lb/ac',
        raster: { grid: surf.raster.grid, values },
        method: 'ordinary kriging, spherical (test)',
        assumption,
        summary: 'Expected 31 % of the field below 20 lb/ac.',
      },
    ];
    const maps = buildMaps(inp);
    const kinds = maps.map((m) => m.kind);
    const at = kinds.indexOf('chance');
    expect(maps[at - 1]!.title).toContain('Sulphate-S');
    expect(maps[at - 1]!.kind).toBe('surface');
    const m = maps[at]!;
    expect(m.title).toBe('Sulphate-S 0-24 in: chance below 20 lb/ac');
    for (const l of chanceClassLabels()) expect(m.svg).toContain(l);
    expect(m.svg).toContain('<image class="raster"');
    expect(m.svg).toContain('Gaussian');
    expect(m.caption).toContain('Expected 31 %');
    expect(m.caption).toMatch(/^From ordinary kriging/);
    // round trip through report-data.json keeps the chance map
    const back = parseReportInput(serializeReportInput(inp));
    expect(back.chance![0]!.raster!.values.length).toBe(values.length);
    expect(back.chance![0]!.assumption).toBe(assumption);

    inp.chance = [
      {
        nutrient: 'so4_s',
        threshold: 20,
        unit: 'lb/ac',
        refused: 'ordinary kriging is refused: only 12 samples; kriging needs at least 30',
        method: 'ordinary kriging (refused)',
        assumption,
      },
    ];
    const none = buildMaps(inp).find((x) => x.kind === 'chance')!;
    expect(none.svg).not.toContain('<image class="raster"');
    expect(none.svg).toContain('No chance map');
    expect(none.svg).toContain('only 12 samples');
    expect(none.caption).toContain('No chance map of Sulphate-S 0-24 in: ordinary kriging is refused');
    // files from before chance maps existed still read
    delete inp.chance;
    expect(buildMaps(parseReportInput(serializeReportInput(inp))).some((x) => x.kind === 'chance')).toBe(
      false,
    );
  });
});
