/**
 * writeOutputDir never loses a user's file (common practice of careful command-line tools: refuse rather than
 * delete, replace only what the tool wrote, keep a complete folder at every instant). All in temporary folders.
 */
import { spawnSync } from 'node:child_process';
import {
  chmodSync,
  existsSync,
  lstatSync,
  mkdirSync,
  mkdtempSync,
  readdirSync,
  readFileSync,
  realpathSync,
  symlinkSync,
  writeFileSync,
} from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { checkOutputDir, writeOutputDir } from '../../../src/cli/safety/outdir.js';
import { MARKER, markerText, ownership } from '../../../src/cli/safety/ownership.js';
import { nameKey, recoverLeftovers } from '../../../src/cli/safety/leftovers.js';

const files = (tag = 'A') =>
  new Map<string, string>([
    ['a.txt', tag],
    ['sub/b.txt', 'B'],
  ]);
const tmp = () => realpathSync(mkdtempSync(join(tmpdir(), 'tilth-out-')));
const quiet = { say: () => {} };
/** A pid no process has (above Linux's largest pid_max, 2^22). */
const DEAD = 4_194_400;

describe("writeOutputDir: new folders and replacing tilth's own", () => {
  it('writes a new folder with sub-folders and a complete marker, no temporary folder left', () => {
    const d = join(tmp(), 'out');
    writeOutputDir(d, files(), quiet);
    expect(readFileSync(join(d, 'sub/b.txt'), 'utf8')).toBe('B');
    const m = JSON.parse(readFileSync(join(d, MARKER), 'utf8'));
    expect(m.state).toBe('complete');
    expect(m.files).toEqual(['a.txt', 'sub/b.txt']);
    expect(readdirSync(join(d, '..'))).toEqual(['out']);
  });
  it('an earlier tilth output: refused without --force, replaced with it', () => {
    const d = join(tmp(), 'out');
    writeOutputDir(d, files('old'), quiet);
    expect(() => writeOutputDir(d, files('new'), quiet)).toThrow(
      /not empty \(it holds an earlier tilth output\).*--force/,
    );
    expect(readFileSync(join(d, 'a.txt'), 'utf8')).toBe('old');
    writeOutputDir(d, new Map([['c.txt', 'C']]), { force: true, ...quiet });
    expect(readdirSync(d).sort()).toEqual([MARKER, 'c.txt']);
    expect(readdirSync(join(d, '..'))).toEqual(['out']);
  });
  it('an empty folder is used without --force', () => {
    const d = tmp();
    writeOutputDir(d, files(), quiet);
    expect(readFileSync(join(d, 'a.txt'), 'utf8')).toBe('A');
  });
  it('an earlier tilth build without a marker (summary.json with tilth provenance) is recognised', () => {
    const d = tmp();
    writeFileSync(join(d, 'summary.json'), JSON.stringify({ provenance: { tilth: '0.1.0' } }));
    writeFileSync(join(d, 'zones.csv'), 'zone\n1\n');
    expect(ownership(d).ours).toBe(true);
    writeFileSync(join(d, 'notes.txt'), 'mine');
    expect(ownership(d).ours).toBe(false);
  });
});

