/**
 * Size limits from the command line: an oversized input of each kind (sparse files, so no disk and no time) is
 * a user error, exit 2, naming the file, its size, the limit and the fix, with no stack and nothing read.
 */
import { mkdtempSync, truncateSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { ROOT, quarterBuild, tilth } from '../../helpers/cli.js';

const Q = join(ROOT, 'sample-fields', 'quarter');
const MiB = 1024 * 1024;

function sparse(name: string, bytes: number): string {
  const p = join(mkdtempSync(join(tmpdir(), 'tilth-size-cli-')), name);
  writeFileSync(p, '');
  truncateSync(p, bytes);
  return p;
}

function refused(args: string[], file: string, limit: string): void {
  const r = tilth(args);
  expect(r.code, r.stderr).toBe(2);
  expect(r.stderr).toContain(`"${file}" is `);
  expect(r.stderr).toContain(`more than the ${limit}`);
  expect(r.stderr).toMatch(/Fix: /);
  expect(r.stderr).not.toMatch(/internal error|\n\s+at /);
}

describe('oversized inputs from the CLI', () => {
  it('build: a 60 MiB samples CSV (limit 50 MiB)', () => {
    const csv = sparse('samples.csv', 60 * MiB);
    const out = join(mkdtempSync(join(tmpdir(), 'tilth-size-out-')), 'rx');
    refused([...quarterBuild(out, { samples: csv }), '--quiet'], csv, '50 MiB tilth reads from one CSV file');
  });

  it('inspect: a 120 MiB boundary GeoJSON (limit 100 MiB), a 51 MiB xlsx (limit 50 MiB)', () => {
    const b = sparse('boundary.geojson', 120 * MiB);
    refused(
      ['inspect', '--samples', join(Q, 'samples.csv'), '--boundary', b],
      b,
      '100 MiB tilth reads from one GeoJSON file',
    );
    const x = sparse('samples.xlsx', 51 * MiB);
    refused(
      ['inspect', '--samples', x, '--boundary', join(Q, 'boundary.geojson')],
      x,
      '50 MiB tilth reads from one xlsx file',
    );
  });

  it('check: a 101 MiB TASKDATA.XML (limit 100 MiB)', () => {
    const x = sparse('TASKDATA.XML', 101 * MiB);
    refused(['check', x], x, '100 MiB tilth reads from one task data XML file');
  });
});
