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

function nTarget(it: Interpretation, crop: CropTable, plan: Plan): Target {
  const st = plan.strategy.n;
  if (st.method === 'none')
    return { lbac: 0, strategy: 'none', detail: 'no N (plan strategy.n.method: none)' };
  const y = plan.target_yield_bu;
  const need = crop.n_per_bu.value * y;
  const eff = st.efficiency ?? 1;
  const lb = Math.max(0, need - it.n.availableLb) / eff;
  const n = it.n;
  const cr = [
    n.springMineralizationLb ? `+ ${r1(n.springMineralizationLb)} spring mineralization (fall sample)` : '',
    n.omCreditLb ? `+ ${r1(n.omCreditLb)} organic matter` : '',
    n.legumeCreditLb ? `+ ${r1(n.legumeCreditLb)} legume` : '',
    n.otherCreditLb ? `+ ${r1(n.otherCreditLb)} other` : '',
  ]
    .filter(Boolean)
    .join(' ');
  const effText =
    st.efficiency === null
      ? 'N placed by the relative efficiency of its placement and timing (n_relative_efficiency)'
      : `/ efficiency ${st.efficiency} (plan key strategy.n.efficiency)`;
  return {
    lbac: lb,
    strategy: 'mass_balance',
    detail: `${crop.n_per_bu.value} lb N/bu x ${y} bu = ${r1(need)}; available ${r1(n.nitrateLbac)} nitrate (${plan.soil_test.nitrate_sampled} sample, used as read)${cr ? ' ' + cr : ''} = ${r1(n.availableLb)}; need - available = ${r1(lb * eff)}, ${effText}${st.efficiency === null ? '' : ` = ${r1(lb)}`}`,
  };
}

function buildPart(it: Interpretation, plan: Plan, tables: Tables): { lb: number; text: string } {
  const st = plan.strategy.p;
  const perPpm = st.p2o5_per_ppm ?? tables.soil.p2o5_per_ppm.value;
  const lb = (Math.max(0, st.build_to_ppm - it.p.ppm) * perPpm) / st.build_years;
  return {
    lb,
    text: `(${st.build_to_ppm} - ${r1(it.p.ppm)} ppm) x ${perPpm} lb P2O5/ppm / ${st.build_years} yr = ${r1(lb)}`,
  };
}

function pTarget(
  it: Interpretation,
  crop: CropTable,
  plan: Plan,
  tables: Tables,
  starterLb: number,
  warnings: Warning[],
): Target {
  const y = plan.target_yield_bu;
  const removal = crop.removal_per_bu.p2o5.value * y;
  const remText = `removal ${crop.removal_per_bu.p2o5.value} lb P2O5/bu x ${y} bu = ${r1(removal)}`;
  const pm = plan.strategy.p.method;
  if (pm === 'none') return { lbac: 0, strategy: 'none', detail: 'no P (plan strategy.p.method: none)' };
  if (pm === 'removal' || it.p.className === null) {
    if (it.p.className === null && pm !== 'removal')
      warnings.push({
        code: 'p-not-tested',
        message: 'P not tested here: P target set to crop removal',
        field: 'p',
      });
    return { lbac: removal, strategy: 'removal', detail: remText };
  }
  if (pm === 'build') {
    const b = buildPart(it, plan, tables);
    return {
      lbac: removal + b.lb,
      strategy: 'build',
      detail: `${remText} + build ${b.text} = ${r1(removal + b.lb)}`,
    };
  }
  const rule = tables.p_class_rates[it.p.className]!;
  const cls = `class ${it.p.className} (${r1(it.p.ppm)} ppm ${it.p.method}${it.p.kelownaFactor ? `, Kelowna factor ${it.p.kelownaFactor}` : ''})`;
  let lb: number;
  let how: string;
  if (rule.rule === 'build_plus_removal') {
    const b = buildPart(it, plan, tables);
    lb = removal + b.lb;
    how = `build and maintenance: ${remText} + build ${b.text}`;
  } else if (rule.rule === 'removal') {
    lb = removal;
    how = `maintenance: ${remText}`;
  } else if (rule.rule === 'fraction_of_removal') {
    lb = removal * rule.fraction;
    how = `reduced: ${rule.fraction} x ${remText}`;
  } else {
    lb = crop.seed_row_starter.value ? starterLb : 0;
    how = crop.seed_row_starter.value
      ? `seed-row starter only: ${r1(starterLb)} lb P2O5 (what fits in the seed row)`
      : 'none on a very high test';
  }
  if (crop.seed_row_starter.value && starterLb > lb) {
    how += `; raised to the seed-row starter ${r1(starterLb)} (${crop.seed_row_starter.source})`;
    lb = starterLb;
  }
  return { lbac: lb, strategy: 'response_class', detail: `${cls}: ${how} = ${r1(lb)} (${rule.source})` };
}