describe('writeOutputDir refuses to destroy', () => {
  it("a folder of the user's own files, even with --force; the message lists them; nothing changes", () => {
    const d = tmp();
    for (const f of ['a.csv', 'b.csv', 'c.csv', 'd.csv', 'e.csv', 'f.csv', 'g.csv'])
      writeFileSync(join(d, f), 'x');
    expect(() => writeOutputDir(d, files(), { force: true, ...quiet })).toThrow(
      /did not write \(a\.csv, b\.csv, c\.csv, d\.csv, e\.csv and 2 more\).*new folder/,
    );
    expect(readdirSync(d)).toHaveLength(7);
  });
  it('a tilth folder to which the user added a file', () => {
    const d = join(tmp(), 'out');
    writeOutputDir(d, files(), quiet);
    writeFileSync(join(d, 'sub', 'my-notes.txt'), 'mine');
    expect(() => writeOutputDir(d, files(), { force: true, ...quiet })).toThrow(/sub\/my-notes\.txt/);
    expect(readFileSync(join(d, 'sub', 'my-notes.txt'), 'utf8')).toBe('mine');
  });
  it('a folder holding an input file, at any depth', () => {
    const d = tmp();
    mkdirSync(join(d, 'in', 'deep'), { recursive: true });
    writeFileSync(join(d, 'in', 'deep', 'samples.csv'), 'x');
    expect(() =>
      checkOutputDir(join(d, 'in'), { force: true, inputs: [join(d, 'in', 'deep', 'samples.csv')] }),
    ).toThrow(/holds the input file/);
    // an empty folder that an input's path runs through is refused too (the input would go with it)
    expect(() => checkOutputDir(d, { force: true, inputs: [join(d, 'in', 'deep', 'samples.csv')] })).toThrow(
      /holds the input file/,
    );
  });
  it('a file in the way', () => {
    const d = tmp();
    writeFileSync(join(d, 'f'), 'x');
    expect(() => writeOutputDir(join(d, 'f'), files(), quiet)).toThrow(/is a file/);
  });
  it('/, and a path that leaves the folder', () => {
    expect(() => checkOutputDir('/', true)).toThrow(/root folder/);
    const d = join(tmp(), 'out');
    expect(() => writeOutputDir(d, new Map([['../x.shp', 'x']]), quiet)).toThrow(/bad output path/);
    expect(existsSync(join(d, '..', 'x.shp'))).toBe(false);
    expect(existsSync(d)).toBe(false);
  });
  it('a symbolic link inside a tilth folder counts as a file tilth did not write', () => {
    const d = join(tmp(), 'out');
    writeOutputDir(d, files(), quiet);
    symlinkSync('/etc/hostname', join(d, 'link'));
    expect(() => writeOutputDir(d, files(), { force: true, ...quiet })).toThrow(/link@/);
  });
});

describe('writeOutputDir through links and with odd names', () => {
  it('a linked --out writes through the link: the link stays, its folder is replaced', () => {
    const d = tmp();
    writeOutputDir(join(d, 'real'), files('old'), quiet);
    symlinkSync('real', join(d, 'link'));
    writeOutputDir(join(d, 'link'), files('new'), { force: true, ...quiet });
    expect(lstatSync(join(d, 'link')).isSymbolicLink()).toBe(true);
    expect(readFileSync(join(d, 'real', 'a.txt'), 'utf8')).toBe('new');
  });
  it('a dangling link creates the folder it names', () => {
    const d = tmp();
    symlinkSync(join(d, 'target'), join(d, 'link'));
    writeOutputDir(join(d, 'link'), files(), quiet);
    expect(lstatSync(join(d, 'link')).isSymbolicLink()).toBe(true);
    expect(readFileSync(join(d, 'target', 'a.txt'), 'utf8')).toBe('A');
  });
  it('a link loop is a user error', () => {
    const d = tmp();
    symlinkSync(join(d, 'b'), join(d, 'a'));
    symlinkSync(join(d, 'a'), join(d, 'b'));
    expect(() => writeOutputDir(join(d, 'a'), files(), quiet)).toThrow(/symbolic links/);
  });
  it('a name too long for the file system is a user error, and leaves nothing', () => {
    const d = tmp();
    expect(() => writeOutputDir(join(d, 'x'.repeat(300)), files(), quiet)).toThrow(/too long/);
    expect(readdirSync(d)).toEqual([]);
  });
  it('a 250-byte name (allowed) still works: temporary names are short', () => {
    const d = tmp();
    writeOutputDir(join(d, 'y'.repeat(250)), files(), quiet);
    expect(readdirSync(d)).toEqual(['y'.repeat(250)]);
  });
  it('a parent path through a file gives a user error and leaves nothing', () => {
    const d = tmp();
    writeFileSync(join(d, 'f'), 'x');
    expect(() => writeOutputDir(join(d, 'f', 'sub', 'out'), files(), quiet)).toThrow(
      /path is a file.*nothing was written/,
    );
    expect(readdirSync(d)).toEqual(['f']);
  });
});

