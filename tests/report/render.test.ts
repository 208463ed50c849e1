import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { crc32 as nodeCrc32, inflateSync } from 'node:zlib';
import { renderReport, serializeReportInput, parseReportInput } from '../../src/report/index.js';
import { esc, fmt } from '../../src/draw/escape.js';
import { encodeIndexedPng, crc32 } from '../../src/draw/png.js';
import { niceLength } from '../../src/draw/frame.js';
import { M_PER_FT } from '../../src/units/index.js';
import { demoInput } from '../helpers/report-fixture.js';
import { isUserError } from '../../src/errors.js';

const EVIL = '<script>alert(1)</script>';
const ATTR = '" onmouseover="alert(2)" x="';

describe('escaping', () => {
  it('renders names from the inputs as text, never as markup', () => {
    const inp = demoInput();
    inp.title.field = EVIL;
    inp.title.farm = ATTR;
    inp.nutrients[1]!.label = EVIL;
    inp.samples.ids[0] = EVIL;
    inp.zoneSets[0]!.zones[0]!.id = ATTR;
    inp.zoneSets[0]!.zones[0]!.rates[0]!.product = EVIL;
    inp.warnings[0]!.message = EVIL;
    inp.tablesUsed[0]!.source = EVIL;
    inp.charts[0]!.title = ATTR;
    inp.charts[0]!.svg = `<svg xmlns="http://www.w3.org/2000/svg"><script>alert(3)</script></svg>`;
    const html = renderReport(inp);
    // the page itself has no script at all: any "<script" would be injected
    expect(html.toLowerCase()).not.toContain('<script');
    expect(html).not.toContain('" onmouseover="');
    expect(html).toContain('&quot; onmouseover=&quot;alert(2)&quot; x=&quot;');
    expect(html).toContain('&lt;script&gt;alert(1)&lt;/script&gt;');
  });

  it('esc leaves none of < > " \' and a bare & in any string (HTML 5 text and attribute rules)', () => {
    fc.assert(
      fc.property(fc.string({ unit: 'binary' }), (s) => {
        const e = esc(s);
        expect(e).not.toMatch(/[<>"']/);
        // every & starts one of the five references esc writes
        expect(e.replace(/&(amp|lt|gt|quot|#39);/g, '')).not.toContain('&');
      }),
    );
  });

  it('fmt groups thousands and prints a dash for no value', () => {
    expect(fmt(12345.678, 1)).toBe('12\u2009345.7');
    expect(fmt(NaN)).toBe('–');
    expect(fmt(-0.04, 1)).toBe('0.0');
  });
});

describe('indexed PNG', () => {
  it('decodes with Node zlib to the same indices, with valid chunk CRCs (PNG spec, ISO/IEC 15948)', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 40 }),
        fc.integer({ min: 1, max: 30 }),
        fc.integer({ min: 1, max: 9 }),
        fc.integer(),
        (w, h, k, seed) => {
          let s = seed >>> 0;
          const idx = new Uint8Array(w * h).map(() => {
            s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
            const v = s % (k + 1);
            return v === k ? 255 : v;
          });
          const pal = Array.from(
            { length: k },
            (_, i) => '#' + (i * 0x1f2f3f).toString(16).padStart(6, '0').slice(-6),
          );
          const png = encodeIndexedPng(idx, w, h, pal);
          expect([...png.subarray(0, 8)]).toEqual([137, 80, 78, 71, 13, 10, 26, 10]);
          const dv = new DataView(png.buffer, png.byteOffset);
          let o = 8;
          const chunks: Record<string, Uint8Array> = {};
          while (o < png.length) {
            const len = dv.getUint32(o);
            const type = String.fromCharCode(...png.subarray(o + 4, o + 8));
            // Node's own CRC-32 (zlib) as the outside reference
            expect(dv.getUint32(o + 8 + len)).toBe(nodeCrc32(png.subarray(o + 4, o + 8 + len)));
            chunks[type] = png.subarray(o + 8, o + 8 + len);
            o += 12 + len;
          }
          expect(Object.keys(chunks)).toEqual(['IHDR', 'PLTE', 'tRNS', 'IDAT', 'IEND']);
          const ih = new DataView(chunks.IHDR!.buffer, chunks.IHDR!.byteOffset);
          expect([ih.getUint32(0), ih.getUint32(4), chunks.IHDR![8], chunks.IHDR![9]]).toEqual([w, h, 8, 3]);
          const raw = inflateSync(chunks.IDAT!);
          expect(raw.length).toBe(h * (w + 1));
          const trns = chunks.tRNS!;
          for (let r = 0; r < h; r++) {
            expect(raw[r * (w + 1)]).toBe(0);
            for (let c = 0; c < w; c++) {
              const v = raw[r * (w + 1) + 1 + c]!;
              const want = idx[r * w + c]!;
              if (want === 255) expect(trns[v]).toBe(0);
              else expect(v).toBe(want);
            }
          }
        },
      ),
      { numRuns: 40 },
    );
  });

  it('crc32 matches Node zlib.crc32 and the check value of "123456789" (0xCBF43926, ITU-T V.42)', () => {
    expect(crc32(new TextEncoder().encode('123456789'))).toBe(0xcbf43926);
    fc.assert(
      fc.property(fc.uint8Array({ maxLength: 300 }), (b) => {
        expect(crc32(b)).toBe(nodeCrc32(b));
      }),
    );
  });
});

