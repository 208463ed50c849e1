/**
 * The rate judge's zone profiles: their rates come from decisions made without economics notes (merging judges
 * many zones that never reach the output), and the decision a profile hands on is the full one, the same as
 * `decide` gives for the zone's soil. A profile whose rates or decision differed from `decide`'s would put
 * different rates or notes in the prescription than the rate engine itself gives.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { decide, defaultTables, parsePlan } from '../../src/agronomy/index.js';
import { rateJudge } from '../../src/prescription/rateJudge.js';

const T = defaultTables();
const plan = parsePlan(readFileSync('sample-fields/quarter/plan.yaml', 'utf8'), 'plan.yaml', T);
const products = plan.products.map((p) => p.product);

describe('rateJudge profiles', () => {
  const judge = rateJudge({
    plan,
    tables: T,
    products,
    layers: [],
    analytes: ['no3_n', 'p', 'k', 'so4_s', 'om'],
    textures: false,
    rmse: { no3_n: 6.8, p: 2.7, k: 35, so4_s: 10.8, om: 0.37 },
    pMethod: 'olsen',
  });
  // soils across the P and K classes, so that some decisions carry economics notes
  const soils = [
    [20, 4, 90, 6, 3],
    [35, 9, 140, 12, 4],
    [10, 18, 300, 25, 5],
    [50, 25, 420, 4, 2],
  ];

  it.each(soils)('no3_n %d, p %d, k %d, so4_s %d, om %d: the full decision and its rates', (...v) => {
    const p = judge.profile(Float64Array.from(v), 1e4);
    const full = decide({ no3_n: v[0], p: v[1], k: v[2], so4_s: v[3], om: v[4], pMethod: 'olsen' }, plan, T);
    expect(p.decision).toEqual(full);
    expect(p.decision).toBe(p.decision); // made once
    for (const pl of full.placements)
      for (const q of pl.products)
        if (products.includes(q.product))
          expect(p.rates.get(`${q.product}|${pl.placement}`)).toBe(q.rate.value);
  });

  it('the soils above include decisions with economics notes', () => {
    const n = soils.filter(
      (v) =>
        decide({ no3_n: v[0], p: v[1], k: v[2], so4_s: v[3], om: v[4], pMethod: 'olsen' }, plan, T).economics
          .length > 0,
    ).length;
    expect(n).toBeGreaterThan(0);
  });
});
