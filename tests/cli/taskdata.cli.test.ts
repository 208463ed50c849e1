/**
 * The CLI end to end on ISO 11783-10 task data: the demo build writes it and `tilth check` passes it;
 * `output.formats` and the grid cell size from the plan; check reads a folder and a TASKDATA.XML, and a
 * missing grid file is exit 2 naming the element.
 */
import { readFileSync, readdirSync, mkdtempSync, writeFileSync, mkdirSync } from 'node:fs';
import { spawnSync } from 'node:child_process';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { parse as parseYaml, stringify } from 'yaml';
import { taskDataFiles } from '../../src/io/isoxml/index.js';
import { quarterBuild, ROOT, tilth } from '../helpers/cli.js';
import { sample } from '../helpers/taskdata.js';

const PLAN = readFileSync(join(ROOT, 'sample-fields/quarter/plan.yaml'), 'utf8');

describe('the demo build (CLI)', () => {
  it('writes TASKDATA/ and taskdata.zip, and tilth check passes both', () => {
    const out = join(mkdtempSync(join(tmpdir(), 'tilth-demo-td-')), 'out');
    const b = spawnSync(process.execPath, [join(ROOT, 'bin/tilth.js'), ...quarterBuild(out), '--quiet'], {
      cwd: ROOT,
      encoding: 'utf8',
      timeout: 120_000,
    });
    expect(b.status).toBe(0);
    expect(readFileSync(join(out, 'TASKDATA', 'TASKDATA.XML'), 'utf8')).toMatch(
      /^<\?xml version="1.0" encoding="UTF-8"\?>\n<ISO11783_TaskData VersionMajor="4"/,
    );
    for (const f of ['taskdata.zip', 'TASKDATA']) {
      const c = spawnSync(
        process.execPath,
        [
          join(ROOT, 'bin/tilth.js'),
          'check',
          join(out, f),
          '--boundary',
          'sample-fields/quarter/boundary.geojson',
          '--speed',
          '8',
          '--json',
        ],
        { cwd: ROOT, encoding: 'utf8', timeout: 120_000 },
      );
      expect(c.stderr).toBe('');
      const j = JSON.parse(c.stdout);
      expect(j.ok).toBe(true);
      expect(c.status).toBe(0);
      // totals per product agree with the build's summary (kg), each within the DDI rounding
      const summary = JSON.parse(readFileSync(join(out, 'summary.json'), 'utf8'));
      for (const r of j.reports) {
        const [, task, product] = /task \S+ "[^:]+: ([^"]+)", product \S+ "([^"]+)"/.exec(r.file)!;
        const t = summary.totals.find(
          (x: any) => x.label === product && x.placement === task.replace(' ', '_'),
        );
        // summary.json rounds to whole kg
        expect(Math.abs(r.totals[0].total - t.total_kg)).toBeLessThan(Math.max(0.001 * t.total_kg, 0.5));
      }
    }
  }, 240_000);

  it('output.formats: [isoxml] with isoxml_grid writes grid task data and no shapefiles', () => {
    const d = mkdtempSync(join(tmpdir(), 'tilth-demo-grid-'));
    const p = parseYaml(PLAN);
    Object.assign(p.output, { formats: ['isoxml'], isoxml_grid: true, isoxml_grid_cell_m: 4 });
    writeFileSync(join(d, 'plan.yaml'), stringify(p));
    const b = spawnSync(
      process.execPath,
      [
        join(ROOT, 'bin/tilth.js'),
        ...quarterBuild(join(d, 'out'), { plan: join(d, 'plan.yaml') }),
        '--quiet',
      ],
      { cwd: ROOT, encoding: 'utf8', timeout: 120_000 },
    );
    expect(b.status).toBe(0);
    expect(readdirSync(join(d, 'out'))).not.toContain('shapefiles');
    expect(readdirSync(join(d, 'out', 'TASKDATA')).sort()).toEqual([
      'GRD00001.bin',
      'GRD00002.bin',
      'TASKDATA.XML',
    ]);
    // 4 m cells: the GRD's north size is 4 m of latitude (1 degree of latitude is about 111.25 km at 52 N, from memory)
    const xml = readFileSync(join(d, 'out', 'TASKDATA', 'TASKDATA.XML'), 'utf8');
    expect(Number(/<GRD A="[^"]+" B="[^"]+" C="([^"]+)"/.exec(xml)![1]) * 111_250).toBeCloseTo(4, 1);
  }, 240_000);
});

describe('tilth check on task data (CLI)', () => {
  const d = mkdtempSync(join(tmpdir(), 'tilth-td-'));
  const td = join(d, 'TASKDATA');
  mkdirSync(td);
  for (const [k, v] of Object.entries(taskDataFiles(sample(true)))) writeFileSync(join(td, k), v);

  it('reads a TASKDATA folder and a TASKDATA.XML, one report per task and product', () => {
    for (const p of [td, join(td, 'TASKDATA.XML')]) {
      const r = tilth(['check', p, '--json']);
      expect(r.code).toBe(0);
      const j = JSON.parse(r.stdout);
      expect(j.reports.length).toBe(1);
      expect(j.reports[0].totals[0].unit).toBe('kg/ha');
    }
  });

  it('exit 2 with the element named when the grid file is missing', () => {
    const d2 = mkdtempSync(join(tmpdir(), 'tilth-td-'));
    writeFileSync(join(d2, 'TASKDATA.XML'), readFileSync(join(td, 'TASKDATA.XML')));
    const r = tilth(['check', join(d2, 'TASKDATA.XML')]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/GRD.*GRD00001\.BIN is missing/);
    expect(r.stderr).not.toMatch(/at .*\.ts:/); // no stack
  });
});
