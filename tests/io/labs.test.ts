/**
 * The invented lab-file corpus (tests/fixtures/labs, made by make-labs.ts; README.md there says what each file
 * exercises). Every layout must read, with no column map, to the same samples as truth.json, converted with the
 * published factors below; and its column reading (role|unit|depth|method) must be as reviewed here. The files
 * that cannot be read name the column, what is ambiguous and the exact --columns fix, and that fix then works.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { readCsvRecords } from '../../src/io/csv.js';
import { readXlsxRecords } from '../../src/io/xlsx.js';
import { readGeoJsonPoints } from '../../src/io/geojson.js';
import { parseColumnMap } from '../../src/io/columns.js';
import { buildSamples } from '../../src/validate/samples.js';
import type { RawTable } from '../../src/io/records.js';
import { ROOT } from '../helpers/cli.js';
import { soilFlagWarnings, soilFlagsById } from '../../src/agronomy/soilFlags.js';
import { READINGS } from './labs-readings.js';

const DIR = join(ROOT, 'tests/fixtures/labs');
const truth: Record<string, number | string>[] = JSON.parse(readFileSync(join(DIR, 'truth.json'), 'utf8'));

async function read(f: string, columns?: string): Promise<RawTable> {
  const map = parseColumnMap(columns);
  const opts = {
    crs: f.startsWith('10-') ? 'EPSG:26913' : undefined,
    sheet: f.startsWith('30-') ? 'Results' : undefined,
  };
  if (f.endsWith('.xlsx')) return readXlsxRecords(readFileSync(join(DIR, f)), f, map, opts);
  if (f.endsWith('.geojson')) return readGeoJsonPoints(readFileSync(join(DIR, f), 'utf8'), f);
  return readCsvRecords(readFileSync(join(DIR, f), 'utf8'), f, map, opts);
}

/** Censored cells and not-tested marks in some layouts: [file, sample, value] that differ from truth.json. */
const CENSORED: Record<string, [string, string, number][]> = {
  // "<2" lb/ac in the 0-6 in layer counts as 1 (half the limit, common practice: docs/method.md)
  '20-censored-and-not-tested.csv': [
    ['PV-01', 'no3_n', NaN],
    ['PV-02', 'p', NaN],
    ['PV-03', 'so4_s', NaN],
  ],
  '29-xlsx-typed-cells.xlsx': [['PV-01', 'no3_n', NaN]],
  '30-xlsx-second-sheet.xlsx': [['PV-01', 'no3_n', NaN]],
};

describe('lab corpus: every layout reads to the same samples', () => {
  for (const f of Object.keys(READINGS)) {
    it(f, async () => {
      const { samples: s, reading } = buildSamples(await read(f));
      expect(
        Object.fromEntries(
          reading.map((c) => [
            c.column,
            `${[c.role ?? '-', c.unit ?? '', c.depth ?? '', c.method ?? ''].join('|')}${c.used ? '' : ' unused'}`,
          ]),
        ),
      ).toEqual(READINGS[f]);
      const skip = new Set((CENSORED[f] ?? []).map(([id, a]) => `${id} ${a}`));
      expect(s.ids.length).toBe(6);
      truth.forEach((t, i) => {
        // ids as the lab wrote them: "001" stays text with its zeros, "01" from a text cell in a spreadsheet
        if (f.startsWith('11-')) expect(s.ids[i]).toBe(`00${i + 1}`);
        else if (f.startsWith('29-') || f.startsWith('30-')) expect(s.ids[i]).toBe(`0${i + 1}`);
        else expect(s.ids[i]).toBe(t.id);
        expect(s.lonlat[2 * i]).toBeCloseTo(t.lon as number, 6);
        expect(s.lonlat[2 * i + 1]).toBeCloseTo(t.lat as number, 6);
        for (const a of ['no3_n', 'so4_s', 'p', 'k', 'om', 'ph'] as const) {
          if (skip.has(`${t.id} ${a}`)) continue;
          // source: Manitoba Agriculture, Soil Fertility Guide: ppm x 2 = lb/ac per 6 in (so 0-15 cm x 2, 15-60 cm x 6);
          // 1 lb/ac = 1.12085 kg/ha (exact definitions of lb and acre); K 1 meq/100 g = 390.98 ppm (IUPAC atomic weight 39.098)
          expect(s.values[a][i], `${t.id} ${a}`).toBeCloseTo(
            t[a] as number,
            f.startsWith('21-') || f.startsWith('24-') ? 0 : 6,
          );
        }
      });
      expect(s.pMethod).toBe(/kelowna/.test(f) ? 'kelowna' : 'olsen');
    });
  }

  it('censored values and not-tested marks: flagged, substituted, and listed as refused with their rows', async () => {
    const { samples: s, reading } = buildSamples(await read('20-censored-and-not-tested.csv'));
    // common practice (docs/method.md): below detection -> half the limit; above range -> the limit
    expect(s.values.no3_n[0]).toBe(1 + sub(0, 'no3'));
    expect(s.censored.no3_n[0]).toBe(-1);
    expect(s.censored.so4_s[2]).toBe(1);
    expect(s.values.so4_s[2]).toBe(top(2, 'so4') + 60);
    expect(Number.isNaN(s.values.p[1])).toBe(true);
    expect(reading.find((c) => c.column === 'P Olsen (ppm)')!.refused).toEqual([
      { where: 'row 4', value: 'n/a' },
    ]);
  });
});

