/**
 * The default agronomy tables tilth ships, as data (the bundle carries them; nothing reads a file).
 * Every entry carries `source`, marked as in ../shared/reference/agronomy.md:
 * `[published] <publication>`, `common practice`, or `from memory`. A value that no publication we found
 * gives is `missing: true`: the program then asks the user (a plan key) instead of inventing one.
 * Users print these with `tilth tables`, edit them, and pass `--tables my-tables.yaml`.
 */
import type { TablesInput } from '../tables.js';

const MB_SEED_N = '[published] Manitoba Agriculture, Guidelines for Safely Applying Fertilizer with Seed (urea-N, good-to-excellent seedbed moisture)';
const MB_CANOLA_N = '[published] Manitoba Agriculture, Seed-Placed Nitrogen Fertilizer (canola)';
const MB_SEED_P = '[published] Manitoba Agriculture, Safe Rates of Seed-Placed Phosphorus (1 in spread, 6-7 in rows, good moisture)';
const ADDITIVE = 'common practice: P2O5 and K2O with the seed are additive against the one safe P2O5 limit';
const ALBERTA_K = '[published] Alberta Agriculture potassium guide (older edition): canola, flax, peas at most 15 lb K2O/ac with the seed';
const IFA = '[published] International Fertilizer Association product tables';
const PRICE = 'from memory: placeholder price in $ per tonne; replace with your dealer\'s quote';

