/** `tilth variability` as a user runs it. */
import { describe, expect, it } from 'vitest';
import { tilth } from './helpers/cli.js';

describe('tilth variability', () => {
  it('--help shows an example and the caution', () => {
    const r = tilth(['variability', '--help']);
    expect(r.code).toBe(0);
    expect(r.stdout).toContain('Example:');
    expect(r.stdout).toContain('--nutrient');
    expect(r.stdout).toMatch(/agronomist/);
  });

  it('an unknown nutrient is a user error naming the option and the fix (exit 2, no stack)', () => {
    const r = tilth(['variability', '--samples', 'x.geojson', '--boundary', 'y.geojson', '--nutrient', 'Zn']);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('--nutrient');
    expect(r.stderr).toContain('Fix:');
    expect(r.stderr).not.toMatch(/\n\s+at /);
  });

  it('an unsupported fit method is a user error', () => {
    const r = tilth(['variability', '--samples', 'x.geojson', '--boundary', 'y.geojson', '--fit-method', '5']);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('--fit-method');
  });
});
