/**
 * Boundary parts no sample speaks for (farther than MAX_UNSAMPLED_DISTANCE_M from every sample): with the plan
 * key `unsampled_parts` the build goes ahead knowingly. The prescription is built over the sampled parts alone
 * (surfaces, zones, rates), and every zone set gets one more zone, the unsampled parts, carrying the plan's rates
 * ("none": no product), checked against the machine and seed-row limits. A warning names the parts and the rates.
 * Without the key nothing changes here (the CLI refuses such a boundary before the build). Pure.
 */
import {
  decide,
  NUTRIENTS,
  PLACEMENTS,
  productOptions,
  seedRowLimits,
  type Decision,
  type Nutrient,
  type Placement,
  type PlacementResult,
  type Plan,
  type ProductOption,
  type SeedRowLimits,
  type Tables,
} from '../agronomy/index.js';
import { UserError, type Warning } from '../errors.js';
import { partsArea, partsBbox } from '../geo/area.js';
import type { Field, FieldInputs } from '../types.js';
import { kghaToLbac, lbacToKgha, m2ToAc, m2ToHa } from '../units/index.js';
import { farParts, MAX_UNSAMPLED_DISTANCE_M } from '../validate/coverage.js';
import type { Prescription, PrescriptionZone } from './types.js';
import { PLACEMENT_NAME } from '../vocabulary.js';

/** The field split into the parts the samples speak for and those they do not. */
export interface UnsampledSplit {
  /** the inputs with the field cut to its sampled parts */
  sampled: FieldInputs;
  /** the whole field, restored in the prescription */
  field: Field;
  /** 1-based numbers of the unsampled parts in the boundary */
  parts: number[];
}

const r1 = (v: number) => Math.round(v * 10) / 10;

/**
 * The split, when the plan sets `unsampled_parts` and some boundary part is unsampled (point samples only:
 * zone-composite samples carry their own zones); else null.
 * @throws UserError when every part is unsampled (the samples belong to another field)
 * @example unsampledSplit(inputs, plan)?.parts // [2]
 */
export function unsampledSplit(inputs: FieldInputs, plan: Plan): UnsampledSplit | null {
  if (plan.unsampled_parts === null || inputs.zones) return null;
  const field = inputs.field;
  const far = farParts(field.parts, inputs.samples.xy);
  if (!far.length) return null;
  if (far.length === field.parts.length)
    throw new UserError(
      `every boundary part lies more than ${MAX_UNSAMPLED_DISTANCE_M} m from every sample; plan key unsampled_parts applies to parts left unsampled, not to a whole field. Fix: check that the samples and the boundary belong to the same field.`,
      { field: 'unsampled_parts' },
    );
  const keep = field.parts.map((_, k) => k).filter((k) => !far.includes(k + 1));
  const parts = keep.map((k) => field.parts[k]);
  // ground area per planar area is the field's (one UTM zone, one scale factor)
  const scale = field.areaM2 / partsArea(field.parts);
  const cut: Field = {
    ...field,
    parts,
    lonlat: keep.map((k) => field.lonlat[k]),
    areaM2: partsArea(parts) * scale,
    bbox: partsBbox(parts),
  };
  return { sampled: { ...inputs, field: cut }, field, parts: far };
}

/**
 * The bounding box the build grid covers: the sampled parts' when `unsampled_parts` applies, else the field's.
 * @example checkBuildCells(gridBbox(inputs, plan), cell)
 */
export function gridBbox(inputs: FieldInputs, plan: Plan): [number, number, number, number] {
  return (unsampledSplit(inputs, plan)?.sampled.field ?? inputs.field).bbox;
}

/** One product at a fixed rate: its option (product in a placement) and the rate in lb/ac and the plan's unit. */
interface Fixed {
  option: ProductOption;
  lb: number;
  value: number;
}

/** The first placement of a product outside the seed row (plan order of PLACEMENTS), else the seed row. */
function defaultOption(options: ProductOption[]): ProductOption | undefined {
  return options.find((o) => o.placement !== 'seed_row') ?? options[0];
}

