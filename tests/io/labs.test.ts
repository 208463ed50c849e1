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

// reviewed by hand: column -> role|unit|depth|method (" unused" where set aside)
const READINGS: Record<string, Record<string, string>> = {
  '01-long-ppm-depth-column.csv': {
    Sample: 'id|||',
    Lat: 'lat|||',
    Long: 'lon|||',
    Depth: 'depth||values: unit from the layers|',
    'Nitrate-N ppm': 'no3_n|ppm|from "Depth"|',
    'Phosphorus (Olsen) ppm': 'p|ppm|from "Depth"|Olsen',
    'Potassium ppm': 'k|ppm|from "Depth"|',
    'Sulfate-S ppm': 'so4_s|ppm|from "Depth"|',
    'Org Matter %': 'om|%|from "Depth"|',
    'pH (1:2)': 'ph||from "Depth"|1:2 water',
  },
  '02-wide-lbac-inch-marks.csv': {
    'Sample ID': 'id|||',
    Latitude: 'lat|||',
    Longitude: 'lon|||',
    'NO3-N 0-6" (lb/ac)': 'no3_n|lb/ac|0-6 in|',
    'NO3-N 6-24" (lb/ac)': 'no3_n|lb/ac|6-24 in|',
    'P Olsen (ppm)': 'p|ppm|0-6 in (usual)|Olsen',
    'K (ppm)': 'k|ppm|0-6 in (usual)|',
    'SO4-S 0-6" lbs/A': 'so4_s|lb/ac|0-6 in|',
    'SO4-S 6-24" lbs/A': 'so4_s|lb/ac|6-24 in|',
    'OM (%)': 'om|%|0-6 in (usual)|',
    'pH (1:1)': 'ph||0-6 in (usual)|1:1 water',
  },
  '03-wide-cm-mgkg.csv': {
    Site: 'id|||',
    Lat: 'lat|||',
    Lon: 'lon|||',
    'NO3-N 0-15 cm (mg/kg)': 'no3_n|ppm|0-6 in|',
    'NO3-N 15-60 cm (mg/kg)': 'no3_n|ppm|6-24 in|',
    'P (NaHCO3) mg/kg': 'p|ppm|0-6 in (usual)|Olsen',
    'Exch K mg/kg': 'k|ppm|0-6 in (usual)|',
    'SO4-S 0-15 cm mg/kg': 'so4_s|ppm|0-6 in|',
    'SO4-S 15-60 cm mg/kg': 'so4_s|ppm|6-24 in|',
    'O.M. %': 'om|%|0-6 in (usual)|',
    'pH 1:2 water': 'ph||0-6 in (usual)|1:2 water',
  },
  '04-units-row.csv': {
    Sample: 'id|||',
    Lat: 'lat|||',
    Long: 'lon|||',
    Depth: 'depth||values in in|',
    Nitrate: 'no3_n|ppm|from "Depth"|',
    'Olsen P': 'p|ppm|from "Depth"|Olsen',
    K: 'k|ppm|from "Depth"|',
    'Sulphate-S': 'so4_s|ppm|from "Depth"|',
    OM: 'om|%|from "Depth"|',
    pH: 'ph||from "Depth"|1:2 water',
  },
  '05-spanning-header.csv': {
    Sample: 'id|||',
    Lat: 'lat|||',
    Long: 'lon|||',
    'Nitrate-N (lb/ac)': 'no3_n|lb/ac|0-6 in|',
    'Nitrate-N (lb/ac) 6-24"': 'no3_n|lb/ac|6-24 in|',
    'Sulphate-S (lb/ac)': 'so4_s|lb/ac|0-6 in|',
    'Sulphate-S (lb/ac) 6-24"': 'so4_s|lb/ac|6-24 in|',
    'P Olsen (ppm)': 'p|ppm|0-6 in (usual)|Olsen',
    'K (ppm)': 'k|ppm|0-6 in (usual)|',
    'OM (%)': 'om|%|0-6 in (usual)|',
    pH: 'ph||0-6 in (usual)|',
  },
  '06-semicolon-decimal-comma.csv': {
    'Probe Nr. Sample': 'id|||',
    'Breite Lat': 'lat|||',
    'Laenge Lon': 'lon|||',
    'Tiefe Depth (cm)': 'depth||values in cm|',
    'NO3-N (mg/kg)': 'no3_n|ppm|from "Tiefe Depth (cm)"|',
    'P Olsen (mg/kg)': 'p|ppm|from "Tiefe Depth (cm)"|Olsen',
    'K (mg/kg)': 'k|ppm|from "Tiefe Depth (cm)"|',
    'SO4-S (mg/kg)': 'so4_s|ppm|from "Tiefe Depth (cm)"|',
    'OM (%)': 'om|%|from "Tiefe Depth (cm)"|',
    'pH (1:2)': 'ph||from "Tiefe Depth (cm)"|1:2 water',
  },
  '07-bom-crlf-quoted-headers.csv': {
    Sample: 'id|||',
    Latitude: 'lat|||',
    Longitude: 'lon|||',
    'Nitrate-N, 0-24 in (lb/ac)': 'no3_n|lb/ac|0-24 in|',
    'P, Olsen (ppm)': 'p|ppm|0-6 in (usual)|Olsen',
    'K, ammonium acetate (ppm)': 'k|ppm|0-6 in (usual)|ammonium acetate',
    'Sulphate-S, 0-24 in (lb/ac)': 'so4_s|lb/ac|0-24 in|',
    'Organic matter, LOI (%)': 'om|%|0-6 in (usual)|LOI',
    'pH, 1:1 water': 'ph||0-6 in (usual)|1:1 water',
  },
  '08-preamble-footer-blank-rows.csv': {
    'Lab #': '-||| unused',
    Sample: 'id|||',
    Lat: 'lat|||',
    Long: 'lon|||',
    'Depth (in)': 'depth||values in in|',
    'NO3-N (lb/ac)': 'no3_n|lb/ac|from "Depth (in)"|',
    'P Olsen (ppm)': 'p|ppm|from "Depth (in)"|Olsen',
    'K (ppm)': 'k|ppm|from "Depth (in)"|',
    'SO4-S (lb/ac)': 'so4_s|lb/ac|from "Depth (in)"|',
    'OM (%)': 'om|%|from "Depth (in)"|',
    pH: 'ph||from "Depth (in)"|',
  },
  '09-latlon-one-column.csv': {
    Sample: 'id|||',
    'Lat, Lon': 'latlon|||',
    Depth: 'depth||values: unit from the layers|',
    'NO3-N (ppm)': 'no3_n|ppm|from "Depth"|',
    'Bicarb P (ppm)': 'p|ppm|from "Depth"|Olsen',
    'K (ppm)': 'k|ppm|from "Depth"|',
    'SO4-S (ppm)': 'so4_s|ppm|from "Depth"|',
    'OM (%)': 'om|%|from "Depth"|',
    pH: 'ph||from "Depth"|',
  },
  '10-utm-easting-northing.csv': {
    Sample: 'id|||',
    Easting: 'x|||',
    Northing: 'y|||',
    'NO3-N 0-24 (lb/ac)': 'no3_n|lb/ac|0-24 in|',
    'P Olsen (ppm)': 'p|ppm|0-6 in (usual)|Olsen',
    'K (ppm)': 'k|ppm|0-6 in (usual)|',
    'SO4-S 0-24 (lb/ac)': 'so4_s|lb/ac|0-24 in|',
    'OM (%)': 'om|%|0-6 in (usual)|',
    pH: 'ph||0-6 in (usual)|',
  },
  '11-leading-zero-ids.csv': {
    'Lab No': '-||| unused',
    'Sample #': 'id|||',
    Lat: 'lat|||',
    Lon: 'lon|||',
    'NO3-N 0-24 in (lb/ac)': 'no3_n|lb/ac|0-24 in|',
    'P Olsen (ppm)': 'p|ppm|0-6 in (usual)|Olsen',
    'K (ppm)': 'k|ppm|0-6 in (usual)|',
    'SO4-S 0-24 in (lb/ac)': 'so4_s|lb/ac|0-24 in|',
    'OM (%)': 'om|%|0-6 in (usual)|',
    pH: 'ph||0-6 in (usual)|',
  },
  '12-tab-separated.tsv': {
    Sample: 'id|||',
    Lat: 'lat|||',
    Long: 'lon|||',
    Depth: 'depth||values: unit from the layers|',
    'NO3-N (lb/ac)': 'no3_n|lb/ac|from "Depth"|',
    'P Olsen (ppm)': 'p|ppm|from "Depth"|Olsen',
    'K (ppm)': 'k|ppm|from "Depth"|',
    'SO4-S (lb/ac)': 'so4_s|lb/ac|from "Depth"|',
    'OM (%)': 'om|%|from "Depth"|',
    pH: 'ph||from "Depth"|',
  },
  '13-method-column-kelowna.csv': {
    Sample: 'id|||',
    Lat: 'lat|||',
    Long: 'lon|||',
    'NO3-N 0-24 (lb/ac)': 'no3_n|lb/ac|0-24 in|',
    'P Method': 'pmethod|||',
    'P (ppm)': 'p|ppm|0-6 in (usual)|',
    'K (ppm)': 'k|ppm|0-6 in (usual)|',
    'SO4-S 0-24 (lb/ac)': 'so4_s|lb/ac|0-24 in|',
    'OM (%)': 'om|%|0-6 in (usual)|',
    pH: 'ph||0-6 in (usual)|',
  },
  '14-abbreviations-cm-depth.csv': {
    Sample: 'id|||',
    Lat: 'lat|||',
    Long: 'lon|||',
    'Depth (cm)': 'depth||values in cm|',
    'NO3-N ppm': 'no3_n|ppm|from "Depth (cm)"|',
    'P (bicarbonate) ppm': 'p|ppm|from "Depth (cm)"|Olsen',
    'K (NH4OAc) ppm': 'k|ppm|from "Depth (cm)"|ammonium acetate',
    'Sulfate ppm': 'so4_s|ppm|from "Depth (cm)"|',
    'O.M. (%)': 'om|%|from "Depth (cm)"|',
    'Soil pH (1:2)': 'ph||from "Depth (cm)"|1:2 water',
  },
  '15-spellings-loi-kelowna.csv': {
    Sample: 'id|||',
    Latitude: 'lat|||',
    Longitude: 'lon|||',
    'Nitrate 0-24 in (lb/ac)': 'no3_n|lb/ac|0-24 in|',
    'P mod. Kelowna (ppm)': 'p|ppm|0-6 in (usual)|modified Kelowna',
    'Exch. K (ppm)': 'k|ppm|0-6 in (usual)|',
    'Sulphate-S 0-24 in (lb/ac)': 'so4_s|lb/ac|0-24 in|',
    'LOI (%)': 'om|%|0-6 in (usual)|LOI',
    'pH (1:2)': 'ph||0-6 in (usual)|1:2 water',
  },
  '16-ec-carbonate.csv': {
    Sample: 'id|||',
    Lat: 'lat|||',
    Long: 'lon|||',
    'NO3-N 0-24 (lb/ac)': 'no3_n|lb/ac|0-24 in|',
    'P Olsen (ppm)': 'p|ppm|0-6 in (usual)|Olsen',
    'K (ppm)': 'k|ppm|0-6 in (usual)|',
    'SO4-S 0-24 (lb/ac)': 'so4_s|lb/ac|0-24 in|',
    'OM (%)': 'om|%|0-6 in (usual)|',
    'pH (1:2)': 'ph||0-6 in (usual)|1:2 water',
    'EC 1:2 (dS/m)': 'ec|dS/m|0-6 in (usual)|1:2 water',
    'CaCO3 (%)': 'carbonate|%|0-6 in (usual)|',
  },
  '17-ec-paste-lime-rating.csv': {
    Sample: 'id|||',
    Lat: 'lat|||',
    Long: 'lon|||',
    'NO3-N 0-24 (lb/ac)': 'no3_n|lb/ac|0-24 in|',
    'P Olsen (ppm)': 'p|ppm|0-6 in (usual)|Olsen',
    'K (ppm)': 'k|ppm|0-6 in (usual)|',
    'SO4-S 0-24 (lb/ac)': 'so4_s|lb/ac|0-24 in|',
    'OM (%)': 'om|%|0-6 in (usual)|',
    pH: 'ph||0-6 in (usual)|',
    'E.C. sat. paste (mmhos/cm)': 'ec|dS/m|0-6 in (usual)|saturated paste',
    'Free Lime': 'carbonate||0-6 in (usual)|',
  },
  '18-ph-water-and-cacl2.csv': {
    Sample: 'id|||',
    Lat: 'lat|||',
    Long: 'lon|||',
    'NO3-N 0-24 (lb/ac)': 'no3_n|lb/ac|0-24 in|',
    'P Olsen (ppm)': 'p|ppm|0-6 in (usual)|Olsen',
    'K (ppm)': 'k|ppm|0-6 in (usual)|',
    'SO4-S 0-24 (lb/ac)': 'so4_s|lb/ac|0-24 in|',
    'OM (%)': 'om|%|0-6 in (usual)|',
    'pH (CaCl2)': 'ph||0-6 in (usual)|CaCl2 unused',
    'pH (1:1 water)': 'ph||0-6 in (usual)|1:1 water',
    'Buffer pH': '-||| unused',
  },
  '19-two-units-and-recommendations.csv': {
    Sample: 'id|||',
    Lat: 'lat|||',
    Long: 'lon|||',
    'NO3-N 0-24 (ppm)': 'no3_n|ppm|0-24 in| unused',
    'NO3-N 0-24 (lb/ac)': 'no3_n|lb/ac|0-24 in|',
    'P Olsen (ppm)': 'p|ppm|0-6 in (usual)|Olsen',
    'K (ppm)': 'k|ppm|0-6 in (usual)|',
    'SO4-S 0-24 (lb/ac)': 'so4_s|lb/ac|0-24 in|',
    'OM (%)': 'om|%|0-6 in (usual)|',
    pH: 'ph||0-6 in (usual)|',
    'N Rec (lb/ac)': '-||| unused',
    'P2O5 Rec (lb/ac)': '-||| unused',
  },
  '20-censored-and-not-tested.csv': {
    Sample: 'id|||',
    Lat: 'lat|||',
    Long: 'lon|||',
    Depth: 'depth||values: unit from the layers|',
    'NO3-N (lb/ac)': 'no3_n|lb/ac|from "Depth"|',
    'P Olsen (ppm)': 'p|ppm|from "Depth"|Olsen',
    'K (ppm)': 'k|ppm|from "Depth"|',
    'SO4-S (lb/ac)': 'so4_s|lb/ac|from "Depth"|',
    'OM (%)': 'om|%|from "Depth"|',
    pH: 'ph||from "Depth"|',
  },
  '21-kgha-0-60cm.csv': {
    Sample: 'id|||',
    Lat: 'lat|||',
    Lon: 'lon|||',
    'NO3-N 0-60 cm (kg/ha)': 'no3_n|kg/ha|0-24 in|',
    'Olsen P (mg/kg)': 'p|ppm|0-6 in (usual)|Olsen',
    'K (mg/kg)': 'k|ppm|0-6 in (usual)|',
    'SO4-S 0-60 cm (kg/ha)': 'so4_s|kg/ha|0-24 in|',
    'OM %': 'om|%|0-6 in (usual)|',
    pH: 'ph||0-6 in (usual)|',
  },
  '22-depth-column-beats-header.csv': {
    Sample: 'id|||',
    Lat: 'lat|||',
    Long: 'lon|||',
    'Depth (in)': 'depth||values in in|',
    'NO3-N 0-6 (ppm)': 'no3_n|ppm|from "Depth (in)" (header depth 0-6 in only where a row has none)|',
    'P Olsen 0-6 (ppm)': 'p|ppm|from "Depth (in)" (header depth 0-6 in only where a row has none)|Olsen',
    'K 0-6 (ppm)': 'k|ppm|from "Depth (in)" (header depth 0-6 in only where a row has none)|',
    'SO4-S 0-6 (ppm)': 'so4_s|ppm|from "Depth (in)" (header depth 0-6 in only where a row has none)|',
    'OM (%)': 'om|%|from "Depth (in)"|',
    pH: 'ph||from "Depth (in)"|',
  },
  '23-xy-degrees.csv': {
    ID: 'id|||',
    X: 'x|||',
    Y: 'y|||',
    'N 0-24 (lb/ac)': 'no3_n|lb/ac|0-24 in|',
    'P Olsen (ppm)': 'p|ppm|0-6 in (usual)|Olsen',
    'K (ppm)': 'k|ppm|0-6 in (usual)|',
    'S 0-24 (lb/ac)': 'so4_s|lb/ac|0-24 in|',
    'OM (%)': 'om|%|0-6 in (usual)|',
    pH: 'ph||0-6 in (usual)|',
  },
  '24-k-meq.csv': {
    Sample: 'id|||',
    Lat: 'lat|||',
    Long: 'lon|||',
    'NO3-N 0-24 (lb/ac)': 'no3_n|lb/ac|0-24 in|',
    'P Olsen (ppm)': 'p|ppm|0-6 in (usual)|Olsen',
    'Exch K (meq/100g)': 'k|meq/100g|0-6 in (usual)|',
    'SO4-S 0-24 (lb/ac)': 'so4_s|lb/ac|0-24 in|',
    'OM (%)': 'om|%|0-6 in (usual)|',
    pH: 'ph||0-6 in (usual)|',
  },
  '29-xlsx-typed-cells.xlsx': {
    Sample: 'id|||',
    'Date Sampled': '-||| unused',
    Latitude: 'lat|||',
    Longitude: 'lon|||',
    'Depth (in)': 'depth||values in in|',
    'NO3-N (lb/ac)': 'no3_n|lb/ac|from "Depth (in)"|',
    'P Olsen (ppm)': 'p|ppm|from "Depth (in)"|Olsen',
    'K (ppm)': 'k|ppm|from "Depth (in)"|',
    'SO4-S (lb/ac)': 'so4_s|lb/ac|from "Depth (in)"|',
    'OM (%)': 'om|%|from "Depth (in)"|',
    'pH (1:2)': 'ph||from "Depth (in)"|1:2 water',
    'EC (dS/m)': 'ec|dS/m|from "Depth (in)"|',
  },
  '30-xlsx-second-sheet.xlsx': {
    Sample: 'id|||',
    'Date Sampled': '-||| unused',
    Latitude: 'lat|||',
    Longitude: 'lon|||',
    'Depth (in)': 'depth||values in in|',
    'NO3-N (lb/ac)': 'no3_n|lb/ac|from "Depth (in)"|',
    'P Olsen (ppm)': 'p|ppm|from "Depth (in)"|Olsen',
    'K (ppm)': 'k|ppm|from "Depth (in)"|',
    'SO4-S (lb/ac)': 'so4_s|lb/ac|from "Depth (in)"|',
    'OM (%)': 'om|%|from "Depth (in)"|',
    'pH (1:2)': 'ph||from "Depth (in)"|1:2 water',
    'EC (dS/m)': 'ec|dS/m|from "Depth (in)"|',
  },
  '31-xlsx-units-row-cm.xlsx': {
    Sample: 'id|||',
    Lat: 'lat|||',
    Long: 'lon|||',
    'Nitrate-N': 'no3_n|ppm|0-6 in|',
    'Nitrate-N (2)': 'no3_n|ppm|6-24 in|',
    'Olsen P': 'p|ppm|0-6 in (usual)|Olsen',
    K: 'k|ppm|0-6 in (usual)|',
    'Sulfate-S': 'so4_s|ppm|0-6 in|',
    'Sulfate-S (2)': 'so4_s|ppm|6-24 in|',
    OM: 'om|%|0-6 in (usual)|',
    pH: 'ph||0-6 in (usual)|1:1 water',
  },
};

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
    expect(codes).toContain('soil.saline');
    expect(codes).toContain('soil.slightly-saline');
  });
});