function kTarget(
  it: Interpretation,
  crop: CropTable,
  plan: Plan,
  tables: Tables,
  warnings: Warning[],
): Target {
  if (plan.strategy.k.method === 'none')
    return { lbac: 0, strategy: 'none', detail: 'no K (plan strategy.k.method: none)' };
  if (it.k.className === null) {
    warnings.push({ code: 'k-not-tested', message: 'K not tested here: no K target', field: 'k' });
    return { lbac: 0, strategy: 'response_class', detail: 'K not tested' };
  }
  const y = plan.target_yield_bu;
  const minUseful = tables.k_min_useful_lb.value;
  let lb = it.k.classK2o;
  let detail = `class ${it.k.className} (${r1(it.k.ppm)} ppm; critical ${it.k.criticalPpm} ppm): ${lb} lb K2O/ac (${it.k.source})`;
  if (!it.k.below && crop.k_responds_above_critical.value) {
    lb = crop.removal_per_bu.k2o.value * y;
    detail = `above the critical ${it.k.criticalPpm} ppm but ${crop.label} responds (${crop.k_responds_above_critical.source}): removal ${crop.removal_per_bu.k2o.value} x ${y} = ${r1(lb)}`;
  }
  if (lb > 0 && lb < minUseful) {
    warnings.push({
      code: 'target-rounded-to-zero',
      message: `K2O target ${r1(lb)} lb/ac is below the minimum useful rate ${minUseful} lb/ac: rounded to 0`,
      field: 'k',
    });
    detail += `; below the minimum useful ${minUseful} lb K2O/ac: rounded to 0 (${tables.k_min_useful_lb.source})`;
    lb = 0;
  }
  return { lbac: lb, strategy: 'response_class', detail };
}

function sTarget(it: Interpretation, crop: CropTable, plan: Plan, warnings: Warning[]): Target {
  if (plan.strategy.s.method === 'none')
    return { lbac: 0, strategy: 'none', detail: 'no S (plan strategy.s.method: none)' };
  const y = plan.target_yield_bu;
  const floor = crop.s_floor_lb.value;
  const rem = crop.removal_per_bu.s.value * y;
  if (it.s.status === 'low') {
    const lb = Math.max(crop.s_when_low_lb.value, rem, floor);
    return {
      lbac: lb,
      strategy: 'need_or_floor',
      detail: `low test (${r1(it.s.lbac)} < ${it.s.lowBelowLb} lb/ac): max(need ${crop.s_when_low_lb.value}, removal ${r1(rem)}, floor ${floor}) = ${r1(lb)}`,
    };
  }
  warnings.push({
    code: it.s.status === 'not_tested' ? 's-not-tested' : 's-uncertain',
    message:
      it.s.status === 'not_tested'
        ? 'S not tested here: only the S floor applies'
        : `sulphate-S ${r1(it.s.lbac)} lb/ac is not low, but that result is uncertain (large test error; hilltops and slopes may be deficient)`,
    field: 'so4_s',
  });
  return {
    lbac: floor,
    strategy: 'need_or_floor',
    detail:
      it.s.status === 'not_tested'
        ? `S not tested: floor ${floor}`
        : `test ${r1(it.s.lbac)} lb/ac is not low, but a sulphate test that is not low is unreliable: floor ${floor} (${crop.s_floor_lb.source})`,
  };
}

/**
 * Targets for one location.
 * - N mass balance: max(0, need/bu x yield - available N) (/ the plan's efficiency when it sets one; otherwise
 *   each placement's relative efficiency applies in the product solve)
 * - P response_class by the class's rule: build + removal (very low, low), removal (medium), a fraction of removal
 *   (high), the seed-row starter or none (very high); a crop always offered a starter gets at least `starterLb`.
 *   removal: removal/bu x yield; build: removal + (to - test) x lb/ppm / years
 * - K response_class: the crop's K class rate; above the critical level removal only for crops that respond;
 *   a rate below the minimum useful K2O is rounded to 0 (said in a warning)
 * - S: low test: max(need when low, removal, floor); otherwise the floor (test flagged uncertain)
 * Pushes warnings (not tested, uncertain S, rounded to 0) onto `warnings`.
 * @param starterLb lb P2O5 the seed row takes as a starter (0 without a seed row); default 0
 * @example targets(interpret(soil, crop, plan, tables), crop, plan, tables, [], 20).p2o5.lbac
 */
export function targets(
  it: Interpretation,
  crop: CropTable,
  plan: Plan,
  tables: Tables,
  warnings: Warning[],
  starterLb = 0,
): Targets {
  return {
    n: nTarget(it, crop, plan),
    p2o5: pTarget(it, crop, plan, tables, starterLb, warnings),
    k2o: kTarget(it, crop, plan, tables, warnings),
    s: sTarget(it, crop, plan, warnings),
  };
}
