/** Default crop table: yield and removal per bushel, seed-row groups and limits per crop. See defaults.ts. */
import type { TablesInput } from './schema.js';

const MB_SEED_P =
  '[published] Manitoba Agriculture, Safe Rates of Seed-Placed Phosphorus: maximum seed-placed P2O5 as MAP (the N in MAP within it allowed for), 1 in spread, 6-7 in rows (7 in taken), good moisture';
const SK_SEED_P =
  '[published] Saskatchewan Agriculture, Safe Rates of Side-banded and Seed-placed Phosphorus in Canola (2018); Canola Watch 2011: 20-25 lb P2O5 (40-50 lb MAP) on 1 in knives, 7-9 in rows';
const SK_SEED_P_OTHER =
  '[published] Saskatchewan values beside the Manitoba table (reference sheet of safe seed-placed P2O5); configuration taken as for canola, 1 in knife on 9 in rows (common practice)';
const ALBERTA_K =
  '[published] Alberta Agriculture potassium guide (older edition): canola, flax, peas at most 15 lb K2O/ac with the seed, and only if nothing else goes with the seed';
const ALBERTA_NK =
  '[published] Alberta Agriculture potassium guide (older edition): N + K2O with the seed at most 40 lb/ac (double-disc drills, medium texture, average moisture)';
const seedP = (mb: number, sk: number, skSource = SK_SEED_P_OTHER) => ({
  manitoba: { value: mb, spread_in: 1, rows_in: 7, source: MB_SEED_P },
  saskatchewan: { value: sk, spread_in: 1, rows_in: 9, source: skSource },
});
const NO_NK = {
  value: null,
  source: "common practice: the crop's own K2O rule applies instead (potash alone, at most 15 lb K2O)",
};