/** A tilth temporary folder as an interrupted run leaves it. */
function leftover(
  parent: string,
  target: string,
  kind: 'new' | 'old',
  tag: string,
  state: 'writing' | 'complete' = 'complete',
): string {
  const p = join(parent, `.tilth-${kind}-${nameKey(target)}-${DEAD}-x${tag}`);
  mkdirSync(p);
  writeFileSync(join(p, 'a.txt'), tag);
  writeFileSync(join(p, MARKER), markerText(['a.txt'], state));
  return p;
}

describe("a replace interrupted by a kill: the next run restores or cleans only tilth's leftovers", () => {
  it('killed between "old aside" and "new in": the complete new output is put in place', () => {
    const d = tmp(),
      target = join(d, 'out');
    leftover(d, target, 'old', 'old');
    leftover(d, target, 'new', 'new');
    const notes = recoverLeftovers(target);
    expect(readFileSync(join(target, 'a.txt'), 'utf8')).toBe('new');
    expect(readdirSync(d)).toEqual(['out']);
    expect(notes.join('\n')).toMatch(/restored.*complete new output[\s\S]*removed/);
  });
  it('killed while writing (new incomplete): the old output is put back', () => {
    const d = tmp(),
      target = join(d, 'out');
    leftover(d, target, 'old', 'old');
    leftover(d, target, 'new', 'partial', 'writing');
    recoverLeftovers(target);
    expect(readFileSync(join(target, 'a.txt'), 'utf8')).toBe('old');
    expect(readdirSync(d)).toEqual(['out']);
  });
  it('the output in place: leftovers are removed on the next write, which then succeeds', () => {
    const d = tmp(),
      target = join(d, 'out');
    writeOutputDir(target, files('v1'), quiet);
    leftover(d, target, 'new', 'partial', 'writing');
    const notes: string[] = [];
    writeOutputDir(target, files('v2'), { force: true, say: (s) => notes.push(s) });
    expect(readdirSync(d)).toEqual(['out']);
    expect(notes[0]).toMatch(/removed .*interrupted/);
  });
  it("a leftover holding a user's file is left alone and reported", () => {
    const d = tmp(),
      target = join(d, 'out');
    const p = leftover(d, target, 'new', 'x');
    writeFileSync(join(p, 'precious.txt'), 'mine');
    const notes = recoverLeftovers(target);
    expect(existsSync(join(p, 'precious.txt'))).toBe(true);
    expect(notes.join()).toMatch(/left alone/);
  });
  it('a leftover of a running process is not touched', () => {
    const d = tmp(),
      target = join(d, 'out');
    const p = join(d, `.tilth-new-${nameKey(target)}-${process.ppid}-x`);
    mkdirSync(p);
    writeFileSync(join(p, MARKER), markerText([], 'writing'));
    expect(recoverLeftovers(target)).toEqual([]);
    expect(existsSync(p)).toBe(true);
  });
  it("an earlier version's .out.tmp-* leftovers of build files are removed, others kept", () => {
    const d = tmp(),
      target = join(d, 'out');
    mkdirSync(join(d, `.out.tmp-${DEAD}-1`));
    writeFileSync(
      join(d, `.out.tmp-${DEAD}-1`, 'summary.json'),
      JSON.stringify({ provenance: { tilth: '0.1.0' } }),
    );
    mkdirSync(join(d, `.out.tmp-${DEAD}-2`));
    writeFileSync(join(d, `.out.tmp-${DEAD}-2`, 'thesis.docx'), 'x');
    mkdirSync(target);
    recoverLeftovers(target);
    expect(readdirSync(d).sort()).toEqual([`.out.tmp-${DEAD}-2`, 'out']);
  });
});