describe('scale bar', () => {
  it('niceLength is the largest 1-2-5 x 10^n not over the limit (common practice for scale bars)', () => {
    fc.assert(
      fc.property(fc.double({ min: 0.01, max: 1e7, noNaN: true }), (max) => {
        const n = niceLength(max);
        expect(n).toBeLessThanOrEqual(max);
        const m = n / 10 ** Math.floor(Math.log10(n) + 1e-12);
        expect([1, 2, 5].some((x) => Math.abs(m - x) < 1e-9)).toBe(true);
        // the next nice length up would be over the limit
        const next = m === 1 ? 2 * n : m === 2 ? 2.5 * n : 2 * n;
        expect(next).toBeGreaterThan(max);
      }),
    );
  });

  it('bars in the SVG are as long as their labels say, in metres and in feet (1 ft = 0.3048 m exactly, 1959 agreement)', () => {
    const inp = demoInput();
    const html = renderReport(inp);
    const svg = html.match(/<svg class="map"[^]*?<\/svg>/)![0];
    const k = Number(svg.match(/data-px-per-m="([\d.e+-]+)"/)![1]);
    const sb = svg.match(/<g class="scalebar" data-m="(\d+)" data-ft="(\d+)">([^]*?)<\/g><\/g>/)!;
    const widths = [
      ...sb[0].matchAll(/<g class="sb-(m|ft)">[^]*?width="([\d.]+)"[^]*?width="([\d.]+)"/g),
    ].map((x) => [x[1], Number(x[2]) + Number(x[3])] as const);
    expect(widths[0]![0]).toBe('m');
    expect(widths[0]![1]).toBeCloseTo(Number(sb[1]) * k, 0);
    expect(widths[1]![1]).toBeCloseTo(Number(sb[2]) * M_PER_FT * k, 0);
    expect(sb[0]).toContain(`>${sb[1]} m<`);
    expect(sb[0]).toContain(`>${sb[2]} ft<`);
  });
});

describe('report-data.json', () => {
  it('round-trips: coordinates exactly, rasters to float32', () => {
    const inp = demoInput();
    const back = parseReportInput(serializeReportInput(inp));
    expect(Array.from(back.samples.xy)).toEqual(Array.from(inp.samples.xy));
    expect(Array.from(back.field.parts[0]!.exterior)).toEqual(Array.from(inp.field.parts[0]!.exterior));
    const a = inp.surfaces[0]!.raster.values,
      b = back.surfaces[0]!.raster.values;
    for (let i = 0; i < a.length; i++) {
      if (Number.isNaN(a[i]!)) expect(b[i]).toBeNaN();
      else expect(b[i]).toBe(Math.fround(a[i]!));
    }
    expect(renderReport(back)).toBe(renderReport(inp));
  });

  it('names the place of a problem and the fix', () => {
    const inp = JSON.parse(serializeReportInput(demoInput()));
    inp.zoneSets[0].zones[2].areaM2 = 'big';
    try {
      parseReportInput(JSON.stringify(inp), 'out/report-data.json');
      expect.unreachable();
    } catch (e) {
      expect(isUserError(e)).toBe(true);
      expect((e as Error).message).toMatch(
        /out\/report-data\.json, at zoneSets\[0\]\.zones\[2\]\.areaM2: .*Fix: re-run `tilth build`/,
      );
    }
    expect(() => parseReportInput('{"schema":"tilth-report/99"}', 'x.json')).toThrow(
      /schema "tilth-report\/99"/,
    );
    expect(() => parseReportInput('{', 'x.json')).toThrow(/x\.json is not valid JSON/);
  });
});

