/** Default soil-test tables: P and K classes and rates, yield gain by class, soil constants and N credits. See defaults.ts. */
import type { TablesInput } from './schema.js';

const CANOLA_K =
  'from memory: canola K classes; canola responds to potash less than cereals, a response likely only well below the critical level (below about 75 ppm, [published] Canola Encyclopedia, Potassium Fertilizer Management; Canola Digest Science Edition 2014)';
const CEREAL_K =
  'from memory: K classes below the critical level about 125 ppm (common practice); banded K2O on deficient cereal soils typically 30-90 lb/ac, seldom over 120';

export const SOIL_TESTS: Pick<
  TablesInput,
  'p_classes' | 'p_class_rates' | 'k_classes' | 'k_min_useful_lb' | 'yield_gain_pct' | 'soil'
> = {
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
};