describe('read-only places give true messages (run as user nobody; root may write anywhere)', () => {
  const asNobody = process.getuid?.() === 0 && nobodyReachesCheckout();
  it.skipIf(!asNobody)(
    'an old folder that cannot be deleted: the new output is in place, exit 0, a warning says so',
    async () => {
      const d = tmp();
      chmodSync(d, 0o777);
      const target = join(d, 'out');
      writeOutputDir(target, files('old'), quiet);
      chmodSync(join(target, 'sub'), 0o555); // nobody cannot delete sub/b.txt
      chmodSync(target, 0o777);
      const script =
        `import { writeOutputDir } from ${JSON.stringify(join(import.meta.dirname, '../../../src/cli/safety/outdir.ts'))};\n` +
        `writeOutputDir(${JSON.stringify(target)}, new Map([['a.txt', 'new']]), { force: true });`;
      writeFileSync(join(d, 's.mts'), script);
      const tsx = join(import.meta.dirname, '../../../node_modules/.bin/tsx');
      const r = spawnSync(tsx, [join(d, 's.mts')], {
        uid: 65534,
        gid: 65534,
        encoding: 'utf8',
        env: { ...process.env, HOME: d },
        cwd: d,
      });
      expect(r.status, r.stderr).toBe(0);
      expect(r.stderr).toMatch(/new output is in place.*could not be deleted \(permission denied\)/);
      expect(readFileSync(join(target, 'a.txt'), 'utf8')).toBe('new');
      // what could not be deleted still carries the marker, so a later run knows it as tilth's own
      const aside = readdirSync(d).filter((n) => n.startsWith('.tilth-old-'));
      expect(aside).toHaveLength(1);
      expect(ownership(join(d, aside[0]!)).ours).toBe(true);
    },
  );
  it.skipIf(!asNobody)(
    'a parent folder that cannot be written: a user error saying nothing was written',
    async () => {
      const d = tmp();
      chmodSync(d, 0o555);
      const script =
        `import { writeOutputDir } from ${JSON.stringify(join(import.meta.dirname, '../../../src/cli/safety/outdir.ts'))};\n` +
        `try { writeOutputDir(${JSON.stringify(join(d, 'out'))}, new Map([['a.txt', 'x']])); } catch (e) { console.error(e.message); process.exit(2); }`;
      const sdir = tmp();
      chmodSync(sdir, 0o777);
      writeFileSync(join(sdir, 's.mts'), script);
      const tsx = join(import.meta.dirname, '../../../node_modules/.bin/tsx');
      const r = spawnSync(tsx, [join(sdir, 's.mts')], {
        uid: 65534,
        gid: 65534,
        encoding: 'utf8',
        env: { ...process.env, HOME: sdir },
        cwd: sdir,
      });
      expect(r.status, r.stderr).toBe(2);
      expect(r.stderr).toMatch(/permission denied.*nothing was written/);
      expect(readdirSync(d)).toEqual([]);
    },
  );
});

/**
 * Whether user nobody can run this checkout's tsx (a clone inside a folder only root may enter, such as
 * `mktemp -d`, cannot be): the read-only cases skip, saying why, when it cannot.
 */
function nobodyReachesCheckout(): boolean {
  const tsx = join(import.meta.dirname, '../../../node_modules/.bin/tsx');
  const r = spawnSync(process.execPath, ['-e', `require('fs').accessSync(${JSON.stringify(tsx)})`], {
    uid: 65534,
    gid: 65534,
  });
  if (r.status === 0) return true;
  console.warn(
    `SKIP: user nobody cannot reach ${tsx} (a parent folder is closed to others); read-only cases skipped`,
  );
  return false;
}
