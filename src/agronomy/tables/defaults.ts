/**
 * The default agronomy tables tilth ships, as data (the bundle carries them; nothing reads a file).
 * Every entry carries `source`, marked as DEVELOPERS.md says:
 * `[published] <publication>`, `common practice`, or `from memory`. A value that no publication we found
 * gives is `missing: true`: the program then asks the user (a plan key) instead of inventing one.
 * Users print these with `tilth tables`, edit them, and pass `--tables my-tables.yaml`.
 */
import type { TablesInput } from '../tables.js';

const MB_SEED_N =
  '[published] Manitoba Agriculture, Guidelines for Safely Applying Fertilizer with Seed (urea-N, good-to-excellent seedbed moisture)';
const MB_CANOLA_N = '[published] Manitoba Agriculture, Seed-Placed Nitrogen Fertilizer (canola)';
const MB_CANOLA_N_TABLE =
  '[published] Manitoba Agriculture, Seed-Placed Nitrogen Fertilizer: A Second Opinion Please, Table 1 (urea-N with canola seed, good-to-excellent moisture)';
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
const CANOLA_K =
  'from memory: canola K classes; canola responds to potash less than cereals, a response likely only well below the critical level (below about 75 ppm, [published] Canola Encyclopedia, Potassium Fertilizer Management; Canola Digest Science Edition 2014)';
const CEREAL_K =
  'from memory: K classes below the critical level about 125 ppm (common practice); banded K2O on deficient cereal soils typically 30-90 lb/ac, seldom over 120';
const seedP = (mb: number, sk: number, skSource = SK_SEED_P_OTHER) => ({
  manitoba: { value: mb, spread_in: 1, rows_in: 7, source: MB_SEED_P },
  saskatchewan: { value: sk, spread_in: 1, rows_in: 9, source: skSource },
});
const NO_NK = {
  value: null,
  source: "common practice: the crop's own K2O rule applies instead (potash alone, at most 15 lb K2O)",
};
const IFA = '[published] International Fertilizer Association product tables';
const PRICE = "from memory: placeholder price in $ per tonne; replace with your dealer's quote";

