/** Product rates per zone and product totals over a zone set: what ordering, loading and the outputs read. */
import type { Decision } from '../agronomy/decision.js';
import type { Plan } from '../agronomy/plan.js';
import type { Placement } from '../agronomy/tables.js';
import { KG_PER_LB } from '../units/index.js';
import type { ProductTotal, ZoneSetResult } from './types.js';

/** Rate of one product in one placement of a decision, in the plan's unit (0 when not applied). */
export function productRate(
  d: Decision,
  product: string,
  placement: Placement,
): { value: number; lbac: number } {
  for (const p of d.placements)
    if (p.placement === placement)
      for (const q of p.products)
        if (q.product === product) return { value: q.rate.value, lbac: q.rate.lbac };
  return { value: 0, lbac: 0 };
}

/** The (product, placement) pairs that any zone of the set uses, in plan order. */
export function usedPairs(set: ZoneSetResult): { product: string; placement: Placement; label: string }[] {
  const seen = new Map<string, { product: string; placement: Placement; label: string }>();
  for (const z of set.zones)
    for (const p of z.decision.placements)
      for (const q of p.products) {
        if (!set.products.includes(q.product)) continue;
        const k = `${q.product}|${p.placement}`;
        if (!seen.has(k)) seen.set(k, { product: q.product, placement: p.placement, label: q.label });
      }
  const order = (x: { product: string; placement: Placement }) =>
    set.products.indexOf(x.product) * 10 +
    ['seed_row', 'side_band', 'mid_row_band', 'broadcast'].indexOf(x.placement);
  return [...seen.values()].sort((a, b) => order(a) - order(b));
}

/** Totals per zone set and (product, placement) pair: lb and kg, area-weighted mean, min and max rate, area applied. */
export function productTotals(sets: ZoneSetResult[], plan: Plan): ProductTotal[] {
  const out: ProductTotal[] = [];
  for (const set of sets) {
    const fieldAc = set.zones.reduce((s, z) => s + z.areaAc, 0);
    for (const pair of usedPairs(set)) {
      let lb = 0,
        mean = 0,
        min = Infinity,
        max = -Infinity,
        applied = 0;
      for (const z of set.zones) {
        const r = productRate(z.decision, pair.product, pair.placement);
        lb += r.lbac * z.areaAc;
        mean += r.value * z.areaAc;
        min = Math.min(min, r.value);
        max = Math.max(max, r.value);
        if (r.lbac > 0) applied += z.areaAc;
      }
      out.push({
        zoneSet: set.name,
        product: pair.product,
        label: pair.label,
        placement: pair.placement,
        totalLb: lb,
        totalKg: lb * KG_PER_LB,
        meanRate: fieldAc > 0 ? mean / fieldAc : 0,
        minRate: min,
        maxRate: max,
        unit: plan.units,
        appliedAc: applied,
      });
    }
  }
  return out;
}
