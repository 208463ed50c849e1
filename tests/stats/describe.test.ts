import { spawnSync } from 'node:child_process';
import { describe as suite, expect, it } from 'vitest';
import fc from 'fast-check';
import { describe } from '../../src/stats/describe.js';
import { requireTool } from '../helpers/tools.js';

suite('describe', () => {
  it('textbook example: 2 4 4 4 5 5 7 9', () => {
    // source: the standard worked example for standard deviation (population sd 2, sample sd sqrt(32/7) = 2.138)
    const d = describe(new Float64Array([2, 4, 4, 4, 5, 5, 7, 9]));
    expect(d).toMatchObject({ n: 8, min: 2, median: 4.5, max: 9, mean: 5 });
    expect(d.sd).toBeCloseTo(Math.sqrt(32 / 7), 12);
    expect(d.cv).toBeCloseTo(Math.sqrt(32 / 7) / 5, 12);
  });

  it('skips NaN (not tested); empty and single values', () => {
    expect(describe(new Float64Array([NaN, 3, NaN, 1, 2]))).toMatchObject({ n: 3, median: 2, mean: 2 });
    expect(describe(new Float64Array([NaN])).n).toBe(0);
    const one = describe([7]);
    expect(one).toMatchObject({ n: 1, min: 7, median: 7, max: 7, mean: 7 });
    expect(one.sd).toBeNaN();
  });

  it.skipIf(!requireTool('Rscript', 'r-base-core'))('agrees with R (median, mean, sd) on random data', () => {
    // source: R 4.x stats::median, base::mean, stats::sd (n - 1 denominator), run here through Rscript
    const sets = fc.sample(
      fc.array(fc.double({ min: -1e4, max: 1e4, noNaN: true }), { minLength: 2, maxLength: 40 }),
      { seed: 5, numRuns: 25 },
    );
    const input = sets.map((s) => s.map((v) => v.toPrecision(17)).join(' ')).join('\n') + '\n';
    const r = spawnSync(
      'Rscript',
      [
        '-e',
        'for (l in readLines(file("stdin"))) { x <- as.numeric(strsplit(l, " ")[[1]]); cat(sprintf("%.17g %.17g %.17g %.17g %.17g\\n", min(x), median(x), max(x), mean(x), sd(x))) }',
      ],
      { input, encoding: 'utf8' },
    );
    expect(r.status).toBe(0);
    const rows = r.stdout
      .trim()
      .split('\n')
      .map((l) => l.split(' ').map(Number));
    expect(rows.length).toBe(sets.length);
    sets.forEach((s, i) => {
      const d = describe(Float64Array.from(s));
      const [mn, med, mx, mean, sd] = rows[i];
      expect(d.min).toBe(mn);
      expect(d.max).toBe(mx);
      expect(d.median).toBeCloseTo(med, 9);
      expect(d.mean).toBeCloseTo(mean, 8);
      expect(d.sd).toBeCloseTo(sd, 8);
    });
  });
});
