/**
 * Nutrient targets (lb/ac of N, P2O5, K2O, S) by the strategy the plan chose for each nutrient.
 */
import type { Warning } from '../errors.js';
import type { Interpretation } from './interpret.js';
import type { Plan } from './plan.js';
import type { CropTable, Nutrient, Tables } from './tables.js';

export interface Target {
  /** lb/ac of the nutrient (N, P2O5, K2O or S) */
  lbac: number;
  strategy: string;
  /** how the number was reached, for people */
  detail: string;
}
export type Targets = Record<Nutrient, Target>;

const r1 = (v: number) => Math.round(v * 10) / 10;

/**
 * Targets for one location.
 * - N mass balance: max(0, need/bu x yield - available N) / efficiency
 * - P response_class: the class's rate; removal: removal/bu x yield; build: removal + (to - test) x lb/ppm / years
 * - K deficit: (critical - test) x lb K2O per ppm below the critical level; above it, removal only for crops that respond
 * - S: low test: max(need when low, removal, floor); otherwise the floor (test flagged uncertain)
 * Pushes warnings (not tested, uncertain S) onto `warnings`.
 * @example targets(interpret(soil, crop, plan, tables), crop, plan, tables, []).n.lbac
 */
export function targets(it: Interpretation, crop: CropTable, plan: Plan, tables: Tables, warnings: Warning[]): Targets {
  const y = plan.target_yield_bu;
  const st = plan.strategy;
  const rem = crop.removal_per_bu;

  // N
  let n: Target;
  if (st.n.method === 'none') n = { lbac: 0, strategy: 'none', detail: 'no N (plan strategy.n.method: none)' };
  else {
    const need = crop.n_per_bu.value * y;
    const lb = Math.max(0, need - it.n.availableLb) / st.n.efficiency;
    const cr = [it.n.fallAdjustLb ? `- ${r1(it.n.fallAdjustLb)} fall adjustment` : '', it.n.omCreditLb ? `+ ${r1(it.n.omCreditLb)} organic matter` : '', it.n.legumeCreditLb ? `+ ${r1(it.n.legumeCreditLb)} legume` : '', it.n.otherCreditLb ? `+ ${r1(it.n.otherCreditLb)} other` : ''].filter(Boolean).join(' ');
    n = {
      lbac: lb,
      strategy: 'mass_balance',
      detail: `${crop.n_per_bu.value} lb N/bu x ${y} bu = ${r1(need)}; available ${r1(it.n.nitrateLbac)} nitrate${cr ? ' ' + cr : ''} = ${r1(it.n.availableLb)}; (need - available) / efficiency ${st.n.efficiency} = ${r1(lb)}`,
    };
  }

  // P2O5
  const removalP = rem.p2o5.value * y;
  let p: Target;
  const pm = st.p.method;
  if (pm === 'none') p = { lbac: 0, strategy: 'none', detail: 'no P (plan strategy.p.method: none)' };
  else if (pm === 'removal' || (pm === 'response_class' && it.p.className === null)) {
    if (pm === 'response_class') warnings.push({ code: 'p-not-tested', message: 'P not tested here: P target set to crop removal instead of a response-class rate', field: 'p' });
    p = { lbac: removalP, strategy: 'removal', detail: `${rem.p2o5.value} lb P2O5/bu x ${y} bu = ${r1(removalP)}` };
  } else if (pm === 'response_class') {
    const rate = tables.p_class_rates[it.p.className!]!;
    const lb = rate.at_least_removal ? Math.max(rate.value, removalP) : rate.value;
    p = {
      lbac: lb,
      strategy: 'response_class',
      detail: `class ${it.p.className} (${r1(it.p.ppm)} ppm ${it.p.method}): ${rate.value} lb P2O5/ac (${rate.source})${rate.at_least_removal ? `, at least removal ${r1(removalP)}: ${r1(lb)}` : ''}`,
    };
  } else {
    const perPpm = st.p.p2o5_per_ppm ?? tables.soil.p2o5_per_ppm.value;
    const test = Number.isFinite(it.p.ppm) ? it.p.ppm : st.p.build_to_ppm;
    if (!Number.isFinite(it.p.ppm)) warnings.push({ code: 'p-not-tested', message: 'P not tested here: build strategy applies crop removal only', field: 'p' });
    const build = (Math.max(0, st.p.build_to_ppm - test) * perPpm) / st.p.build_years;
    p = { lbac: removalP + build, strategy: 'build', detail: `removal ${r1(removalP)} + (${st.p.build_to_ppm} - ${r1(test)} ppm) x ${perPpm} lb/ppm / ${st.p.build_years} yr = ${r1(removalP + build)}` };
  }

  // K2O
  let k: Target;
  if (st.k.method === 'none') k = { lbac: 0, strategy: 'none', detail: 'no K (plan strategy.k.method: none)' };
  else if (it.k.below === null) {
    warnings.push({ code: 'k-not-tested', message: 'K not tested here: no K target', field: 'k' });
    k = { lbac: 0, strategy: 'deficit', detail: 'K not tested' };
  } else if (it.k.below) {
    const lb = (it.k.criticalPpm - it.k.ppm) * tables.soil.k2o_per_ppm.value;
    k = { lbac: lb, strategy: 'deficit', detail: `(${it.k.criticalPpm} - ${r1(it.k.ppm)} ppm) x ${tables.soil.k2o_per_ppm.value} lb K2O/ppm = ${r1(lb)}` };
  } else if (crop.k_responds_above_critical.value) {
    const lb = rem.k2o.value * y;
    k = { lbac: lb, strategy: 'deficit', detail: `above the critical ${it.k.criticalPpm} ppm but ${crop.label} responds (${crop.k_responds_above_critical.source}): removal ${rem.k2o.value} x ${y} = ${r1(lb)}` };
  } else k = { lbac: 0, strategy: 'deficit', detail: `${r1(it.k.ppm)} ppm is at or above the critical ${it.k.criticalPpm} ppm: no K` };

  // S
  let s: Target;
  if (st.s.method === 'none') s = { lbac: 0, strategy: 'none', detail: 'no S (plan strategy.s.method: none)' };
  else {
    const floor = crop.s_floor_lb.value;
    if (it.s.status === 'low') {
      const lb = Math.max(crop.s_when_low_lb.value, rem.s.value * y, floor);
      s = { lbac: lb, strategy: 'need_or_floor', detail: `low test (${r1(it.s.lbac)} < ${it.s.lowBelowLb} lb/ac): max(need ${crop.s_when_low_lb.value}, removal ${r1(rem.s.value * y)}, floor ${floor}) = ${r1(lb)}` };
    } else {
      s = { lbac: floor, strategy: 'need_or_floor', detail: it.s.status === 'not_tested' ? `S not tested: floor ${floor}` : `test ${r1(it.s.lbac)} lb/ac is not low, but a sulphate test that is not low is unreliable: floor ${floor} (${crop.s_floor_lb.source})` };
      warnings.push({
        code: it.s.status === 'not_tested' ? 's-not-tested' : 's-uncertain',
        message: it.s.status === 'not_tested' ? 'S not tested here: only the S floor applies' : `sulphate-S ${r1(it.s.lbac)} lb/ac is not low, but that result is uncertain (large test error; hilltops and slopes may be deficient)`,
        field: 'so4_s',
      });
    }
  }
  return { n, p2o5: p, k2o: k, s };
}
