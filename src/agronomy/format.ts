/**
 * A Decision as text for people (the CLI prints it; the report may reuse it).
 */
import { lbacToKgha } from '../units/index.js';
import { NUTRIENT_NAME as NAME, PLACEMENT_NAME } from '../vocabulary.js';
import type { Decision } from './decision.js';
import { NUTRIENTS } from './tables.js';

const f1 = (v: number) => (Number.isFinite(v) ? (Math.round(v * 10) / 10).toFixed(1) : '-');
const pct = (v: number) => (Number.isFinite(v) ? `${Math.round(v * 100)} %` : '-');

/**
 * Formats a decision for people: interpretation, targets, seed-row limits, products per placement, binding
 * limits, expected return, warnings. Rates show the plan's unit with lb/ac and kg/ha beside it.
 * @example process.stdout.write(formatDecision(decide(soil, plan, tables)))
 */
export function formatDecision(d: Decision): string {
  const it = d.interpretation;
  const L: string[] = [];
  const both = (lb: number) => `${f1(lb)} lb/ac (${f1(lbacToKgha(lb))} kg/ha)`;
  L.push(`Crop ${d.crop}, target ${d.targetYieldBu} bu/ac, ${d.texture} texture`);
  L.push('');
  L.push('Soil test');
  L.push(
    `  P   ${f1(it.p.ppm)} ppm ${it.p.method}${it.p.kelownaFactor ? ` (class bounds: Olsen x Kelowna factor ${it.p.kelownaFactor}, published bounds kept)` : ''}: class ${it.p.className ?? 'not tested'}, chance of a response ${pct(it.p.responseProbability)}`,
  );
  L.push(
    `  K   ${f1(it.k.ppm)} ppm: class ${it.k.className ?? 'not tested'} (${it.k.below === null ? 'not tested' : it.k.below ? 'below' : 'at or above'} the critical ${it.k.criticalPpm} ppm), chance of a response ${pct(it.k.responseProbability)}`,
  );
  L.push(
    `  S   ${f1(it.s.lbac)} lb/ac 0-24 in: ${it.s.status === 'low' ? 'low (reliable)' : it.s.status === 'not_tested' ? 'not tested' : 'not low (uncertain)'}`,
  );
  L.push(
    `  N   ${f1(it.n.nitrateLbac)} lb/ac nitrate 0-24 in (used as read)${it.n.springMineralizationLb ? ` + ${f1(it.n.springMineralizationLb)} spring mineralization (fall sample)` : ''}; available with credits ${f1(it.n.availableLb)} lb/ac`,
  );
  L.push('');
  L.push('Targets (actual nutrient applied)');
  for (const n of NUTRIENTS) {
    const r = d.nutrients[n];
    L.push(
      `  ${NAME[n].padEnd(5)} target ${both(r.target.lbac)}, applied ${both(r.supplied.lbac)}${Math.abs(r.effective - r.supplied.lbac) > 0.05 ? `, effective ${f1(r.effective)} lb/ac` : ''}`,
    );
    L.push(`        ${r.strategy}: ${r.detail}`);
  }
  L.push('');
  const sr = d.seedRow;
  L.push(
    `Seed row (SBU ${f1(sr.sbu)} %): limits urea-type N ${f1(sr.n)}, P2O5 as MAP ${f1(sr.p2o5)}, P2O5 + K2O ${f1(sr.p2o5K2o)}, K2O ${f1(sr.k2o)}${Number.isFinite(sr.nK2o) ? `, N + K2O ${f1(sr.nK2o)}` : ''} lb/ac`,
  );
  L.push(
    `  applied N ${f1(sr.applied.n)} (MAP's N within the P limit is allowed for), P2O5 ${f1(sr.applied.p2o5)}, K2O ${f1(sr.applied.k2o)}, S ${f1(sr.applied.s)} lb/ac`,
  );
  L.push(`  N limit from: ${sr.nSource}`);
  L.push(`  P limit from: ${sr.pSource}`);
  L.push(`  K2O limit from: ${sr.kSource}`);
  L.push('');
  if (d.status === 'infeasible') {
    L.push('NO SOLUTION: the targets cannot be met within the limits');
    for (const r of d.infeasible) L.push(`  ${r.nutrient ? NAME[r.nutrient] + ': ' : ''}${r.reason}`);
  } else {
    L.push('Products');
    if (d.placements.length === 0) L.push('  none');
    for (const p of d.placements) {
      L.push(`  ${PLACEMENT_NAME[p.placement]}:`);
      for (const q of p.products) {
        const carried = NUTRIENTS.filter((n) => q.nutrients[n] > 0)
          .map((n) => `${f1(q.nutrients[n])} ${NAME[n]}`)
          .join(', ');
        L.push(
          `    ${q.label.padEnd(30)} ${f1(q.rate.value)} ${q.rate.unit} (${f1(q.rate.lbac)} lb/ac, ${f1(q.rate.kgha)} kg/ha) carries ${carried} lb/ac, $${q.costPerAc.toFixed(2)}/ac`,
        );
      }
    }
    L.push(`  product cost $${d.costPerAc.toFixed(2)}/ac`);
    const ns = d.nutrients.s.supplied.lbac;
    if (ns > 0) L.push(`  N:S applied ${f1(d.nutrients.n.supplied.lbac / ns)}:1 (reported, not enforced)`);
    L.push('');
    L.push('Binding');
    for (const b of d.binding) L.push(`  ${b}`);
    if (d.economics.length) {
      L.push('');
      L.push('Expected return (estimate)');
      for (const e of d.economics) L.push(`  ${NAME[e.nutrient]}: net $${f1(e.expectedNet)}/ac = ${e.note}`);
    }
  }
  if (d.warnings.length) {
    L.push('');
    L.push('Warnings');
    for (const w of d.warnings) L.push(`  ${w.message}`);
  }
  return L.join('\n') + '\n';
}