/** The plan's unsampled_parts as fixed rates, each checked against the product's machine limits. */
function fixedRates(plan: Plan, tables: Tables): Fixed[] {
  const spec = plan.unsampled_parts;
  if (spec === null || spec === 'none') return [];
  const all = productOptions(plan, tables);
  const key = (p: string) => `unsampled_parts.${p}`;
  let entries: [string, number, Placement | undefined][];
  if (typeof spec === 'number') {
    if (plan.products.length !== 1)
      throw new UserError(
        `plan key unsampled_parts is one rate (${spec}) but the plan has ${plan.products.length} products. Fix: give a rate per product, e.g. unsampled_parts: { ${plan.products.map((p) => `${p.product}: ${spec}`).join(', ')} }, or none.`,
        { field: 'unsampled_parts', value: spec },
      );
    entries = [[plan.products[0].product, spec, undefined]];
  } else
    entries = Object.entries(spec).map(([p, v]) =>
      typeof v === 'number' ? [p, v, undefined] : [p, v.rate, v.placement],
    );
  return entries
    .filter(([, v]) => v > 0)
    .map(([product, value, placement]) => {
      const choice = plan.products.find((p) => p.product === product);
      const options = all.filter((o) => o.product === product);
      if (!choice || !options.length)
        throw new UserError(
          `plan key ${key(product)}: "${product}" is not a product of the plan that its placements allow. Fix: use one of ${plan.products.map((p) => p.product).join(', ')}.`,
          { field: 'unsampled_parts', value: product },
        );
      const option = placement ? options.find((o) => o.placement === placement) : defaultOption(options);
      if (!option)
        throw new UserError(
          `plan key ${key(product)}.placement is ${placement}; ${product} may go in ${options.map((o) => o.placement).join(', ')}. Fix: choose one of these.`,
          { field: 'unsampled_parts', value: placement },
        );
      if (value < choice.min_rate || value > choice.max_rate)
        throw new UserError(
          `plan key ${key(product)}: ${value} ${plan.units} is outside ${product}'s machine limits ${choice.min_rate}-${choice.max_rate} ${plan.units} (products min_rate, max_rate). Fix: give a rate within them, or 0.`,
          { field: 'unsampled_parts', value },
        );
      if (choice.step > 0 && Math.abs(value / choice.step - Math.round(value / choice.step)) > 1e-9)
        throw new UserError(
          `plan key ${key(product)}: ${value} ${plan.units} is not a multiple of ${product}'s step ${choice.step}. Fix: give a multiple of ${choice.step}.`,
          { field: 'unsampled_parts', value },
        );
      return { option, value, lb: plan.units === 'kg/ha' ? kghaToLbac(value) : value };
    });
}

/** Refuses fixed rates that put more with the seed than the seed-row limits allow (the same limits as every zone). */
function checkSeedRow(fixed: Fixed[], lim: SeedRowLimits, plan: Plan): void {
  const seed = fixed.filter((f) => f.option.placement === 'seed_row');
  if (!seed.length) return;
  const t = { n: 0, nCounted: 0, p2o5: 0, k2o: 0, s: 0 };
  for (const f of seed) {
    for (const n of NUTRIENTS) t[n] += f.lb * f.option.frac[n];
    if (f.option.nCounts) t.nCounted += f.lb * f.option.frac.n;
  }
  const u = (lb: number) => (plan.units === 'kg/ha' ? `${r1(lbacToKgha(lb))} kg/ha` : `${r1(lb)} lb/ac`);
  const over = [
    t.nCounted > lim.n + 1e-6 && `urea-type N ${u(t.nCounted)} above the limit ${u(lim.n)} (${lim.nSource})`,
    t.p2o5 > lim.p2o5 + 1e-6 && `P2O5 ${u(t.p2o5)} above the limit ${u(lim.p2o5)} (${lim.pSource})`,
    t.p2o5 + t.k2o > lim.p2o5K2o + 1e-6 && `P2O5 + K2O ${u(t.p2o5 + t.k2o)} above ${u(lim.p2o5K2o)}`,
    t.k2o > lim.k2o + 1e-6 && `K2O ${u(t.k2o)} above the limit ${u(lim.k2o)} (${lim.kSource})`,
    t.n + t.k2o > lim.nK2o + 1e-6 && `N + K2O ${u(t.n + t.k2o)} above ${u(lim.nK2o)}`,
    lim.kAlone &&
      t.k2o > 0 &&
      t.n + t.p2o5 + t.s > 0 &&
      `potash with other products (for this crop only alone)`,
  ].filter((x): x is string => !!x);
  if (over.length)
    throw new UserError(
      `plan key unsampled_parts puts too much with the seed: ${over.join('; ')}. Fix: lower the seed-row rates, or give those products placement: side_band (or another placement outside the seed row).`,
      { field: 'unsampled_parts' },
    );
}

/**
 * The decision of the unsampled parts: the plan's rates as they are, targets unknown (not tested), the seed-row
 * limits of the plan's default texture.
 * @example unsampledDecision(plan, tables).placements
 */
