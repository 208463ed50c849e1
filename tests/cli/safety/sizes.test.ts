/**
 * Per-file size limits: a file over its kind's limit is refused from its size alone (nothing is read), as a
 * user error naming the file, the size, the limit and the fix. The big files are sparse (truncate), so they take
 * no disk and no time; the limits are tilth's own (docs/reliability.md), not from an outside source.
 */
import { mkdtempSync, truncateSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { readInput } from '../../../src/cli/util.js';
import { checkInputSize, SIZE_LIMITS, sizeLimitOf } from '../../../src/cli/safety/sizes.js';
import { isUserError } from '../../../src/errors.js';

const MiB = 1024 * 1024;

/** A sparse file of `bytes` bytes. */
function sparse(name: string, bytes: number): string {
  const p = join(mkdtempSync(join(tmpdir(), 'tilth-size-')), name);
  writeFileSync(p, '');
  truncateSync(p, bytes);
  return p;
}

function refusal(f: () => unknown): Error {
  try {
    f();
  } catch (e) {
    expect(isUserError(e), String(e)).toBe(true);
    return e as Error;
  }
  throw new Error('expected a UserError');
}

describe('input size limits', () => {
  const cases: [string, string, number][] = [
    ['samples.csv', 'CSV', 50],
    ['samples.TSV', 'CSV', 50],
    ['samples.xlsx', 'xlsx', 50],
    ['boundary.geojson', 'GeoJSON', 100],
    ['samples.json', 'GeoJSON', 100],
    ['TASKDATA.XML', 'task data XML', 100],
    ['boundary.zip', 'zip', 256],
    ['field.shp', 'shapefile or task data grid', 512],
    ['GRD00001.BIN', 'shapefile or task data grid', 512],
    ['plan.yaml', 'YAML', 4],
    ['boundary', 'GeoJSON', 100],
  ];
  for (const [name, kind, mib] of cases) {
    it(`${name}: one byte over ${mib} MiB is refused before reading, with the size, the limit and the fix`, () => {
      expect(sizeLimitOf(name).kind).toBe(kind);
      expect(sizeLimitOf(name).bytes).toBe(mib * MiB);
      const p = sparse(name, mib * MiB + 1);
      const e = refusal(() => readInput(p, 'samples'));
      expect(e.message).toContain(`samples file "${p}"`);
      expect(e.message).toMatch(
        new RegExp(`is ${mib}\\.0 MiB \\(${(mib * MiB + 1).toLocaleString('en-US')} bytes\\)`),
      );
      expect(e.message).toContain(`more than the ${mib} MiB tilth reads from one ${kind} file`);
      expect(e.message).toMatch(/Fix: /);
    });
  }

  it('a file at its limit passes (checked with the limits made small)', () => {
    const small = SIZE_LIMITS.map((l) => ({ ...l, bytes: 1000 }));
    for (const name of ['a.csv', 'a.xlsx', 'a.geojson', 'TASKDATA.xml']) {
      expect(() => checkInputSize(name, 1000, 'x', small)).not.toThrow();
      expect(refusal(() => checkInputSize(name, 1001, 'x', small)).message).toMatch(/1,001 bytes/);
    }
  });

  it('a small file is read as before', () => {
    const p = sparse('s.csv', 0);
    writeFileSync(p, 'id,lat,lon\n');
    expect(readInput(p, 'samples').toString()).toBe('id,lat,lon\n');
  });
});
