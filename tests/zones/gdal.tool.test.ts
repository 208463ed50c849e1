/**
 * Integration: zones written as GeoJSON (WGS 84) open in GDAL 3.6 ogrinfo and every zone is valid by
 * GEOS (ST_IsValid through OGR's SQLite dialect, the validity check GDAL documents).
 */
import { describe, expect, it } from 'vitest';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { ogrValid, requireTool } from '../helpers/tools.js';
import { projectField } from '../../src/geo/field.js';
import {
  labelComponents,
  makeZones,
  toLonLat,
  traceZones,
  zonesFromSampleZones,
} from '../../src/zones/index.js';
import { gridFor } from './fixtures.js';

/** An invented quarter-section-like field near 52.1 N, 106.6 W with a slough (hole). */
function field() {
  const lon0 = -106.61,
    lat0 = 52.1,
    dx = 0.0117,
    dy = 0.0072; // about 800 m x 800 m
  const outer = [
    [lon0, lat0],
    [lon0 + dx, lat0 + 0.0004],
    [lon0 + dx * 0.97, lat0 + dy],
    [lon0 + dx * 0.4, lat0 + dy * 1.02],
    [lon0 - 0.0003, lat0 + dy * 0.6],
    [lon0, lat0],
  ];
  const hole = [
    [lon0 + 0.004, lat0 + 0.002],
    [lon0 + 0.005, lat0 + 0.0035],
    [lon0 + 0.006, lat0 + 0.002],
    [lon0 + 0.004, lat0 + 0.002],
  ];
  return projectField([[outer, hole]], 'Test quarter');
}

const fc = (zones: { lonlat: number[][][][] }[]) =>
  JSON.stringify({
    type: 'FeatureCollection',
    name: 'zones',
    features: zones.map((z, i) => ({
      type: 'Feature',
      properties: { id: i },
      geometry: { type: 'MultiPolygon', coordinates: z.lonlat },
    })),
  });

describe.skipIf(!requireTool('ogrinfo', 'gdal-bin'))(
  'zones open in GDAL ogrinfo and are valid (GEOS ST_IsValid)',
  () => {
    it.each([
      { simplifyCells: 1, minAreaM2: 500 },
      { simplifyCells: 3, minAreaM2: 0 }, // wide smoothing, tiny zones along the edge kept
    ])(
      'raster zones from a noisy surface (edge tolerance $simplifyCells cell(s))',
      ({ simplifyCells, minAreaM2 }) => {
        const f = field();
        const grid = gridFor(f, 4);
        const v = new Float64Array(grid.cols * grid.rows);
        let s = 7;
        for (let i = 0; i < v.length; i++) {
          s = (s * 1664525 + 1013904223) >>> 0;
          const c = i % grid.cols,
            r = Math.floor(i / grid.cols);
          v[i] =
            grid.fraction[i] > 0 ? 60 + 30 * Math.sin(c / 17) * Math.cos(r / 23) + 25 * (s / 2 ** 32) : NaN;
        }
        const zs = makeZones(grid, v, f, {
          method: 'quantile',
          classes: 5,
          step: 5,
          minAreaM2,
          simplifyCells,
          majorityIterations: 1,
          projector: f.projector,
        });
        expect(zs.zones.length).toBeGreaterThan(5);
        const dir = mkdtempSync(join(tmpdir(), 'tilth-zones-'));
        try {
          const file = join(dir, 'zones.geojson');
          writeFileSync(file, fc(zs.zones));
          const [n, valid] = ogrValid(file, 'zones');
          expect(n).toBe(zs.zones.length);
          expect(valid).toBe(n);
        } finally {
          rmSync(dir, { recursive: true, force: true });
        }
      },
    );

    it('traced noise rasters (many corner-only contacts, split rings, touching holes) are valid for GEOS', () => {
      const f = field();
      const cols = 40,
        rows = 40,
        zonesAll: { lonlat: number[][][][] }[] = [];
      for (const seed of [3, 17, 101]) {
        let s = seed;
        const cls = new Int16Array(cols * rows);
        for (let i = 0; i < cls.length; i++) {
          s = (s * 1103515245 + 12345) & 0x7fffffff;
          cls[i] = (s >> 8) % 3;
        }
        const { label, count } = labelComponents(cls, cols, rows);
        const traced = traceZones(label, count, {
          xmin: f.bbox[0] + seed * 100,
          ymax: f.bbox[3],
          cell: 2,
          cols,
          rows,
        });
        for (const parts of traced) zonesAll.push({ lonlat: toLonLat(parts, f.projector) });
      }
      const dir = mkdtempSync(join(tmpdir(), 'tilth-zones-'));
      try {
        const file = join(dir, 'zones.geojson');
        writeFileSync(file, fc(zonesAll));
        const [n, valid] = ogrValid(file, 'zones');
        expect(n).toBe(zonesAll.length);
        expect(valid).toBe(n);
      } finally {
        rmSync(dir, { recursive: true, force: true });
      }
    });

    it('zone-composite fields: sampled zone polygons clipped to the boundary', () => {
      const f = field();
      const [x0, y0, x1, y1] = f.bbox;
      const xm = (x0 + x1) / 2;
      // two sampled zones: west half (reaching past the boundary) and east half overlapping it by 10 m
      const rect = (a: number, b: number) => [
        {
          exterior: Float64Array.from([a, y0 - 50, b, y0 - 50, b, y1 + 50, a, y1 + 50, a, y0 - 50]),
          holes: [],
        },
      ];
      const sz = { keys: ['W', 'E'], lonlat: [[], []], parts: [rect(x0 - 50, xm), rect(xm - 10, x1 + 50)] };
      const { zones, warnings } = zonesFromSampleZones(sz, f, { projector: f.projector });
      expect(zones.map((z) => z.key)).toEqual(['W', 'E']);
      expect(warnings.map((w) => w.code)).toEqual(['zones-sampled-overlap']);
      expect(Math.abs(zones[0].areaM2 + zones[1].areaM2 - f.areaM2)).toBeLessThan(1e-4 * f.areaM2);
      const dir = mkdtempSync(join(tmpdir(), 'tilth-zones-'));
      try {
        const file = join(dir, 'zones.geojson');
        writeFileSync(file, fc(zones));
        expect(ogrValid(file, 'zones')).toEqual([2, 2]);
      } finally {
        rmSync(dir, { recursive: true, force: true });
      }
    });
  },
);
