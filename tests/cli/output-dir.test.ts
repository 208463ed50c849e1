import { mkdtempSync, mkdirSync, readFileSync, readdirSync, writeFileSync, existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { writeOutputDir } from '../../src/cli/util.js';

const files = () => new Map<string, string>([['a.txt', 'A'], ['sub/b.txt', 'B']]);

describe('writeOutputDir (all or nothing)', () => {
  it('writes a new folder with sub-folders', () => {
    const d = join(mkdtempSync(join(tmpdir(), 'tilth-')), 'out');
    writeOutputDir(d, files());
    expect(readFileSync(join(d, 'sub/b.txt'), 'utf8')).toBe('B');
    expect(readdirSync(join(d, '..'))).toEqual(['out']); // no temporary folder left behind
  });
  it('refuses a non-empty folder without force, replaces it with force', () => {
    const d = mkdtempSync(join(tmpdir(), 'tilth-'));
    writeFileSync(join(d, 'old.txt'), 'x');
    expect(() => writeOutputDir(d, files())).toThrow(/not empty.*--force/);
    writeOutputDir(d, files(), true);
    expect(existsSync(join(d, 'old.txt'))).toBe(false);
    expect(readFileSync(join(d, 'a.txt'), 'utf8')).toBe('A');
  });
  it('refuses a path that leaves the folder', () => {
    const d = join(mkdtempSync(join(tmpdir(), 'tilth-')), 'out');
    expect(() => writeOutputDir(d, new Map([['../x.shp', 'x']]))).toThrow(/bad output path/);
    expect(existsSync(join(d, '..', 'x.shp'))).toBe(false);
    expect(existsSync(d)).toBe(false);
  });
  it('refuses a file as the output folder', () => {
    const d = mkdtempSync(join(tmpdir(), 'tilth-'));
    writeFileSync(join(d, 'f'), 'x');
    expect(() => writeOutputDir(join(d, 'f'), files())).toThrow(/is a file/);
  });
  it('an unwritable location gives a user error and leaves nothing', () => {
    // a parent path that runs through a file cannot be created, even by root
    const d = mkdtempSync(join(tmpdir(), 'tilth-'));
    writeFileSync(join(d, 'f'), 'x');
    expect(() => writeOutputDir(join(d, 'f', 'sub', 'out'), files())).toThrow(/writable location/);
    expect(readdirSync(d)).toEqual(['f']);
  });
});
