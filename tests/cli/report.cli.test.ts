import { describe, expect, it } from 'vitest';
import { copyFileSync, existsSync, mkdtempSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { tilth } from '../helpers/cli.js';
import { DEMO_INPUT_PATH } from '../helpers/report-fixture.js';
import { inputsHash } from '../../src/prescription/provenance.js';

function buildDir(): string {
  const d = mkdtempSync(join(tmpdir(), 'tilth-report-'));
  copyFileSync(DEMO_INPUT_PATH, join(d, 'report-data.json'));
  return d;
}

describe('tilth report DIR', () => {
  it('writes DIR/report.html from DIR/report-data.json, leaving no temporary file', () => {
    const d = buildDir();
    const r = tilth(['report', d]);
    expect(r.stderr).toContain('Report written');
    expect(r.code).toBe(0);
    const html = readFileSync(join(d, 'report.html'), 'utf8');
    expect(html.startsWith('<!DOCTYPE html>')).toBe(true);
    expect(html).toContain('Prairie View Farm (fictional demo)');
    expect(readdirSync(d).sort()).toEqual(['report-data.json', 'report.html']);
  });

  it('--json prints what was written on stdout; --quiet silences stderr', () => {
    const d = buildDir();
    const r = tilth(['report', d, '--json']);
    expect(r.code).toBe(0);
    const j = JSON.parse(r.stdout);
    const data = JSON.parse(readFileSync(DEMO_INPUT_PATH, 'utf8'));
    expect(j.zones).toBe(data.zoneSets[0].zones.length);
    expect(j.maps).toBeGreaterThan(5);
    const q = tilth(['report', d, '--quiet']);
    expect(q.code).toBe(0);
    expect(q.stderr.replace(/^warning:.*\n/gm, '')).toBe('');
  });

  it('a missing folder, a missing or broken report-data.json: exit 2, a message naming the file and the fix', () => {
    const d = mkdtempSync(join(tmpdir(), 'tilth-report-'));
    let r = tilth(['report', join(d, 'nope')]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/does not exist\. Fix:/);
    r = tilth(['report', d]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/report-data\.json" does not exist/);
    writeFileSync(join(d, 'report-data.json'), '{"title": 3}');
    r = tilth(['report', d]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/report-data\.json, at title: .*Fix: re-run `tilth build`/);
    expect(r.stderr).not.toMatch(/\n\s+at /); // no stack for a user error
    expect(existsSync(join(d, 'report.html'))).toBe(false);
  });

  it('--help shows an example', () => {
    const r = tilth(['report', '--help']);
    expect(r.code).toBe(0);
    expect(r.stdout).toContain('Example:\n  tilth report');
  });
});

describe('inputsHash', () => {
  it('is the first 12 hex digits of SHA-256 of length-prefixed names and bytes (GNU coreutils sha256sum as reference)', async () => {
    const { spawnSync } = await import('node:child_process');
    const a = inputsHash([
      { name: 'a', bytes: Buffer.from('xy') },
      { name: 'b', bytes: Buffer.from('z') },
    ]);
    const u64 = (n: number): Buffer => {
      const b = Buffer.alloc(8);
      b.writeBigUInt64BE(BigInt(n));
      return b;
    };
    const stream = Buffer.concat([u64(1), u64(2), Buffer.from('axy'), u64(1), u64(1), Buffer.from('bz')]);
    const ref = spawnSync('sha256sum', [], { input: stream, encoding: 'utf8' });
    expect(ref.status).toBe(0);
    expect(a).toBe(ref.stdout.slice(0, 12));
    expect(a).toMatch(/^[0-9a-f]{12}$/);
    // moving a byte from one file to the next, or renaming a file, changes the hash
    expect(
      inputsHash([
        { name: 'a', bytes: Buffer.from('x') },
        { name: 'b', bytes: Buffer.from('yz') },
      ]),
    ).not.toBe(a);
    expect(
      inputsHash([
        { name: 'c', bytes: Buffer.from('xy') },
        { name: 'b', bytes: Buffer.from('z') },
      ]),
    ).not.toBe(a);
    expect(
      inputsHash([
        { name: 'a', bytes: Buffer.from('xy') },
        { name: 'b', bytes: Buffer.from('z') },
      ]),
    ).toBe(a);
  });
});