export const CROPS: TablesInput['crops'] = {
  canola: {
    label: 'canola',
    bushel_lb: { value: 50, source: '[published] Canada Grains Council bushel/tonne factors (1999)' },
    n_per_bu: {
      value: 3.0,
      source:
        '[published] Canola Watch 2012/2016: 2.5-3.5 lb available N/bu (lower for hybrids); middle of the range',
    },
    removal_per_bu: {
      n: { value: 1.9, source: '[published] Canadian Fertilizer Institute 2001 via Manitoba Agriculture' },
      p2o5: {
        value: 0.9,
        source: 'common practice: 0.9 lb P2O5/bu (Canola Council prints 35 bu removes 33-40 lb)',
      },
      k2o: { value: 0.5, source: '[published] Canola Council of Canada: 35 bu removes 16-20 lb K2O' },
      s: { value: 0.3, source: '[published] Canola Council of Canada: 35 bu removes 10-12 lb S' },
    },
    k_critical_ppm: {
      value: 125,
      source:
        'common practice: critical level about 125 ppm; canola may respond below 150 ppm ([published] Canola Encyclopedia) but responds less than cereals, so its classes call for K2O only below 125',
    },
    k_responds_above_critical: {
      value: false,
      source: 'common practice: canola seldom responds above the critical level',
    },
    k_class_group: 'canola',
    s_low_below_lb: {
      value: 20,
      source:
        '[published] Canola Encyclopedia, Sulphur Fertilizer Management: responded where sulphate-S to 60 cm was below 20-30 lb/ac (lower end)',
    },
    s_when_low_lb: {
      value: 20,
      source:
        '[published] Canola Encyclopedia, Sulphur Fertilizer Management: 10-20 lb S/ac (upper end on a low test)',
    },
    s_floor_lb: {
      value: 10,
      source: 'common practice: about 10 lb S/ac on every canola acre regardless of soil test',
    },
    seed_row_group: 'canola',
    seed_row_p2o5: seedP(20, 25, SK_SEED_P),
    seed_row_k2o_max: { value: 15, source: ALBERTA_K },
    seed_row_k2o_alone: { value: true, source: ALBERTA_K },
    seed_row_n_k2o_max: NO_NK,
    seed_row_starter: {
      value: true,
      source:
        '[published] Canola Council of Canada, Right rates for seed-placed fertilizer; Canola Watch 2020: 15-20 lb P2O5 as MAP with canola seed is standard; seeding canola without starter P in the row is advised against',
    },
  },
  wheat: {
    label: 'hard red spring wheat',
    bushel_lb: { value: 60, source: '[published] Canada Grains Council bushel/tonne factors (1999)' },
    n_per_bu: {
      value: 2.75,
      source:
        '[published] Top Crop Manager 2019: 2.5-3 lb total N/bu for hard red spring wheat; middle of the range',
    },
    removal_per_bu: {
      n: { value: 1.5, source: '[published] Canadian Fertilizer Institute / Saskatchewan Agriculture' },
      p2o5: { value: 0.59, source: '[published] Canadian Fertilizer Institute / Saskatchewan Agriculture' },
      k2o: { value: 0.35, source: 'from memory' },
      s: { value: 0.1, source: 'from memory' },
    },
    k_critical_ppm: {
      value: 125,
      source: 'common practice: critical level about 125 ppm (250 lb/ac) in 0-6 in',
    },
    k_responds_above_critical: {
      value: false,
      source: 'common practice: wheat seldom responds above the critical level',
    },
    k_class_group: 'default',
    s_low_below_lb: { value: 20, source: 'from memory' },
    s_when_low_lb: { value: 10, source: 'from memory' },
    s_floor_lb: { value: 0, source: 'common practice: no S floor for cereals' },
    seed_row_group: 'cereal',
    seed_row_p2o5: seedP(50, 50),
    seed_row_k2o_max: { value: 40, source: ALBERTA_NK },
    seed_row_k2o_alone: {
      value: false,
      source:
        'common practice: cereals tolerate potash with phosphate in the seed row, within the additive P2O5 + K2O limit',
    },
    seed_row_n_k2o_max: { value: 40, source: ALBERTA_NK },
    seed_row_starter: {
      value: false,
      source: 'common practice: cereals get P by the soil test; no starter forced on a very high test',
    },
  },
  barley: {
    label: 'feed barley',
    bushel_lb: { value: 48, source: '[published] Canada Grains Council bushel/tonne factors (1999)' },
    n_per_bu: { value: 1.7, source: 'from memory: barley about 1.4-2 lb N/bu' },
    removal_per_bu: {
      n: { value: 1.0, source: '[published] Canadian Fertilizer Institute / Saskatchewan Agriculture' },
      p2o5: { value: 0.5, source: '[published] Canadian Fertilizer Institute / Saskatchewan Agriculture' },
      k2o: { value: 0.3, source: 'from memory' },
      s: { value: 0.08, source: 'from memory' },
    },
    k_critical_ppm: {
      value: 125,
      source: 'common practice: critical level about 125 ppm (250 lb/ac) in 0-6 in',
    },
    k_responds_above_critical: {
      value: false,
      source: 'common practice: feed barley seldom responds above the critical level',
    },
    k_class_group: 'default',
    s_low_below_lb: { value: 20, source: 'from memory' },
    s_when_low_lb: { value: 10, source: 'from memory' },
    s_floor_lb: { value: 0, source: 'common practice: no S floor for cereals' },
    seed_row_group: 'cereal',
    seed_row_p2o5: seedP(50, 50),
    seed_row_k2o_max: { value: 40, source: ALBERTA_NK },
    seed_row_k2o_alone: {
      value: false,
      source:
        'common practice: cereals tolerate potash with phosphate in the seed row, within the additive P2O5 + K2O limit',
    },
    seed_row_n_k2o_max: { value: 40, source: ALBERTA_NK },
    seed_row_starter: {
      value: false,
      source: 'common practice: cereals get P by the soil test; no starter forced on a very high test',
    },
  },
  malt_barley: {
    label: 'malt barley',
    bushel_lb: { value: 48, source: '[published] Canada Grains Council bushel/tonne factors (1999)' },
    n_per_bu: { value: 1.5, source: 'from memory: lower N target than feed barley to hold grain protein' },
    removal_per_bu: {
      n: {
        value: 1.0,
        source: '[published] Canadian Fertilizer Institute / Saskatchewan Agriculture (barley)',
      },
      p2o5: {
        value: 0.5,
        source: '[published] Canadian Fertilizer Institute / Saskatchewan Agriculture (barley)',
      },
      k2o: { value: 0.3, source: 'from memory' },
      s: { value: 0.08, source: 'from memory' },
    },
    k_critical_ppm: {
      value: 125,
      source: 'common practice: critical level about 125 ppm (250 lb/ac) in 0-6 in',
    },
    k_responds_above_critical: {
      value: true,
      source: 'common practice: malt barley can respond above the critical level',
    },
    k_class_group: 'default',
    s_low_below_lb: { value: 20, source: 'from memory' },
    s_when_low_lb: { value: 10, source: 'from memory' },
    s_floor_lb: { value: 0, source: 'common practice: no S floor for cereals' },
    seed_row_group: 'cereal',
    seed_row_p2o5: seedP(50, 50),
    seed_row_k2o_max: { value: 40, source: ALBERTA_NK },
    seed_row_k2o_alone: {
      value: false,
      source:
        'common practice: cereals tolerate potash with phosphate in the seed row, within the additive P2O5 + K2O limit',
    },
    seed_row_n_k2o_max: { value: 40, source: ALBERTA_NK },
    seed_row_starter: {
      value: false,
      source: 'common practice: cereals get P by the soil test; no starter forced on a very high test',
    },
  },
  peas: {
    label: 'field peas',
    bushel_lb: { value: 60, source: '[published] Canada Grains Council bushel/tonne factors (1999)' },
    n_per_bu: { value: 0, source: 'common practice: inoculated peas fix their own N; no N target' },
    removal_per_bu: {
      n: { value: 2.3, source: '[published] Saskatchewan Pulse Growers table (CFI)' },
      p2o5: { value: 0.69, source: '[published] Saskatchewan Pulse Growers table (CFI)' },
      k2o: { value: 0.7, source: '[published] Saskatchewan Pulse Growers table (CFI)' },
      s: { value: 0.13, source: '[published] Saskatchewan Pulse Growers table (CFI)' },
    },
    k_critical_ppm: {
      value: 125,
      source: 'common practice: critical level about 125 ppm (250 lb/ac) in 0-6 in',
    },
    k_responds_above_critical: {
      value: false,
      source: 'common practice: peas seldom respond above the critical level',
    },
    k_class_group: 'default',
    s_low_below_lb: { value: 20, source: 'from memory' },
    s_when_low_lb: { value: 10, source: 'from memory' },
    s_floor_lb: { value: 0, source: 'common practice: no S floor for peas' },
    seed_row_group: 'peas',
    seed_row_p2o5: seedP(20, 15),
    seed_row_k2o_max: { value: 15, source: ALBERTA_K },
    seed_row_k2o_alone: { value: true, source: ALBERTA_K },
    seed_row_n_k2o_max: NO_NK,
    seed_row_starter: { value: false, source: 'common practice: peas get P by the soil test' },
  },
};