/** The 6-24 in layer of sample i in lb/ac, read back from the fixture that prints layers in lb/ac (12-tab-separated.tsv). */
function layer(i: number, a: 'no3' | 'so4', l: 0 | 1): number {
  const rows = readFileSync(join(DIR, '12-tab-separated.tsv'), 'utf8')
    .trim()
    .split('\n')
    .map((r) => r.split('\t'));
  return Number(rows[1 + 2 * i + l][a === 'no3' ? 4 : 7]);
}
const sub = (i: number, a: 'no3' | 'so4') => layer(i, a, 1);
const top = (i: number, a: 'no3' | 'so4') => layer(i, a, 0);

describe('lab corpus: refused with the column, the ambiguity and the exact fix', () => {
  const cases: [string, RegExp, string][] = [
    [
      '25-two-id-columns.csv',
      /columns "Sample ID" and "Site" both look like the id column \(ambiguous\)\. Fix: say which one with --columns "id=Sample ID"\./,
      'id=Sample ID',
    ],
    [
      '26-nitrate-without-unit.csv',
      /column "NO3-N 0-24" holds nitrate-N but does not say its unit.*Fix: state it with --columns "no3_n=NO3-N 0-24:ppm@0-24"/,
      'no3_n=NO3-N 0-24:lb/ac@0-24',
    ],
    [
      '28-geojson-depth-properties-no-unit.geojson',
      /columns "no3_0_6", "no3_6_24" hold nitrate-N but do not say their unit.*--columns "no3_n=no3_0_6:ppm@0-6,no3_n=no3_6_24:ppm@6-24"/,
      'no3_n=no3_0_6:ppm@0-6,no3_n=no3_6_24:ppm@6-24,so4_s=so4_0_6:ppm@0-6,so4_s=so4_6_24:ppm@6-24',
    ],
  ];
  for (const [f, re, fix] of cases) {
    it(f, async () => {
      await expect(async () => buildSamples(await read(f))).rejects.toThrow(re);
      const { samples: s } = buildSamples(await read(f, fix), { map: parseColumnMap(fix) });
      truth.forEach((t, i) => expect(s.values.no3_n[i]).toBeCloseTo(t.no3_n as number, 6));
    });
  }

  it('27-bray-p-only.csv: P by a method tilth has no tables for is named, not used as Olsen', async () => {
    await expect(async () => buildSamples(await read('27-bray-p-only.csv'))).rejects.toThrow(
      /column "Bray P1 \(ppm\)" holds P by the Bray method.*Fix: give Olsen or modified Kelowna P results/,
    );
  });

  it('10-utm-easting-northing.csv without --crs: says the columns hold metres and how to name the system', async () => {
    expect(() =>
      readCsvRecords(readFileSync(join(DIR, '10-utm-easting-northing.csv'), 'utf8'), '10.csv', []),
    ).toThrow(/"Easting" and "Northing" hold metres.*Fix: say which with --crs, e\.g\. --crs EPSG:26913/);
  });
});

describe('lab corpus: soluble salts and free lime', () => {
  it('EC in dS/m or mmhos/cm (the same unit), carbonate in % or as rating words', async () => {
    const a = buildSamples(await read('16-ec-carbonate.csv')).samples;
    const b = buildSamples(await read('17-ec-paste-lime-rating.csv')).samples;
    truth.forEach((t, i) => {
      // 1 dS/m = 1 mmho/cm = 1 mS/cm (SI: siemens = 1/ohm)
      expect(a.extra!.ec![i]).toBeCloseTo(t.ec as number, 9);
      expect(b.extra!.ec![i]).toBeCloseTo(t.ec as number, 9);
      expect(a.extra!.carbonate![i]).toBeCloseTo(t.carbonate as number, 9);
    });
    expect(a.ecMethod).toBe('1:2 water');
    expect(b.ecMethod).toBe('saturated paste');
    expect(b.limeRating).toEqual(
      truth.map((t) =>
        (t.carbonate as number) < 1
          ? 'none'
          : (t.carbonate as number) < 3
            ? 'low'
            : (t.carbonate as number) < 6
              ? 'medium'
              : 'high',
      ),
    );
  });

  it('saline from EC 4 dS/m, slightly saline from 2, high pH from 7.8; named in warnings, no rate input', async () => {
    const s = buildSamples(await read('16-ec-carbonate.csv')).samples;
    const flags = soilFlagsById(s);
    // [published] USDA Agriculture Handbook 60 (Richards 1954): saline soils have ECe > 4 dS/m; 2 dS/m and pH 7.8: common practice
    truth.forEach((t, i) => {
      const want = [
        (t.ec as number) >= 4 ? 'saline' : (t.ec as number) >= 2 ? 'slightly saline' : '',
        s.values.ph[i] >= 7.8 ? 'high pH' : '',
        (t.carbonate as number) >= 5 ? 'free lime' : '',
      ]
        .filter(Boolean)
        .join('; ');
      expect(flags[t.id as string] ?? '').toBe(want);
    });
    expect(flags['PV-03']).toMatch(/^saline/);
    expect(flags['PV-05']).toBe('slightly saline');
    const codes = soilFlagWarnings(s, 'f.csv').map((w) => w.code);
    expect(codes).toContain('soil-saline');
    expect(codes).toContain('soil-slightly-saline');
  });
});
