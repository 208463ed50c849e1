import { describe, expect, it } from 'vitest';
import { tilth } from '../helpers/cli.js';
import { VERSION } from '../../src/version.js';

// The guide's rule: every command has --help with an example; the top-level help shows the cautions.
const COMMANDS = [
  'inspect',
  'surface',
  'plan',
  'rates',
  'tables',
  'build',
  'batch',
  'check',
  'report',
  'variability',
];

describe('tilth --help', () => {
  it('lists every command and the caution', () => {
    const r = tilth(['--help']);
    expect(r.code).toBe(0);
    for (const c of COMMANDS) expect(r.stdout).toMatch(new RegExp(`^  ${c}\\b`, 'm'));
    expect(r.stdout).toMatch(/licensed agronomist or certified crop adviser/);
  });
  it('each command has --help with an example', () => {
    for (const c of COMMANDS) {
      const r = tilth([c, '--help']);
      expect(r.code, c).toBe(0);
      expect(r.stdout, c).toMatch(/Example/i);
    }
  });
  it('--version prints the version alone; `help <command>` and a mistyped command still work (commands load on demand)', () => {
    const v = tilth(['--version']);
    expect(v.code).toBe(0);
    expect(v.stdout.trim()).toBe(VERSION);
    const h = tilth(['help', 'surface']);
    expect(h.code).toBe(0);
    expect(h.stdout).toMatch(/--threads <n>.*default: the machine's cores/s);
    const typo = tilth(['biuld']);
    expect(typo.code).toBe(2);
    expect(typo.stderr).toMatch(/unknown command 'biuld'[\s\S]*Did you mean build\?/);
  });
  it('an unknown option is a user error (exit 2), not a crash', () => {
    const r = tilth(['build', '--no-such-option']);
    expect(r.code).toBe(2);
    expect(r.stderr).not.toMatch(/internal error/);
  });
});
