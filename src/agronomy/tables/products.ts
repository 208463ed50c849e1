/** Default N efficiency by timing and placement, placement efficiency, and the products. See defaults.ts. */
import type { TablesInput } from './schema.js';

const IFA = '[published] International Fertilizer Association product tables';
const PRICE = "from memory: placeholder price in $ per tonne; replace with your dealer's quote";

export const PRODUCTS: Pick<TablesInput, 'n_relative_efficiency' | 'placement_efficiency' | 'products'> = {
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
