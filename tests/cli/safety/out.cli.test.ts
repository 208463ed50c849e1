/**
 * The commands never destroy a user's files through --out (common practice: refuse and say why). Every case runs
 * the CLI in a temporary copy of the invented demo quarter; refusals happen before any work.
 */
import {
  copyFileSync,
  existsSync,
  mkdirSync,
  mkdtempSync,
  readdirSync,
  readFileSync,
  realpathSync,
  writeFileSync,
} from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { ROOT, tilth } from '../../helpers/cli.js';

const Q = join(ROOT, 'sample-fields', 'quarter');
/** A temporary folder holding copies of the demo inputs (samples.csv, boundary.geojson, plan.yaml). */
function field(): string {
  const d = realpathSync(mkdtempSync(join(tmpdir(), 'tilth-cli-')));
  for (const f of ['samples.csv', 'boundary.geojson', 'plan.yaml']) copyFileSync(join(Q, f), join(d, f));
  return d;
}
const build = (out: string) => [
  'build',
  '--samples',
  'samples.csv',
  '--boundary',
  'boundary.geojson',
  '--plan',
  'plan.yaml',
  '--out',
  out,
  '--force',
  '--quiet',
];

describe('build --out --force refuses the places a user would lose files', () => {
  it('the current folder (it holds the inputs): exit 2, every file intact', () => {
    const d = field();
    const r = tilth(build('.'), { cwd: d });
    expect(r.code, r.stderr).toBe(2);
    expect(r.stderr).toMatch(/is the current folder/);
    expect(readdirSync(d).sort()).toEqual(['boundary.geojson', 'plan.yaml', 'samples.csv']);
  });
  it('a folder above the current folder', () => {
    const d = field();
    mkdirSync(join(d, 'sub'));
    const r = tilth(
      build('..').map((a) =>
        a.endsWith('.csv') || a.endsWith('.geojson') || a.endsWith('.yaml') ? `../${a}` : a,
      ),
      { cwd: join(d, 'sub') },
    );
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/above the current folder/);
    expect(existsSync(join(d, 'samples.csv'))).toBe(true);
  });
  it('the home folder, and /', () => {
    const d = field(),
      home = realpathSync(mkdtempSync(join(tmpdir(), 'tilth-home-')));
    writeFileSync(join(home, 'letter.txt'), 'mine');
    const r = tilth(build(home), { cwd: d, env: { HOME: home } });
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/your home folder/);
    expect(readFileSync(join(home, 'letter.txt'), 'utf8')).toBe('mine');
    const root = tilth(build('/'), { cwd: d });
    expect(root.code).toBe(2);
    expect(root.stderr).toMatch(/root folder/);
  });
  it('the folder holding the inputs', () => {
    const d = field();
    // run from elsewhere so only the input rule applies
    const r2 = tilth(
      [
        'build',
        '--samples',
        join(d, 'samples.csv'),
        '--boundary',
        join(d, 'boundary.geojson'),
        '--plan',
        join(d, 'plan.yaml'),
        '--out',
        d,
        '--force',
      ],
      { cwd: tmpdir() },
    );
    expect(r2.code).toBe(2);
    expect(r2.stderr).toMatch(/holds the input file/);
    expect(readdirSync(d)).toHaveLength(3);
  });
  it('a folder of other files: lists them and says how to proceed; no stack', () => {
    const d = field();
    mkdirSync(join(d, 'photos'));
    writeFileSync(join(d, 'photos', 'IMG_0001.jpg'), 'x');
    const r = tilth(build('photos'), { cwd: d });
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/did not write \(IMG_0001\.jpg\).*Fix: give --out a new folder/);
    expect(r.stderr).not.toMatch(/internal error|    at /);
  });
  it('an output name too long for the file system: a user error, no stack', () => {
    const d = field();
    const r = tilth(build('n'.repeat(300)), { cwd: d });
    expect(r.code, r.stderr).toBe(2);
    expect(r.stderr).not.toMatch(/internal error/);
  });
});

