/**
 * Plausible ranges (common practice, documented in docs/reliability.md) and the robust neighbour outlier test
 * (residual from the neighbours' median over 1.4826 x MAD, the normal-consistent MAD: Iglewicz & Hoaglin 1993).
 */
import { describe, expect, it } from 'vitest';
import { implausibleValues, neighbourOutliers } from '../../../src/cli/safety/plausible.js';
import { applyOutlierTest } from '../../../src/cli/safety/readiness.js';
import type { FieldInputs, Samples } from '../../../src/types.js';

/** A 5 x 5 grid of samples 100 m apart with P values `p` (others empty). */
function grid(p: number[], pMethod: 'olsen' | 'kelowna' = 'olsen'): Samples {
  const n = p.length,
    xy = new Float64Array(2 * n);
  for (let i = 0; i < n; i++) {
    xy[2 * i] = (i % 5) * 100;
    xy[2 * i + 1] = Math.floor(i / 5) * 100;
  }
  const nan = () => new Float64Array(n).fill(NaN);
  return {
    ids: p.map((_, i) => `S${i + 1}`),
    xy,
    lonlat: new Float64Array(2 * n),
    values: { p: Float64Array.from(p), no3_n: nan(), k: nan(), so4_s: nan(), om: nan(), ph: nan() },
    censored: { p: new Int8Array(n), no3_n: new Int8Array(n), k: new Int8Array(n) },
    pMethod,
    origin: p.map((_, i) => `s.csv row ${i + 4}`),
  } as unknown as Samples;
}
const smooth = Array.from({ length: 25 }, (_, i) => 12 + (i % 5) + Math.floor(i / 5) * 0.5);

describe('plausible ranges', () => {
  it('Olsen P 1500 and 1e300 are refused with the row and the fix; 200 passes', () => {
    const v = [...smooth];
    v[3] = 1500;
    v[7] = 1e300;
    v[9] = 200;
    const m = implausibleValues(grid(v));
    expect(m).toHaveLength(2);
    expect(m[0]).toMatch(
      /s\.csv row 7, sample "S4": P 1500 ppm \(Olsen\) is outside the plausible 0-200.*Fix: correct the value/,
    );
  });
  it('modified Kelowna reads higher: 250 ppm passes, 350 does not', () => {
    const v = [...smooth];
    v[0] = 250;
    expect(implausibleValues(grid(v, 'kelowna'))).toEqual([]);
    v[0] = 350;
    expect(implausibleValues(grid(v, 'kelowna'))[0]).toMatch(
      /modified Kelowna\) is outside the plausible 0-300/,
    );
  });
  it('a negative value is refused', () => {
    const v = [...smooth];
    v[0] = -3;
    expect(implausibleValues(grid(v))).toHaveLength(1);
  });
});

describe('neighbour outliers', () => {
  it('a typed 180 among values of 12-18 is named; the smooth field is not', () => {
    expect(neighbourOutliers(grid(smooth), 's.csv')).toEqual([]);
    const v = [...smooth];
    v[12] = 180;
    const w = neighbourOutliers(grid(v), 's.csv');
    expect(w).toHaveLength(1);
    expect(w[0]!.code).toBe('neighbour-outlier');
    expect(w[0]!.message).toMatch(/P of sample "S13" \(180, neighbours' median/);
  });
  it('a hot spot less than 3 times its neighbours is not named (saline sulphate, manure strips)', () => {
    const v = [...smooth];
    v[12] = 40;
    expect(neighbourOutliers(grid(v), 's.csv')).toEqual([]);
  });
});

describe('keep or drop flagged values', () => {
  const withOutlier = () => {
    const v = [...smooth];
    v[12] = 180;
    return v;
  };
  const inputs = (p: number[], zones: unknown = null) =>
    ({ samples: grid(p), zones, warnings: [] }) as unknown as FieldInputs;

  it('keep (the default): the value stays, the warning names it and says how to drop it', () => {
    const inp = inputs(withOutlier());
    applyOutlierTest(inp, 's.csv');
    expect(inp.samples.values.p[12]).toBe(180);
    expect(inp.warnings).toHaveLength(1);
    expect(inp.warnings[0]!.message).toMatch(
      /"S13" \(180.*it is kept \(the default; --outliers drop or plan key soil_test\.outliers: drop/,
    );
  });

  it('drop: only the flagged value becomes "not tested"; the warning lists the dropped id and the choice', () => {
    const inp = inputs(withOutlier());
    inp.samples.values.k[12] = 300;
    inp.samples.censored.p[12] = 1;
    applyOutlierTest(inp, 's.csv', 'drop', 'option');
    expect(Number.isNaN(inp.samples.values.p[12])).toBe(true);
    expect(inp.samples.censored.p[12]).toBe(0);
    expect(inp.samples.values.k[12]).toBe(300); // the sample stays for other nutrients
    expect(inp.samples.ids).toHaveLength(25);
    expect([...inp.samples.values.p].filter(Number.isNaN)).toHaveLength(1);
    expect(inp.warnings[0]!.where).toMatch(/^"S13" \(180, neighbours' median/);
    expect(inp.warnings[0]!.message).toMatch(/dropped from the maps \(--outliers drop\).*Dropped: S13\./);
    const plan = inputs(withOutlier());
    applyOutlierTest(plan, 's.csv', 'drop', 'plan');
    expect(plan.warnings[0]!.message).toMatch(/dropped from the maps \(plan key soil_test\.outliers: drop\)/);
  });

  it('drop is not applied to zone composites, nor while a value is implausible; the warning says why', () => {
    const z = inputs(withOutlier(), { keys: [] });
    applyOutlierTest(z, 's.csv', 'drop', 'option');
    expect(z.samples.values.p[12]).toBe(180);
    expect(z.warnings[0]!.message).toMatch(/kept \(--outliers drop does not apply to zone-composite samples/);
    const v = withOutlier();
    v[0] = 1e300;
    const bad = inputs(v);
    applyOutlierTest(bad, 's.csv', 'drop', 'option');
    expect(bad.samples.values.p[12]).toBe(180);
    expect(bad.warnings[0]!.message).toMatch(
      /waits until the values outside the plausible ranges are corrected/,
    );
  });

  it('nothing flagged: no warning and nothing dropped, whatever the mode', () => {
    const inp = inputs([...smooth]);
    applyOutlierTest(inp, 's.csv', 'drop', 'option');
    expect(inp.warnings).toEqual([]);
    expect([...inp.samples.values.p]).toEqual(smooth);
  });
});