export const DEFAULT_TABLES: TablesInput = {
  crops: {
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
  },

  seed_row_n: {
    cereal: {
      light: {
        spreads_in: [1, 2, 3],
        rows_in: [6, 9, 12],
        safe_n: [
          [10, 0, 0],
          [20, 15, 10],
          [30, 20, 15],
        ],
        source: MB_SEED_N,
      },
      medium: {
        spreads_in: [1, 2, 3],
        rows_in: [6, 9, 12],
        safe_n: [
          [20, 15, 10],
          [30, 25, 20],
          [40, 30, 25],
        ],
        source: MB_SEED_N,
      },
      heavy: {
        spreads_in: [1, 2, 3],
        rows_in: [6, 9, 12],
        safe_n: [
          [25, 20, 10],
          [40, 30, 25],
          [50, 40, 30],
        ],
        source: MB_SEED_N,
      },
    },
    canola: {
      light: {
        spreads_in: [1, 2, 3],
        rows_in: [6, 9, 12],
        safe_n: [
          [0, 0, 0],
          [10, 0, 0],
          [20, 10, 0],
        ],
        source: MB_CANOLA_N,
      },
      medium: {
        spreads_in: [1, 2, 3],
        rows_in: [6, 9, 12],
        safe_n: [
          [0, 0, null],
          [null, null, null],
          [null, null, null],
        ],
        source: `${MB_CANOLA_N_TABLE}: medium soil, 1 in spread, 0 on 6 and 9 in rows; the other cells were not found in the source read and are missing (asked, never invented). Saskatchewan (Canola Watch 2010) allows 10 lb N/ac at 1 in on 9 in rows`,
      },
      heavy: {
        missing: true,
        source:
          'missing: the heavy-soil cells of the Manitoba canola table were not found in the source read',
      },
    },
    peas: {
      light: { missing: true, source: 'missing: no published seed-row N table found for peas' },
      medium: { missing: true, source: 'missing: no published seed-row N table found for peas' },
      heavy: { missing: true, source: 'missing: no published seed-row N table found for peas' },
    },
  },
  dry_seedbed_factor: {
    value: 0.5,
    source:
      'from memory: halve in a dry seedbed (Manitoba Agriculture says only "lower these in dry seedbeds")',
  },

  p_classes: {
    olsen: [
      {
        name: 'very_low',
        below_ppm: 5,
        response_probability: 1.0,
        source: 'common practice: < 5 ppm Olsen, about 100 % chance of a response',
      },
      {
        name: 'low',
        below_ppm: 10,
        response_probability: 0.75,
        source: 'common practice: 5-10 ppm Olsen, about 75 %',
      },
      {
        name: 'medium',
        below_ppm: 20,
        response_probability: 0.5,
        source: 'common practice: 10-20 ppm Olsen, about 50 % (maintenance range)',
      },
      {
        name: 'high',
        below_ppm: 30,
        response_probability: 0.2,
        source: 'common practice: > 20 ppm Olsen, under 25 % (20 % used); the split at 30 ppm is from memory',
      },
      {
        name: 'very_high',
        below_ppm: null,
        response_probability: 0.1,
        source: 'from memory: 30 ppm Olsen and above, a response seldom seen (10 % used)',
      },
    ],
    kelowna_published_below_ppm: {
      low: {
        value: 17,
        source: '[published] Canola Encyclopedia: low is <= 17 ppm modified Kelowna (<= 10 ppm Olsen)',
      },
    },
  },
  p_class_rates: {
    very_low: {
      rule: 'build_plus_removal',
      source:
        "common practice: build and maintenance on a very low test (crop removal + the plan's build to build_to_ppm over build_years; [published] Canola Watch 2016, Need to know: phosphorus)",
    },
    low: {
      rule: 'build_plus_removal',
      source: 'common practice: build and maintenance on a low test (as very low)',
    },
    medium: {
      rule: 'removal',
      source: 'common practice: crop removal in the maintenance range (10-20 ppm Olsen)',
    },
    high: {
      rule: 'fraction_of_removal',
      fraction: 0.5,
      source: 'from memory: a reduced rate, half of crop removal, on a high test (a slow drawdown)',
    },
    very_high: {
      rule: 'starter_or_none',
      source:
        'common practice: a seed-row starter for crops that are always offered one (canola), otherwise none',
    },
  },
  k_classes: {
    default: [
      { name: 'very_low', below_ppm: 60, response_probability: 0.9, k2o_lb: 80, source: CEREAL_K },
      { name: 'low', below_ppm: 90, response_probability: 0.7, k2o_lb: 60, source: CEREAL_K },
      { name: 'medium', below_ppm: 125, response_probability: 0.4, k2o_lb: 30, source: CEREAL_K },
      {
        name: 'adequate',
        below_ppm: null,
        response_probability: 0.05,
        k2o_lb: 0,
        source:
          'common practice: above about 125 ppm canola, peas and wheat seldom respond (malt barley: see k_responds_above_critical)',
      },
    ],
    canola: [
      { name: 'very_low', below_ppm: 50, response_probability: 0.6, k2o_lb: 60, source: CANOLA_K },
      { name: 'low', below_ppm: 75, response_probability: 0.4, k2o_lb: 40, source: CANOLA_K },
      { name: 'medium', below_ppm: 125, response_probability: 0.15, k2o_lb: 20, source: CANOLA_K },
      {
        name: 'adequate',
        below_ppm: null,
        response_probability: 0.03,
        k2o_lb: 0,
        source: 'common practice: canola seldom responds above the critical level',
      },
    ],
  },
  k_min_useful_lb: {
    value: 20,
    source:
      'from memory: the smallest K2O rate worth a pass and a meter setting (common practice: K rates go by class with a minimum useful rate); a smaller K target is rounded to 0 and the decision says so',
  },
  yield_gain_pct: {
    p: {
      very_low: { value: 20, source: 'from memory: estimate, edit for your region' },
      low: { value: 12, source: 'from memory: estimate, edit for your region' },
      medium: { value: 6, source: 'from memory: estimate, edit for your region' },
      high: { value: 2, source: 'from memory: estimate, edit for your region' },
      very_high: { value: 1, source: 'from memory: estimate, edit for your region' },
    },
    k: {
      very_low: {
        value: 15,
        source: 'from memory: estimate; far below the critical level it can be much larger (common practice)',
      },
      low: { value: 8, source: 'from memory: estimate, edit for your region' },
      medium: { value: 3, source: 'from memory: estimate, edit for your region' },
      adequate: { value: 1, source: 'from memory: estimate, edit for your region' },
    },
  },
  soil: {
    p2o5_per_ppm: {
      value: 18,
      source:
        '[published] Canola Watch 2016 (citing AAFC research): 12-40 lb P2O5/ac per 1 ppm Olsen P rise depending on soil; 18 chosen near the low end',
    },
    om_n_lb_per_pct: {
      value: 14,
      source: '[published] Canola Watch: about 14 lb N/ac per 1 % organic matter',
    },
    om_n_available: { value: 0.8, source: '[published] Canola Watch: about 80 % of mineralized N available' },
    spring_mineralization_lb: {
      value: 8,
      source:
        '[published] Manitoba Agriculture, Fertilizer Recommendation Guidelines Based on Soil Tests, point 3: about 8 lb/ac nitrate-N may mineralize between late-fall sampling and spring seeding (Manitoba deducts it from spring samples; a fall sample is never reduced)',
    },
    legume_credit_lb: { value: 20, source: 'from memory: N credit after a pulse crop, lb N/ac' },
  },
  n_relative_efficiency: {
    reference: {
      timing: 'spring',
      placement: 'band',
      source:
        "tilth default: the N/bu values are available-N figures for N banded at seeding, the usual prairie practice; set spring broadcast to follow Manitoba's tables, which are stated for spring broadcast",
    },
    spring: {
      seed_row: {
        value: 120,
        source: 'common practice: seed-placed N is banded at seeding, rated as a spring band',
      },
      band: {
        value: 120,
        source:
          '[published] Canola Digest, January 2018 (Manitoba relative values, spring broadcast = 100): spring-banded N about 20 % better; Manitoba Agriculture, Soil Fertility Guide, Relative Efficiencies of Nitrogen Applications',
      },
      broadcast: {
        value: 100,
        source:
          '[published] Manitoba Agriculture, Fertilizer Recommendation Guidelines Based on Soil Tests, point 4: the N tables are for spring broadcast, the reference (100) of the relative-efficiency table',
      },
    },
    fall: {
      seed_row: {
        value: 120,
        source: "common practice: the seed row is placed at seeding, in spring, whatever the plan's N timing",
      },
      band: {
        value: 100,
        source:
          '[published] Manitoba Agriculture, Still Lots of N Fertilizer Options when Seeding is Delayed: spring broadcast is rated lower than spring banding but similar to fall banding',
      },
      broadcast: {
        missing: true,
        source:
          'missing: the fall broadcast value of the Manitoba relative-efficiency table was not found in the source read (fall surface N is much less efficient than spring: Canola Digest Science Edition 2017)',
      },
    },
  },
  placement_efficiency: {
    seed_row: {
      p2o5: 1,
      k2o: 1,
      s: 1,
      source: 'common practice: reference placement (N: n_relative_efficiency)',
    },
    side_band: {
      p2o5: 1,
      k2o: 1,
      s: 1,
      source: 'common practice: banded as efficient as seed-placed (N: n_relative_efficiency)',
    },
    mid_row_band: {
      p2o5: 1,
      k2o: 1,
      s: 1,
      source: 'common practice: banded as efficient as seed-placed (N: n_relative_efficiency)',
    },
    broadcast: {
      p2o5: 0.5,
      k2o: 0.5,
      s: 1,
      source:
        '[published] Manitoba Agriculture, Soil Fertility Guide, Potassium: broadcast potash about half as efficient (K2O 0.5); P2O5 0.5 is from memory; S 1 is common practice (incorporated pre-seed); N: n_relative_efficiency',
    },
  },
  products: {
    map: {
      label: 'MAP 11-52-0',
      n: 11,
      p2o5: 52,
      k2o: 0,
      s: 0,
      form: 'granular',
      placements: ['seed_row', 'side_band', 'mid_row_band', 'broadcast'],
      price_per_tonne: 1100,
      seed_row_n: 'within_p_limit',
      source: `${IFA}; with the seed its N is within the P2O5-as-MAP limit ([published] Manitoba Agriculture, Safe Rates of Seed-Placed Phosphorus; Canola Watch 2011)`,
      price_source: PRICE,
    },
    dap: {
      label: 'DAP 18-46-0',
      n: 18,
      p2o5: 46,
      k2o: 0,
      s: 0,
      form: 'granular',
      placements: ['side_band', 'mid_row_band', 'broadcast'],
      price_per_tonne: 1050,
      source: `${IFA}; kept out of the seed row (free ammonia) as common practice`,
      price_source: PRICE,
    },
    urea: {
      label: 'urea 46-0-0',
      n: 46,
      p2o5: 0,
      k2o: 0,
      s: 0,
      form: 'granular',
      placements: ['seed_row', 'side_band', 'mid_row_band', 'broadcast'],
      price_per_tonne: 850,
      source: IFA,
      price_source: PRICE,
    },
    ammonium_sulphate: {
      label: 'ammonium sulphate 21-0-0-24',
      n: 21,
      p2o5: 0,
      k2o: 0,
      s: 24,
      form: 'granular',
      placements: ['seed_row', 'side_band', 'mid_row_band', 'broadcast'],
      price_per_tonne: 650,
      source: IFA,
      price_source: PRICE,
    },
    potash: {
      label: 'potash (KCl) 0-0-60',
      n: 0,
      p2o5: 0,
      k2o: 60,
      s: 0,
      form: 'granular',
      placements: ['seed_row', 'side_band', 'mid_row_band', 'broadcast'],
      price_per_tonne: 700,
      source: IFA,
      price_source: PRICE,
    },
    uan: {
      label: 'UAN 28-0-0',
      n: 28,
      p2o5: 0,
      k2o: 0,
      s: 0,
      form: 'liquid',
      density_kg_l: {
        value: 1.28,
        source: 'from memory: UAN 28-0-0 weighs about 10.7 lb per US gallon, 1.28 kg/L',
      },
      placements: ['side_band', 'mid_row_band', 'broadcast'],
      price_per_tonne: 600,
      source: IFA,
      price_source: PRICE,
    },
    ammonium_thiosulphate: {
      label: 'ammonium thiosulphate 12-0-0-26',
      n: 12,
      p2o5: 0,
      k2o: 0,
      s: 26,
      form: 'liquid',
      density_kg_l: {
        value: 1.33,
        source: 'from memory: ammonium thiosulphate 12-0-0-26 weighs about 11.1 lb per US gallon, 1.33 kg/L',
      },
      placements: ['side_band', 'mid_row_band'],
      price_per_tonne: 600,
      source: 'from memory: 12-0-0-26',
      price_source: PRICE,
    },
  },
};
