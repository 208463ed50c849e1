import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { parseCsv, readCsvRecords } from '../../src/io/csv.js';
import { classifyHeader, parseColumnMap } from '../../src/io/columns.js';
import { readGeoJsonPoints, readGeoJsonPolygons } from '../../src/io/geojson.js';
import { parseLabValue } from '../../src/validate/values.js';
import { buildSamples, parseDepth } from '../../src/validate/samples.js';
import { userErrorMessage } from '../helpers/errors.js';
import { ROOT } from '../helpers/cli.js';

const read = (f: string) => readFileSync(join(ROOT, f), 'utf8');
const userError = (f: () => unknown, re: RegExp) => expect(userErrorMessage(f)).toMatch(re);
describe('CSV', () => {
  it('reads quoted cells, doubled quotes, embedded commas and line breaks, CRLF', () => {
    // source: RFC 4180, section 2 (rules 4-7)
    const { rows } = parseCsv('a,b,c\r\n"x, y","say ""hi""","two\nlines"\r\n1,,3\r\n');
    expect(rows).toEqual([
      ['a', 'b', 'c'],
      ['x, y', 'say "hi"', 'two\nlines'],
      ['1', '', '3'],
    ]);
  });

  it('semicolon and tab delimiters are detected', () => {
    // common practice: European-locale spreadsheets write ';', some lab portals write tabs
    expect(parseCsv('a;b\n1;2\n').rows).toEqual([
      ['a', 'b'],
      ['1', '2'],
    ]);
    expect(parseCsv('a\tb\n1\t2\n').rows).toEqual([
      ['a', 'b'],
      ['1', '2'],
    ]);
  });

  it('semicolons with decimal commas in every column are not taken for a comma file', () => {
    // common practice: European-locale spreadsheets write ";" between cells and "," as the decimal mark
    const t = readCsvRecords(
      'Sample;Lat;Long;K (ppm);OM (%)\nA;52,3211;-106,4172;344,5;3,5\nB;52,3212;-106,4171;300,0;2,5\n',
      't.csv',
      [],
    );
    expect(t.records.map((r) => [r.lat, r.lon, r.props['K (ppm)'], r.props['OM (%)']])).toEqual([
      [52.3211, -106.4172, '344.5', '3.5'],
      [52.3212, -106.4171, '300.0', '2.5'],
    ]);
  });

  it('any table written with RFC 4180 quoting reads back the same (property)', () => {
    // source: RFC 4180 section 2: a field with comma, quote or line break is quoted, quotes doubled
    const cell = fc.string({ unit: fc.constantFrom('a', 'b', ',', '"', '\n', ' ', '1', 'é'), maxLength: 6 });
    fc.assert(
      fc.property(
        fc.array(fc.array(cell, { minLength: 2, maxLength: 2 }), { minLength: 1, maxLength: 5 }),
        (rows) => {
          const quote = (s: string) => (/[",\n]/.test(s) || s === '' ? `"${s.replace(/"/g, '""')}"` : s);
          const text = 'h1,h2\n' + rows.map((r) => r.map(quote).join(',')).join('\n') + '\n';
          expect(parseCsv(text).rows.slice(1)).toEqual(rows);
        },
      ),
      { seed: 11, numRuns: 200 },
    );
  });

  it('finds the header below a lab report preamble', () => {
    const t = readCsvRecords(read('sample-fields/quarter/samples.csv'), 'samples.csv', []);
    expect(t.columns[1]).toBe('Sample');
    expect(t.records[0].where).toBe('row 4');
    expect(t.records.length).toBe(124);
  });
});

describe('headers and values', () => {
  it('recognises lab-style headers with units and depths', () => {
    expect(classifyHeader('NO3-N (lb/ac)')).toMatchObject({ role: 'no3_n', unit: 'lbac', depth: null });
    expect(classifyHeader('no3_n_lbac_6_24')).toMatchObject({ role: 'no3_n', unit: 'lbac', depth: [6, 24] });
    expect(classifyHeader('Sulphate-S 0-15 cm (ppm)')).toMatchObject({
      role: 'so4_s',
      unit: 'ppm',
      depth: [0, 15],
      depthUnit: 'cm',
    });
    expect(classifyHeader('P Olsen (ppm)')).toMatchObject({ role: 'p', pMethod: 'olsen' });
    expect(classifyHeader('P (mod. Kelowna) mg/kg')).toMatchObject({
      role: 'p',
      pMethod: 'kelowna',
      unit: 'ppm',
    });
    expect(classifyHeader('pH')).toMatchObject({ role: 'ph' });
    expect(classifyHeader('OM (%)')).toMatchObject({ role: 'om' });
    expect(classifyHeader('K (ppm)')).toMatchObject({ role: 'k', unit: 'ppm' });
    expect(classifyHeader('Depth (cm)')).toMatchObject({ role: 'depth', depthUnit: 'cm' });
    expect(classifyHeader('Lab No')).toBeNull();
  });

  it('censored values: below detection -> half the limit, above range -> the limit', () => {
    // common practice (documented in docs/method.md): substitution of half the detection limit
    expect(parseLabValue('<2')).toEqual({ value: 1, limit: 2, censor: -1 });
    expect(parseLabValue('> 60')).toEqual({ value: 60, limit: 60, censor: 1 });
    expect(parseLabValue(' 12.5 ')).toEqual({ value: 12.5, limit: 12.5, censor: 0 });
    expect(parseLabValue('')).toBeNull();
    expect(parseLabValue('n/a')).toBeNull();
    expect(parseLabValue('high')).toBe('bad');
    expect(parseLabValue('12,5')).toBe('bad');
  });

  it('depth intervals in inches or centimetres', () => {
    // common practice: prairie labs sample 0-15 and 15-60 cm, the same layers as 0-6 and 6-24 in
    expect(parseDepth('0-6', null)).toEqual([0, 6]);
    expect(parseDepth('6 - 24 in', null)).toEqual([6, 24]);
    expect(parseDepth('15-60 cm', null)).toEqual([6, 24]);
    expect(parseDepth('0-15', 'cm')).toEqual([0, 6]);
    expect(parseDepth('6-0', null)).toBeNull();
  });

  it('column map: keys, units, repeated analyte keys', () => {
    const m = parseColumnMap('id=Site,lat=Y,lon=X,no3_n=N top:lb/ac,no3_n=N sub:lb/ac,p=Phos:ppm');
    expect(m.map((e) => e.role)).toEqual(['id', 'lat', 'lon', 'no3_n', 'no3_n', 'p']);
    expect(m[3]).toEqual({ role: 'no3_n', name: 'N top', unit: 'lbac', depth: null });
    expect(parseColumnMap('ph=pH (1:2)@0-6,latlon="Lat, Lon",no3_n=N sub:ppm@15-60cm')).toEqual([
      { role: 'ph', name: 'pH (1:2)', unit: null, depth: [0, 6] },
      { role: 'latlon', name: 'Lat, Lon', unit: null, depth: null },
      { role: 'no3_n', name: 'N sub', unit: 'ppm', depth: [6, 24] },
    ]);
    userError(() => parseColumnMap('id=A,id=B'), /given twice/);
    userError(() => parseColumnMap('nitrogen=A'), /KEY one of/);
  });
});

describe('samples from the demo farm', () => {
  it('the CSV (one row per depth) and the GeoJSON (one point per sample) give the same samples', () => {
    for (const dir of ['quarter', 'zoned']) {
      const a = buildSamples(
        readCsvRecords(read(`sample-fields/${dir}/samples.csv`), 'samples.csv', []),
      ).samples;
      const b = buildSamples(
        readGeoJsonPoints(read(`sample-fields/${dir}/samples.geojson`), 'samples.geojson'),
      ).samples;
      expect(a.ids).toEqual(b.ids);
      expect(a.values).toEqual(b.values);
      expect(a.censored).toEqual(b.censored);
      expect(a.texture).toEqual(b.texture);
      expect(a.zone).toEqual(b.zone);
      for (let i = 0; i < a.lonlat.length; i++) expect(a.lonlat[i]).toBeCloseTo(b.lonlat[i], 7);
    }
  });

  it('nitrate and sulphate layers add up to 0-24 in; censored layers keep their flag', () => {
    const csv = read('sample-fields/quarter/samples.csv');
    const s = buildSamples(readCsvRecords(csv, 'samples.csv', [])).samples;
    // HQ-01: 0-6 row and 6-24 row, read from the file itself
    const rows = csv
      .split('\n')
      .filter((l) => l.includes(',HQ-01,'))
      .map((l) => l.split(','));
    expect(s.values.no3_n[0]).toBe(Number(rows[0][5]) + Number(rows[1][5]));
    const cens = s.ids.findIndex((_, i) => s.censored.so4_s[i] === 1);
    expect(cens).toBeGreaterThanOrEqual(0); // the quarter has a ">60" sulphate layer
  });

  it('ppm layers convert to lb/ac by depth (x2 per 6 in)', () => {
    // source: Manitoba Agriculture, Soil Fertility Guide: ppm x 2 = lb/ac for 6 in; 6-24 in x 6
    const text =
      'Sample,Lat,Long,Depth (in),NO3-N (ppm),SO4-S (ppm),P Olsen (ppm)\nA,52.3,-106.4,0-6,5,<2,12\nA,52.3,-106.4,6-24,3,4,\n';
    const s = buildSamples(readCsvRecords(text, 't.csv', [])).samples;
    expect(s.values.no3_n[0]).toBe(5 * 2 + 3 * 6);
    expect(s.values.so4_s[0]).toBe(1 * 2 + 4 * 6); // "<2" ppm -> 1 ppm
    expect(s.censored.so4_s[0]).toBe(-1);
    expect(s.values.p[0]).toBe(12);
  });

  it('0-6 in only needs a depth factor, and says it used one', () => {
    const text = 'Sample,Lat,Long,Depth (in),NO3-N (lb/ac),P Olsen (ppm)\nA,52.3,-106.4,0-6,10,12\n';
    userError(() => buildSamples(readCsvRecords(text, 't.csv', [])), /0-6 in only.*--depth-factor/);
    const r = buildSamples(readCsvRecords(text, 't.csv', []), { depthFactor: 2.5 });
    expect(r.samples.values.no3_n[0]).toBe(25);
    expect(r.warnings.some((w) => w.code === 'depth-factor')).toBe(true);
  });

  it('P method: from the header, the option, never mixed, never guessed', () => {
    const base = 'Sample,Lat,Long,Depth (in),NO3-N (lb/ac)';
    userError(
      () => buildSamples(readCsvRecords(`${base},P (ppm)\nA,52.3,-106.4,0-24,10,12\n`, 't.csv', [])),
      /does not say the test method.*--p-method/,
    );
    expect(
      buildSamples(readCsvRecords(`${base},P (ppm)\nA,52.3,-106.4,0-24,10,12\n`, 't.csv', []), {
        pMethod: 'kelowna',
      }).samples.pMethod,
    ).toBe('kelowna');
    userError(
      () =>
        buildSamples(
          readCsvRecords(`${base},P Olsen (ppm),P Kelowna (ppm)\nA,52.3,-106.4,0-24,10,12,15\n`, 't.csv', []),
        ),
      /two methods/,
    );
    userError(
      () =>
        buildSamples(readCsvRecords(`${base},P Olsen (ppm)\nA,52.3,-106.4,0-24,10,12\n`, 't.csv', []), {
          pMethod: 'kelowna',
        }),
      /option says kelowna/,
    );
  });

  it('nitrate without a unit is refused, negative values are refused', () => {
    userError(
      () => buildSamples(readCsvRecords('Sample,Lat,Long,NO3-N 0-24\nA,52.3,-106.4,10\n', 't.csv', [])),
      /does not say its unit.*--columns "no3_n=NO3-N 0-24:ppm@0-24"/,
    );
    userError(
      () => buildSamples(readCsvRecords('Sample,Lat,Long,K (ppm)\nA,52.3,-106.4,-5\n', 't.csv', [])),
      /negative/,
    );
  });

  it('GeoJSON polygons: Feature, FeatureCollection or bare geometry', () => {
    const ring = [
      [-106.41, 52.31],
      [-106.4, 52.31],
      [-106.4, 52.32],
      [-106.41, 52.31],
    ];
    const g = { type: 'Polygon', coordinates: [ring] };
    for (const obj of [
      g,
      { type: 'Feature', properties: {}, geometry: g },
      { type: 'FeatureCollection', features: [{ type: 'Feature', properties: {}, geometry: g }] },
    ]) {
      expect(readGeoJsonPolygons(JSON.stringify(obj), 'b.geojson').features[0].coordinates).toEqual([[ring]]);
    }
    userError(
      () => readGeoJsonPolygons('{"type":"Point","coordinates":[0,0]}', 'b.geojson'),
      /Polygon or MultiPolygon/,
    );
  });
});

describe('units printed in cells', () => {
  it('a unit in the cell is used; two units in one column are refused', () => {
    // source: Manitoba Agriculture, Soil Fertility Guide: ppm x 2 = lb/ac for a 6 in layer
    const ok = 'Sample,Lat,Long,Depth (in),NO3-N\nA,52.3,-106.4,0-6,5 ppm\nA,52.3,-106.4,6-24,3 ppm\n';
    expect(buildSamples(readCsvRecords(ok, 't.csv', [])).samples.values.no3_n[0]).toBe(5 * 2 + 3 * 6);
    const mixed = 'Sample,Lat,Long,Depth (in),NO3-N\nA,52.3,-106.4,0-6,5 ppm\nA,52.3,-106.4,6-24,18 lb/ac\n';
    userError(() => buildSamples(readCsvRecords(mixed, 't.csv', [])), /mixed units in one column/);
    const clash = 'Sample,Lat,Long,Depth (in),NO3-N (lb/ac)\nA,52.3,-106.4,0-24,5 ppm\n';
    userError(() => buildSamples(readCsvRecords(clash, 't.csv', [])), /header says lb\/ac/);
  });
});

describe('layers to canonical units (property)', () => {
  it('nitrate 0-6 + 6-24 in ppm equals 2 x ppm(0-6) + 6 x ppm(6-24) lb/ac; P and K stay ppm', () => {
    // source: Manitoba Agriculture, Soil Fertility Guide: x2 per 6 in of depth (0-6 in x2, 6-24 in x6)
    const v = fc.integer({ min: 0, max: 2000 }).map((x) => x / 10);
    fc.assert(
      fc.property(fc.array(fc.tuple(v, v, v, v), { minLength: 1, maxLength: 6 }), (rows) => {
        let text = 'Sample,Lat,Long,Depth (in),NO3-N (ppm),SO4-S (lb/ac),P Olsen (ppm),K (ppm)\n';
        rows.forEach(([a, b, c, d], i) => {
          const lat = (52.3 + i * 0.001).toFixed(4);
          text += `S${i},${lat},-106.4,0-6,${a},${c},${b},${d}\nS${i},${lat},-106.4,6-24,${b},${d},,\n`;
        });
        const s = buildSamples(readCsvRecords(text, 't.csv', [])).samples;
        rows.forEach(([a, b, c, d], i) => {
          expect(s.values.no3_n[i]).toBeCloseTo(2 * a + 6 * b, 9);
          expect(s.values.so4_s[i]).toBeCloseTo(c + d, 9);
          expect(s.values.p[i]).toBe(b);
          expect(s.values.k[i]).toBe(d);
        });
      }),
      { seed: 9, numRuns: 100 },
    );
  });
});