export function unsampledDecision(plan: Plan, tables: Tables): Decision {
  const soil = { no3_n: NaN, p: NaN, k: NaN, so4_s: NaN, om: NaN };
  const base = decide(soil, plan, tables);
  const lim = seedRowLimits(tables.crops[plan.crop]!, plan.crop, base.texture, plan, tables);
  const fixed = fixedRates(plan, tables);
  checkSeedRow(fixed, lim, plan);
  const zero = (): Record<Nutrient, number> => ({ n: 0, p2o5: 0, k2o: 0, s: 0 });
  const supplied = zero(),
    effective = zero(),
    applied = { ...zero(), nCounted: 0 };
  const byPlacement = new Map<Placement, PlacementResult>();
  let cost = 0;
  for (const f of fixed) {
    const o = f.option;
    const nut = zero();
    for (const n of NUTRIENTS) {
      nut[n] = f.lb * o.frac[n];
      supplied[n] += nut[n];
      effective[n] += nut[n] * o.eff[n];
      if (o.placement === 'seed_row') applied[n] += nut[n];
    }
    if (o.placement === 'seed_row' && o.nCounts) applied.nCounted += nut.n;
    let pr = byPlacement.get(o.placement);
    if (!pr) byPlacement.set(o.placement, (pr = { placement: o.placement, products: [], nutrients: zero() }));
    for (const n of NUTRIENTS) pr.nutrients[n] += nut[n];
    const kgha = lbacToKgha(f.lb);
    pr.products.push({
      product: o.product,
      label: o.label,
      rate: { lbac: f.lb, kgha, value: f.value, unit: plan.units },
      nutrients: nut,
      costPerAc: f.lb * o.pricePerLb,
    });
    cost += f.lb * o.pricePerLb;
  }
  const rate = (lb: number) => ({
    lbac: lb,
    kgha: lbacToKgha(lb),
    value: plan.units === 'kg/ha' ? lbacToKgha(lb) : lb,
    unit: plan.units,
  });
  const nutrients = {} as Decision['nutrients'];
  for (const n of NUTRIENTS)
    nutrients[n] = {
      target: rate(NaN),
      strategy: 'unsampled',
      detail: `no sample within ${MAX_UNSAMPLED_DISTANCE_M} m: the plan's unsampled_parts rates, no target`,
      supplied: rate(supplied[n]),
      effective: effective[n],
    };
  return {
    ...base,
    status: 'ok',
    nutrients,
    seedRow: { ...lim, applied },
    placements: PLACEMENTS.filter((p) => byPlacement.has(p)).map((p) => byPlacement.get(p)!),
    costPerAc: cost,
    binding: [
      `unsampled part: the plan's unsampled_parts rates (no sample within ${MAX_UNSAMPLED_DISTANCE_M} m)`,
    ],
    infeasible: [],
    economics: [],
    warnings: [],
  };
}

/** "urea 80 lb/ac side band, map 40 lb/ac side band", or "no product". */
function ratesText(d: Decision, unit: string): string {
  const list = d.placements.flatMap((p) =>
    p.products.map((q) => `${q.product} ${r1(q.rate.value)} ${unit} ${PLACEMENT_NAME[p.placement]}`),
  );
  return list.length ? list.join(', ') : 'no product';
}

/**
 * The prescription of a field with unsampled parts: the plan's rates for them checked first (before any work),
 * then the sampled parts built, then one more zone per zone set (rate class 0, the plan's rates), the whole field
 * restored, totals over the whole field, and a warning naming the parts and the rates.
 * @param build builds the sampled parts (buildPrescription with the caller's options)
 * @param totals the prescription's totals function (src/prescription/index.ts productTotals)
 * @example withUnsampledZones(split, plan, tables, (i) => buildPrescription(i, plan, tables), productTotals)
 */
export function withUnsampledZones(
  split: UnsampledSplit,
  plan: Plan,
  tables: Tables,
  build: (inputs: FieldInputs) => Prescription,
  totals: (sets: Prescription['zoneSets'], plan: Plan) => Prescription['totals'],
): Prescription {
  const decision = unsampledDecision(plan, tables);
  const rx = build(split.sampled);
  const f = split.field;
  const idx = split.parts.map((p) => p - 1);
  const parts = idx.map((k) => f.parts[k]);
  const areaM2 = f.areaM2 - split.sampled.field.areaM2;
  for (const set of rx.zoneSets) {
    const zone: PrescriptionZone = {
      id: set.zones.length + 1,
      rateClass: 0,
      key: null,
      parts,
      lonlat: idx.map((k) => f.lonlat[k]),
      areaM2,
      areaAc: m2ToAc(areaM2),
      areaHa: m2ToHa(areaM2),
      soil: { no3_n: NaN, p: NaN, k: NaN, so4_s: NaN, om: NaN },
      samples: [],
      decision,
    };
    set.zones.push(zone);
  }
  const ids = rx.zoneSets.map(
    (s) => `${rx.zoneSets.length > 1 ? `set ${s.name} ` : ''}zone ${s.zones.length}`,
  );
  const warning: Warning = {
    code: 'unsampled-parts',
    field: 'unsampled_parts',
    where: split.parts.join(','),
    message: `boundary part${split.parts.length > 1 ? 's' : ''} ${split.parts.join(', ')} of ${f.parts.length} (${r1(m2ToAc(areaM2))} ac) lie${split.parts.length > 1 ? '' : 's'} more than ${MAX_UNSAMPLED_DISTANCE_M} m from every sample: no rates from the samples there; ${split.parts.length > 1 ? 'they get' : 'it gets'} the plan's unsampled_parts rates: ${ratesText(decision, plan.units)} (${ids.join('; ')}).`,
  };
  return {
    ...rx,
    field: {
      name: f.name,
      areaM2: f.areaM2,
      areaAc: m2ToAc(f.areaM2),
      areaHa: m2ToHa(f.areaM2),
      utm: f.utm,
      parts: f.parts,
      lonlat: f.lonlat,
    },
    totals: totals(rx.zoneSets, plan),
    warnings: [...rx.warnings, warning],
  };
}