describe('north arrow', () => {
  it('points to true north: meridian convergence matches atan(tan(dlon) sin(lat)) within 0.02° (Snyder 1987, USGS PP 1395, transverse Mercator)', async () => {
    const { trueNorthOnGrid } = await import('../../src/draw/north.js');
    const { projector, utmZoneFor } = await import('../../src/geo/utm.js');
    fc.assert(
      fc.property(
        fc.double({ min: -2.9, max: 2.9, noNaN: true }),
        fc.double({ min: 30, max: 60, noNaN: true }),
        fc.boolean(),
        (dlon, alat, south) => {
          const lat = south ? -alat : alat;
          const lon = -105 + dlon; // zone 13, central meridian 105° W
          const z = utmZoneFor(lon, lat);
          const [x, y] = projector(z).toMetres(lon, lat);
          const got = trueNorthOnGrid(z, x, y);
          // grid convergence gamma = atan(tan(dlon) sin(lat)); on a north-up map true north sits -gamma clockwise of grid north
          const gamma =
            (Math.atan(Math.tan((dlon * Math.PI) / 180) * Math.sin((lat * Math.PI) / 180)) * 180) / Math.PI;
          expect(Math.abs(got + gamma)).toBeLessThan(0.02);
        },
      ),
      { numRuns: 50 },
    );
  });
});

describe('other shapes of input', () => {
  it('renders a zone-composite field: no surfaces, no cross-validation, classes per zone, two zone sets, hectares', () => {
    const inp = demoInput();
    inp.surfaces = [];
    inp.crossValidation = [];
    inp.charts = [];
    inp.units.area = 'ha';
    inp.response = inp.response.filter((r) => r.byZone);
    const second = structuredClone(inp.zoneSets[0]!);
    second.name = 'Potash pass';
    second.zones = second.zones.slice(0, 3).map((z) => ({ ...z, class: null, rates: z.rates.slice(0, 1) }));
    inp.zoneSets.push(second);
    const html = renderReport(inp);
    const zones = inp.zoneSets[0]!.zones.length + 3;
    expect(html).toContain(`id="zone-count" data-count="${zones}"`);
    expect((html.match(/<tr data-zone=/g) ?? []).length).toBe(zones);
    expect(html).toContain('No cross-validation was run');
    expect(html).toContain(`Area (ha)`);
    expect(html).not.toContain('<image class="raster"');
    expect((html.match(/data-kind="binding"/g) ?? []).length).toBe(2);
  });

  it('sample labels on a dense grid do not overlap where a free place exists', () => {
    const inp = demoInput();
    // a 16 x 16 grid at 40 m (0.4 ac per sample): at ~0.82 px/m the dots are ~33 px apart and a 6-character id
    // is ~38 px wide, so labels all placed north-east would overlap their neighbours
    const ids: string[] = [],
      xy: number[] = [],
      p: number[] = [];
    const [ex, ey] = [inp.field.parts[0]!.exterior[0]!, inp.field.parts[0]!.exterior[1]!];
    for (let r = 0; r < 16; r++)
      for (let c = 0; c < 16; c++) {
        ids.push(`PV-${String(ids.length + 1).padStart(3, '0')}`);
        xy.push(ex + 20 + c * 40, ey + 20 + r * 40);
        p.push(10 + ((r * 13 + c) % 17));
      }
    inp.samples = { ids, xy, values: { p } };
    const svg = renderReport(inp).match(/<svg class="map"[^]*?<\/svg>/)![0];
    const boxes = [
      ...svg.matchAll(/<text x="([\d.]+)" y="([\d.]+)"(?: text-anchor="(end|middle)")?>([^<]*)<\/text>/g),
    ].map((m) => {
      const y = Number(m[2]),
        w = m[4]!.length * 6.3;
      const x = Number(m[1]) - (m[3] === 'end' ? w : m[3] === 'middle' ? w / 2 : 0);
      return [x, y - 11, x + w, y];
    });
    expect(boxes.length).toBe(256);
    let overlaps = 0;
    for (let i = 0; i < boxes.length; i++)
      for (let j = 0; j < i; j++) {
        const a = boxes[i]!,
          b = boxes[j]!;
        if (a[0]! < b[2]! && b[0]! < a[2]! && a[1]! < b[3]! && b[1]! < a[3]!) overlaps++;
      }
    expect(overlaps).toBe(0);
  });
});

describe('base64 (RFC 4648)', () => {
  it('agrees with the web platform btoa over a binary string, and round-trips', async () => {
    const { base64, fromBase64 } = await import('../../src/draw/png.js');
    // source: btoa (WHATWG HTML, forgiving-base64 encode), an independent encoder
    for (const n of [0, 1, 2, 3, 4, 5, 1000, 70_001]) {
      const bytes = new Uint8Array(n).map((_, i) => (i * 7919 + n) & 255);
      let bin = '';
      for (const b of bytes) bin += String.fromCharCode(b);
      expect(base64(bytes)).toBe(btoa(bin));
      expect([...fromBase64(base64(bytes))]).toEqual([...bytes]);
    }
  });
});
