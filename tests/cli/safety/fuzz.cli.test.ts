/**
 * A small seeded run of the fuzz suite (scripts/fuzz): every target, fixed seeds, so a crash, hang or wrongly
 * accepted input found once stays found. The big run is `npm run fuzz -- --runs 10000` (docs/reliability.md).
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { ROOT } from '../../helpers/cli.js';

describe('seeded fuzz (small run)', () => {
  it('120 seeded runs over every reader and command stage: no crash, hang or wrongly accepted input', () => {
    const json = join(mkdtempSync(join(tmpdir(), 'tilth-fuzz-test-')), 'fuzz.json');
    const r = spawnSync(
      process.execPath,
      [
        '--import',
        'tsx',
        join(ROOT, 'scripts', 'fuzz', 'run.ts'),
        '--runs',
        '120',
        '--seed',
        '7000',
        '--quiet',
        '--hang-ms',
        '60000',
        '--json',
        json,
      ],
      { cwd: ROOT, encoding: 'utf8', timeout: 900_000 },
    );
    const summary = JSON.parse(readFileSync(json, 'utf8'));
    expect(summary.bad, r.stderr).toEqual([]);
    expect(r.status).toBe(0);
    // the run reached the readers: some inputs were accepted and some refused
    const all = Object.values(summary.byTarget as Record<string, Record<string, number>>);
    expect(all.reduce((s, t) => s + (t.refused ?? 0), 0)).toBeGreaterThan(10);
    expect(all.reduce((s, t) => s + (t.accepted ?? 0), 0)).toBeGreaterThan(10);
  }, 900_000);
});
