/**
 * `tilth plan init`: a commented starter plan with every key and its default visible.
 */
import { cautionComment } from '../vocabulary.js';
import { lbacToKgha } from '../units/index.js';
import type { Tables } from './tables.js';

const STARTER_YIELD: Record<string, number> = {
  canola: 50,
  wheat: 60,
  barley: 80,
  malt_barley: 80,
  peas: 50,
};
const STARTER_PRICE: Record<string, number> = { canola: 14, wheat: 8, barley: 5, malt_barley: 6, peas: 10 };

/** The plan's strategy section for a crop: every nutrient's method with the numbers it uses. */
function strategySection(crop: string, tables: Tables): string {
  const c = tables.crops[crop]!;
  const s = c.s_floor_lb.value > 0 || crop === 'canola';
  return `strategy:
  n:
    method: mass_balance      # mass_balance | none: (${c.n_per_bu.value} lb N/bu x yield - nitrate - credits) / efficiency
    efficiency: null          # null = relative efficiency by placement and timing (\`tilth tables\`: n_relative_efficiency); a number replaces it
    timing: spring            # spring | fall: when the N outside the seed row goes on (fall is less efficient)
  p:
    method: response_class    # response_class (build + removal on very low/low, removal on medium, half on high, starter or none on very high) | removal | build | none
    build_to_ppm: 15          # build (and very low / low classes): target soil-test P, ppm Olsen
    build_years: 4            # years to get there
    p2o5_per_ppm: null        # build: lb P2O5/ac per ppm rise; null = table (${tables.soil.p2o5_per_ppm.value})
  k:
    method: response_class    # response_class | none: K2O by the crop's K class (critical ${c.k_critical_ppm.value} ppm); below ${tables.k_min_useful_lb.value} lb K2O rounded to 0
  s:
    method: need_or_floor     # need_or_floor | none${s ? ` (floor ${c.s_floor_lb.value} lb S/ac for ${crop})` : ''}
  tolerance_pct: 10           # a target counts as met at (100 - this) % of it; used before adding a product at its minimum rate`;
}

/** The plan's seed_row section for a crop, with what its tables lack said in comments. */
function seedRowSection(crop: string, tables: Tables): string {
  const c = tables.crops[crop]!;
  const group = tables.seed_row_n[c.seed_row_group]!;
  const missing = (['light', 'medium', 'heavy'] as const).filter(
    (t) => 'missing' in group[t] || group[t].safe_n.flat().some((v) => v === null),
  );
  const alone = c.seed_row_k2o_alone.value;
  return `seed_row:
  safe_n_lb: null             # lb N/ac you confirm for the seed row; null = the published table
${
  missing.length
    ? `  # The seed-row urea-N table for ${crop} has no published value for ${missing.join(' and ')} soils
  # (or for some drills). Choose what tilth does there: ask (stop and ask), light_soil_values (use the
  # light-soil values, the lowest tabled), or none_in_seed_row (no urea, UAN or ammonium sulphate with the
  # seed; MAP within its P limit still goes). Confirm this with your agronomist.
  when_table_missing: ${alone ? 'none_in_seed_row' : 'ask'}
`
    : `  when_table_missing: ask     # ask | light_soil_values | none_in_seed_row
`
}  p_guideline: manitoba       # manitoba | saskatchewan: seed-placed P2O5 as MAP (${c.seed_row_p2o5.manitoba.value} | ${c.seed_row_p2o5.saskatchewan.value} lb/ac), lowered for wider rows
${
  alone
    ? `  potash_with_seed: false     # true: potash may go with the seed (at most ${c.seed_row_k2o_max.value} lb K2O/ac) when nothing else goes there
`
    : `  potash_with_seed: false     # canola and peas only; cereals take potash with the seed within the P2O5 + K2O and N + K2O limits
`
}`;
}

/** The plan's products section: MAP with the seed and in the band, urea, ammonium sulphate and potash in the band; 20 lb/ac minimum, 5 lb/ac steps. */
function productsSection(tables: Tables, units: 'lb/ac' | 'kg/ha'): string {
  const r = (lb: number) => (units === 'kg/ha' ? Math.round(lbacToKgha(lb)) : lb);
  return `products:                     # prices $/tonne; rates in ${units} of product; step: rates are multiples of it
                              # min_rate: the smallest rate worth metering; a product goes on at 0 or at least this
  - product: map              # ${tables.products.map?.label ?? 'MAP'}
    price_per_tonne: ${tables.products.map?.price_per_tonne ?? 1100}
    placements: [seed_row, side_band]
    min_rate: ${r(20)}
    max_rate: ${r(200)}
    step: ${r(5)}
  - product: urea
    price_per_tonne: ${tables.products.urea?.price_per_tonne ?? 850}
    placements: [side_band]
    min_rate: ${r(20)}
    max_rate: ${r(400)}
    step: ${r(5)}
  - product: ammonium_sulphate
    price_per_tonne: ${tables.products.ammonium_sulphate?.price_per_tonne ?? 650}
    placements: [side_band]
    min_rate: ${r(20)}
    max_rate: ${r(200)}
    step: ${r(5)}
  - product: potash
    price_per_tonne: ${tables.products.potash?.price_per_tonne ?? 700}
    placements: [seed_row, side_band]
    min_rate: ${r(20)}
    max_rate: ${r(200)}
    step: ${r(5)}`;
}