export const DEFAULT_TABLES: TablesInput = {
  crops: {
    canola: {
      label: 'canola',
      bushel_lb: { value: 50, source: '[published] Canada Grains Council bushel/tonne factors (1999)' },
      n_per_bu: { value: 3.0, source: '[published] Canola Watch 2012/2016: 2.5-3.5 lb available N/bu (lower for hybrids); middle of the range' },
      removal_per_bu: {
        n: { value: 1.9, source: '[published] Canadian Fertilizer Institute 2001 via Manitoba Agriculture' },
        p2o5: { value: 0.9, source: 'common practice: 0.9 lb P2O5/bu (Canola Council prints 35 bu removes 33-40 lb)' },
        k2o: { value: 0.5, source: '[published] Canola Council of Canada: 35 bu removes 16-20 lb K2O' },
        s: { value: 0.3, source: '[published] Canola Council of Canada: 35 bu removes 10-12 lb S' },
      },
      k_critical_ppm: { value: 150, source: '[published] Canola Encyclopedia, Potassium Fertilizer Management: canola may respond below 150 ppm' },
      k_responds_above_critical: { value: false, source: 'common practice: canola seldom responds above the critical level' },
      s_low_below_lb: { value: 20, source: '[published] Canola Encyclopedia, Sulphur Fertilizer Management: responded where sulphate-S to 60 cm was below 20-30 lb/ac (lower end)' },
      s_when_low_lb: { value: 20, source: '[published] Canola Encyclopedia, Sulphur Fertilizer Management: 10-20 lb S/ac (upper end on a low test)' },
      s_floor_lb: { value: 10, source: 'common practice: about 10 lb S/ac on every canola acre regardless of soil test' },
      seed_row_group: 'canola',
      seed_row_p2o5_max: { value: 20, source: `${MB_SEED_P}; Saskatchewan prints 25` },
      seed_row_p2o5_k2o_max: { value: 20, source: ADDITIVE },
      seed_row_k2o_max: { value: 15, source: ALBERTA_K },
    },
    wheat: {
      label: 'hard red spring wheat',
      bushel_lb: { value: 60, source: '[published] Canada Grains Council bushel/tonne factors (1999)' },
      n_per_bu: { value: 2.75, source: '[published] Top Crop Manager 2019: 2.5-3 lb total N/bu for hard red spring wheat; middle of the range' },
      removal_per_bu: {
        n: { value: 1.5, source: '[published] Canadian Fertilizer Institute / Saskatchewan Agriculture' },
        p2o5: { value: 0.59, source: '[published] Canadian Fertilizer Institute / Saskatchewan Agriculture' },
        k2o: { value: 0.35, source: 'from memory' },
        s: { value: 0.1, source: 'from memory' },
      },
      k_critical_ppm: { value: 125, source: 'common practice: critical level about 125 ppm (250 lb/ac) in 0-6 in' },
      k_responds_above_critical: { value: false, source: 'common practice: wheat seldom responds above the critical level' },
      s_low_below_lb: { value: 20, source: 'from memory' },
      s_when_low_lb: { value: 10, source: 'from memory' },
      s_floor_lb: { value: 0, source: 'common practice: no S floor for cereals' },
      seed_row_group: 'cereal',
      seed_row_p2o5_max: { value: 50, source: `${MB_SEED_P} (cereals); Saskatchewan prints 50` },
      seed_row_p2o5_k2o_max: { value: 50, source: ADDITIVE },
      seed_row_k2o_max: { value: 50, source: ADDITIVE },
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
      k_critical_ppm: { value: 125, source: 'common practice: critical level about 125 ppm (250 lb/ac) in 0-6 in' },
      k_responds_above_critical: { value: false, source: 'common practice: feed barley seldom responds above the critical level' },
      s_low_below_lb: { value: 20, source: 'from memory' },
      s_when_low_lb: { value: 10, source: 'from memory' },
      s_floor_lb: { value: 0, source: 'common practice: no S floor for cereals' },
      seed_row_group: 'cereal',
      seed_row_p2o5_max: { value: 50, source: `${MB_SEED_P} (cereals); Saskatchewan prints 50` },
      seed_row_p2o5_k2o_max: { value: 50, source: ADDITIVE },
      seed_row_k2o_max: { value: 50, source: ADDITIVE },
    },
    malt_barley: {
      label: 'malt barley',
      bushel_lb: { value: 48, source: '[published] Canada Grains Council bushel/tonne factors (1999)' },
      n_per_bu: { value: 1.5, source: 'from memory: lower N target than feed barley to hold grain protein' },
      removal_per_bu: {
        n: { value: 1.0, source: '[published] Canadian Fertilizer Institute / Saskatchewan Agriculture (barley)' },
        p2o5: { value: 0.5, source: '[published] Canadian Fertilizer Institute / Saskatchewan Agriculture (barley)' },
        k2o: { value: 0.3, source: 'from memory' },
        s: { value: 0.08, source: 'from memory' },
      },
      k_critical_ppm: { value: 125, source: 'common practice: critical level about 125 ppm (250 lb/ac) in 0-6 in' },
      k_responds_above_critical: { value: true, source: 'common practice: malt barley can respond above the critical level' },
      s_low_below_lb: { value: 20, source: 'from memory' },
      s_when_low_lb: { value: 10, source: 'from memory' },
      s_floor_lb: { value: 0, source: 'common practice: no S floor for cereals' },
      seed_row_group: 'cereal',
      seed_row_p2o5_max: { value: 50, source: `${MB_SEED_P} (cereals); Saskatchewan prints 50` },
      seed_row_p2o5_k2o_max: { value: 50, source: ADDITIVE },
      seed_row_k2o_max: { value: 50, source: ADDITIVE },
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
      k_critical_ppm: { value: 125, source: 'common practice: critical level about 125 ppm (250 lb/ac) in 0-6 in' },
      k_responds_above_critical: { value: false, source: 'common practice: peas seldom respond above the critical level' },
      s_low_below_lb: { value: 20, source: 'from memory' },
      s_when_low_lb: { value: 10, source: 'from memory' },
      s_floor_lb: { value: 0, source: 'common practice: no S floor for peas' },
      seed_row_group: 'peas',
      seed_row_p2o5_max: { value: 20, source: `${MB_SEED_P} (peas, flax); Saskatchewan prints 15` },
      seed_row_p2o5_k2o_max: { value: 20, source: ADDITIVE },
      seed_row_k2o_max: { value: 15, source: ALBERTA_K },
    },
  },

  seed_row_n: {
    cereal: {
      light: { spreads_in: [1, 2, 3], rows_in: [6, 9, 12], safe_n: [[10, 0, 0], [20, 15, 10], [30, 20, 15]], source: MB_SEED_N },
      medium: { spreads_in: [1, 2, 3], rows_in: [6, 9, 12], safe_n: [[20, 15, 10], [30, 25, 20], [40, 30, 25]], source: MB_SEED_N },
      heavy: { spreads_in: [1, 2, 3], rows_in: [6, 9, 12], safe_n: [[25, 20, 10], [40, 30, 25], [50, 40, 30]], source: MB_SEED_N },
    },
    canola: {
      light: { spreads_in: [1, 2, 3], rows_in: [6, 9, 12], safe_n: [[0, 0, 0], [10, 0, 0], [20, 10, 0]], source: MB_CANOLA_N },
      medium: { missing: true, source: 'missing: no published table found for canola on medium soils (Canola Watch 2010 gives one Saskatchewan point: 1 in knife, 9 in rows, at most 10 lb N/ac)' },
      heavy: { missing: true, source: 'missing: no published table found for canola on heavy soils' },
    },
    peas: {
      light: { missing: true, source: 'missing: no published seed-row N table found for peas' },
      medium: { missing: true, source: 'missing: no published seed-row N table found for peas' },
      heavy: { missing: true, source: 'missing: no published seed-row N table found for peas' },
    },
  },
  dry_seedbed_factor: { value: 0.5, source: 'from memory: halve in a dry seedbed (Manitoba Agriculture says only "lower these in dry seedbeds")' },

  p_classes: {
    olsen: [
      { name: 'very_low', below_ppm: 5, response_probability: 1.0, source: 'common practice: < 5 ppm Olsen, about 100 % chance of a response' },
      { name: 'low', below_ppm: 10, response_probability: 0.75, source: 'common practice: 5-10 ppm Olsen, about 75 %' },
      { name: 'medium', below_ppm: 20, response_probability: 0.5, source: 'common practice: 10-20 ppm Olsen, about 50 % (maintenance range)' },
      { name: 'high', below_ppm: null, response_probability: 0.2, source: 'common practice: > 20 ppm Olsen, under 25 % (20 % used)' },
    ],
    kelowna: [
      { name: 'very_low', below_ppm: 8.5, response_probability: 1.0, source: 'common practice Olsen classes x 1.7, the ratio of the published low thresholds 17 modified Kelowna / 10 Olsen ([published] Canola Encyclopedia)' },
      { name: 'low', below_ppm: 17, response_probability: 0.75, source: '[published] Canola Encyclopedia: low is <= 17 ppm modified Kelowna' },
      { name: 'medium', below_ppm: 34, response_probability: 0.5, source: 'common practice Olsen classes x 1.7 (see very_low)' },
      { name: 'high', below_ppm: null, response_probability: 0.2, source: 'common practice Olsen classes x 1.7 (see very_low)' },
    ],
  },
  p_class_rates: {
    very_low: { value: 50, at_least_removal: true, source: 'from memory: lb P2O5/ac on a very low test; never less than crop removal (common practice, as for the maintenance range below it)' },
    low: { value: 40, at_least_removal: true, source: 'from memory: lb P2O5/ac on a low test; never less than crop removal (common practice, as for the maintenance range)' },
    medium: { value: 30, at_least_removal: true, source: 'from memory: lb P2O5/ac in the maintenance range; at least crop removal there (common practice)' },
    high: { value: 15, source: 'from memory: starter rate on a high test' },
  },
  k_response_probability: {
    below_critical: { value: 0.95, source: 'common practice: about 95 % below the critical level' },
    above_critical: { value: 0.05, source: 'from memory: crops seldom respond above the critical level' },
  },
  yield_gain_pct: {
    p: {
      very_low: { value: 20, source: 'from memory: estimate, edit for your region' },
      low: { value: 12, source: 'from memory: estimate, edit for your region' },
      medium: { value: 6, source: 'from memory: estimate, edit for your region' },
      high: { value: 2, source: 'from memory: estimate, edit for your region' },
    },
    k: {
      below_critical: { value: 8, source: 'from memory: estimate; far below the critical level it can be much larger (common practice)' },
      above_critical: { value: 1, source: 'from memory: estimate, edit for your region' },
    },
  },
  soil: {
    p2o5_per_ppm: { value: 18, source: '[published] Canola Watch 2016 (citing AAFC research): 12-40 lb P2O5/ac per 1 ppm Olsen P rise depending on soil; 18 chosen near the low end' },
    k2o_per_ppm: { value: 2.41, source: 'arithmetic: 2 lb/ac per ppm in 0-6 in ([published] Manitoba Agriculture, Soil Fertility Guide) x 1.2046 K to K2O ([published] IUPAC atomic weights)' },
    om_n_lb_per_pct: { value: 14, source: '[published] Canola Watch: about 14 lb N/ac per 1 % organic matter' },
    om_n_available: { value: 0.8, source: '[published] Canola Watch: about 80 % of mineralized N available' },
    fall_nitrate_adjust_lb: { value: 8, source: '[published] Manitoba Agriculture, fertilizer recommendation guidelines based on soil tests: subtract 8 lb/ac from fall-sampled nitrate' },
    legume_credit_lb: { value: 20, source: 'from memory: N credit after a pulse crop, lb N/ac' },
  },
  placement_efficiency: {
    seed_row: { n: 1, p2o5: 1, k2o: 1, s: 1, source: 'common practice: reference placement' },
    side_band: { n: 1, p2o5: 1, k2o: 1, s: 1, source: 'common practice: banded as efficient as seed-placed' },
    mid_row_band: { n: 1, p2o5: 1, k2o: 1, s: 1, source: 'common practice: banded as efficient as seed-placed' },
    broadcast: { n: 1, p2o5: 0.5, k2o: 0.5, s: 1, source: '[published] Manitoba Agriculture, Soil Fertility Guide, Potassium: broadcast potash about half as efficient (K2O 0.5); P2O5 0.5 is from memory; N and S 1 is common practice (incorporated pre-seed)' },
  },
  products: {
    map: { label: 'MAP 11-52-0', n: 11, p2o5: 52, k2o: 0, s: 0, form: 'granular', placements: ['seed_row', 'side_band', 'mid_row_band', 'broadcast'], price_per_tonne: 1100, source: IFA, price_source: PRICE },
    dap: { label: 'DAP 18-46-0', n: 18, p2o5: 46, k2o: 0, s: 0, form: 'granular', placements: ['side_band', 'mid_row_band', 'broadcast'], price_per_tonne: 1050, source: `${IFA}; kept out of the seed row (free ammonia) as common practice`, price_source: PRICE },
    urea: { label: 'urea 46-0-0', n: 46, p2o5: 0, k2o: 0, s: 0, form: 'granular', placements: ['seed_row', 'side_band', 'mid_row_band', 'broadcast'], price_per_tonne: 850, source: IFA, price_source: PRICE },
    ammonium_sulphate: { label: 'ammonium sulphate 21-0-0-24', n: 21, p2o5: 0, k2o: 0, s: 24, form: 'granular', placements: ['seed_row', 'side_band', 'mid_row_band', 'broadcast'], price_per_tonne: 650, source: IFA, price_source: PRICE },
    potash: { label: 'potash (KCl) 0-0-60', n: 0, p2o5: 0, k2o: 60, s: 0, form: 'granular', placements: ['seed_row', 'side_band', 'mid_row_band', 'broadcast'], price_per_tonne: 700, source: IFA, price_source: PRICE },
    uan: { label: 'UAN 28-0-0', n: 28, p2o5: 0, k2o: 0, s: 0, form: 'liquid', density_kg_l: { value: 1.28, source: 'from memory: UAN 28-0-0 weighs about 10.7 lb per US gallon, 1.28 kg/L' }, placements: ['side_band', 'mid_row_band', 'broadcast'], price_per_tonne: 600, source: IFA, price_source: PRICE },
    ammonium_thiosulphate: { label: 'ammonium thiosulphate 12-0-0-26', n: 12, p2o5: 0, k2o: 0, s: 26, form: 'liquid', density_kg_l: { value: 1.33, source: 'from memory: ammonium thiosulphate 12-0-0-26 weighs about 11.1 lb per US gallon, 1.33 kg/L' }, placements: ['side_band', 'mid_row_band'], price_per_tonne: 600, source: 'from memory: 12-0-0-26', price_source: PRICE },
  },
};