describe('variability --out replaces only its own folder', () => {
  const args = ['variability', '--samples', 'samples.csv', '--boundary', 'boundary.geojson', '--no-surface'];
  it('writes, refuses without --force, replaces with --force, refuses once a user file is added', () => {
    const d = field();
    expect(tilth([...args, '--out', 'charts'], { cwd: d }).code).toBe(0);
    expect(tilth([...args, '--out', 'charts'], { cwd: d }).stderr).toMatch(/add --force/);
    expect(tilth([...args, '--out', 'charts', '--force'], { cwd: d }).code).toBe(0);
    writeFileSync(join(d, 'charts', 'notes.txt'), 'mine');
    const r = tilth([...args, '--out', 'charts', '--force'], { cwd: d });
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/notes\.txt/);
    expect(readFileSync(join(d, 'charts', 'notes.txt'), 'utf8')).toBe('mine');
  });
  it('refuses the folder holding the inputs', () => {
    const d = field();
    const r = tilth([...args, '--out', '.', '--force'], { cwd: d });
    expect(r.code).toBe(2);
    expect(readdirSync(d)).toHaveLength(3);
  });
});

describe('single-file outputs never overwrite an input or a user file', () => {
  it("surface: the .prj of an input shapefile is refused (it would lose the shapefile's projection)", () => {
    const d = field();
    for (const e of ['shp', 'shx', 'dbf', 'prj'])
      copyFileSync(join(ROOT, 'tests', 'fixtures', 'shp', `boundary.${e}`), join(d, `field.${e}`));
    const prj = readFileSync(join(d, 'field.prj'), 'utf8');
    const r = tilth(
      [
        'surface',
        '--samples',
        'samples.csv',
        '--boundary',
        'field.shp',
        '--nutrient',
        'p',
        '--out',
        'field.asc',
      ],
      { cwd: d },
    );
    expect(r.code, r.stderr).toBe(2);
    expect(r.stderr).toMatch(/input file "field\.shp"/);
    expect(readFileSync(join(d, 'field.prj'), 'utf8')).toBe(prj);
  });
  it('surface: an existing .asc that is not a grid is refused without --force; its own grid is replaced', () => {
    const d = field();
    writeFileSync(join(d, 'p.asc'), 'my notes');
    const a = [
      'surface',
      '--samples',
      'samples.csv',
      '--boundary',
      'boundary.geojson',
      '--nutrient',
      'p',
      '--cell',
      '20',
      '--out',
      'p.asc',
    ];
    const r = tilth(a, { cwd: d });
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/tilth did not write it.*--force/);
    expect(readFileSync(join(d, 'p.asc'), 'utf8')).toBe('my notes');
    expect(tilth([...a, '--force'], { cwd: d }).code).toBe(0);
    expect(tilth(a, { cwd: d }).code).toBe(0); // now its own grid
  });
  it('report --out onto the report data is refused', () => {
    const d = field();
    mkdirSync(join(d, 'rx'));
    copyFileSync(
      join(ROOT, 'tests', 'fixtures', 'report', 'demo-input.json'),
      join(d, 'rx', 'report-data.json'),
    );
    const before = readFileSync(join(d, 'rx', 'report-data.json'));
    const r = tilth(['report', 'rx', '--out', 'rx/report-data.json', '--force'], { cwd: d });
    expect(r.code).toBe(2);
    expect(readFileSync(join(d, 'rx', 'report-data.json')).equals(before)).toBe(true);
  });
  it('tables --out over an existing (edited) file needs --force', () => {
    const d = field();
    writeFileSync(join(d, 't.yaml'), '# my edits\n');
    expect(tilth(['tables', '--out', 't.yaml'], { cwd: d }).code).toBe(2);
    expect(readFileSync(join(d, 't.yaml'), 'utf8')).toBe('# my edits\n');
    expect(tilth(['tables', '--out', 't.yaml', '--force'], { cwd: d }).code).toBe(0);
    expect(readFileSync(join(d, 't.yaml'), 'utf8')).toMatch(/^# tilth agronomy tables/);
  });
});