/**
 * A commented starter plan for a crop, valid as written (parsePlan accepts it).
 * @param crop a key of `tables.crops`
 * @param units rate unit for the plan (default lb/ac)
 * @example planTemplate('canola', defaultTables()).startsWith('# tilth plan') // true
 */
export function planTemplate(crop: string, tables: Tables, units: 'lb/ac' | 'kg/ha' = 'lb/ac'): string {
  const c = tables.crops[crop];
  if (!c) throw new RangeError(`unknown crop ${crop}`);
  const sRow = '[seed_row, side_band]';
  const y = STARTER_YIELD[crop] ?? 50;
  const price = STARTER_PRICE[crop] ?? 10;
  return `# tilth plan: one field, one crop, one season. Generated by \`tilth plan init --crop ${crop}\`.
# Every key below shows its default; the agronomy tables are editable (\`tilth tables\`).
${cautionComment()}
# The implement section sets how much may go with the seed: check it against your drill.

farm: Example Farm            # invented names; use your own
field: Home Quarter
crop: ${crop}                 # allowed: ${Object.keys(tables.crops).join(', ')}
target_yield_bu: ${y}           # bu/ac you realistically expect on this field
crop_price_per_bu: ${price}         # $/bu, a placeholder: use your own; for the expected return of P and K
units: ${units}                # lb/ac | kg/ha: product rates and machine limits below are in these units

soil_test:
  p_method: olsen             # olsen | kelowna (modified Kelowna reads higher; never mix methods)
  nitrate_sampled: spring     # spring | fall: when the nitrate samples were taken; used as read (a fall sample is never reduced)
  kelowna_factor: 1.3         # modified Kelowna reads about this many times Olsen (common practice: 10-50 % higher); scales the P class bounds where none is published
  outliers: keep              # keep | drop: values far from their 6 nearest samples (neighbour outlier test) stay in the maps, named in a warning, or are left out of interpolation (--outliers wins)

credits:                      # N credits added to soil nitrate 0-24 in
  organic_matter: false       # true: ${tables.soil.om_n_lb_per_pct.value} lb N per 1 % OM x ${tables.soil.om_n_available.value} available
  previous_crop_legume: false # true: +${tables.soil.legume_credit_lb.value} lb N/ac (${tables.soil.legume_credit_lb.source})
  other_lb_n: 0               # manure or other known N, lb N/ac
  fall_sample_mineralization: false  # fall sample only: true adds ${tables.soil.spring_mineralization_lb.value} lb N/ac mineralized by spring (${tables.soil.spring_mineralization_lb.source.split(':')[0]})

${strategySection(crop, tables)}

implement:
  opener_spread_in: 1         # width of the seed-and-fertilizer spread, in
  row_spacing_in: 10          # in; seedbed utilization SBU = spread / row spacing x 100
  default_texture: medium     # light | medium | heavy, used where a sample has no texture
  seedbed_moisture: good      # good | dry (dry: safe seed-row N x ${tables.dry_seedbed_factor.value})
  placements: ${sRow}   # seed_row | side_band | mid_row_band | broadcast

${seedRowSection(crop, tables)}
${productsSection(tables, units)}

unsampled_parts: null         # boundary parts more than 1000 m from every sample: null = refuse the build; none = no product there;
                              # or rates in ${units}: { urea: 80, map: { rate: 40, placement: side_band } } (default placement: the first outside the seed row)

machine:                      # each with its unit; older plans' swath_width_ft and speed_mph are still read
  swath_width: 60 ft          # ft or m, e.g. 18 m
  speed: 5 mph                # mph or km/h, e.g. 8 km/h
  rate_change_s: 4            # seconds the controller takes to change rate

surface:
  method: idw                 # idw | kriging | auto (lowest leave-one-out RMSE of IDW and ordinary kriging)
  log: false                  # kriging on logarithms (skewed soil tests), back-transformed to the lognormal mean
  kriging_neighbours: 16

zoning:
  method: jenks               # jenks | quantile | equal | kmeans
  classes: 5
  smoothing_passes: 2
  min_zone_ac: auto           # auto = the larger of swath x distance travelled during a rate change and the field area per grid sample; or acres (lower it knowingly)
  zone_sets: per_product      # per_product | shared
  basis: targets              # targets | response_chance (P2O5, K2O: expected chance of a yield response from kriging; docs/zones.md)
  min_class_difference_pct: 5 # per_product: merge classes whose targets differ by less than this % of the mean (tilth default)
  min_rate_difference: auto   # auto | a rate | { product: rate }: neighbouring zones stay apart only if a product rate differs by at least this and by more than the soil maps' error moves it
  min_rate_difference_pct: 10 # auto: the larger of the product's step and this % of its field mean rate (tilth default)
  simplify_cells: 1           # zone edges smoothed to within this many grid cells (0 = cell staircase); the field boundary stays exact

output:
  shapefile_layout: per_placement   # per_placement | per_product
  short_names: false
  crs: wgs84                  # wgs84 | utm
  max_vertices: null          # null | a number: stop with an error when a zone set would need more polygon vertices
  formats: [shapefile, isoxml]  # shapefile | isoxml (ISO 11783-10 TASKDATA); GeoJSON, zones.csv, summary, report always
  isoxml_grid: false          # true: task data as a grid of rates (GRD type 2) instead of zone polygons
  isoxml_grid_cell_m: null    # grid cell, m; null = half the build's grid cell
`;
}
