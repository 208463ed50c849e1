/** The lab corpus (tests/fixtures/labs) through the command line: .xlsx sheets, the column reading, --columns, --verbose. */
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { tilth } from '../helpers/cli.js';

describe('lab corpus from the command line', () => {
  const B = 'sample-fields/quarter/boundary.geojson';
  it('inspect --json on a second sheet of an .xlsx: the column reading, EC kept', () => {
    const r = tilth([
      'inspect',
      '--samples',
      'tests/fixtures/labs/30-xlsx-second-sheet.xlsx',
      '--sheet',
      'Results',
      '--boundary',
      B,
      '--json',
    ]);
    expect(r.code).toBe(0);
    const j = JSON.parse(r.stdout);
    expect(j.columns.find((c: { column: string }) => c.column === 'pH (1:2)')).toMatchObject({
      role: 'ph',
      method: '1:2 water',
      how: 'header',
    });
    expect(j.samples.count).toBe(6);
  });

  it('an unknown sheet names the sheets there are', () => {
    const r = tilth([
      'inspect',
      '--samples',
      'tests/fixtures/labs/30-xlsx-second-sheet.xlsx',
      '--sheet',
      'Data',
      '--boundary',
      B,
    ]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/no sheet "Data"\. Fix: give one of --sheet "Cover", --sheet "Results"/);
  });

  it('--columns wins and can give a depth: ph=pH (1:2)@0-6; --verbose prints the reading on stderr', () => {
    const r = tilth([
      'inspect',
      '--samples',
      'tests/fixtures/labs/01-long-ppm-depth-column.csv',
      '--boundary',
      B,
      '--columns',
      'ph=pH (1:2)@0-6',
      '--verbose',
      '--json',
    ]);
    expect(r.code).toBe(0);
    const ph = JSON.parse(r.stdout).columns.find((c: { column: string }) => c.column === 'pH (1:2)');
    expect(ph).toMatchObject({ role: 'ph', how: 'column map, depth from map' });
    expect(r.stderr).toMatch(/columns of .*01-long-ppm-depth-column\.csv:[\s\S]*pH \(1:2\)\s+ph/);
  });

  it('build: zones.csv names saline / high-pH zones in soil_flags; rates do not use them', () => {
    const out = join(mkdtempSync(join(tmpdir(), 'tilth-labs-')), 'rx');
    const r = tilth([
      'build',
      '--samples',
      'tests/fixtures/labs/16-ec-carbonate.csv',
      '--boundary',
      B,
      '--plan',
      'sample-fields/quarter/plan.yaml',
      '--out',
      out,
      '--quiet',
    ]);
    expect(r.code).toBe(0);
    const rows = readFileSync(join(out, 'zones.csv'), 'utf8')
      .trim()
      .split('\n')
      .map((l) => l.split(','));
    const col = rows[0].indexOf('soil_flags');
    expect(col).toBeGreaterThan(0);
    expect(rows.slice(1).some((row) => /saline/.test(row[col]))).toBe(true);
    expect(readFileSync(join(out, 'report.html'), 'utf8')).toMatch(
      /are saline, EC \(1:2 water\) 4 dS\/m or more: PV-03/,
    );
  });
});
