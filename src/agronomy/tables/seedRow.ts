/** Default seed-row urea-N tables (by texture, spread and row spacing) and the dry-seedbed factor. See defaults.ts. */
import type { TablesInput } from './schema.js';

const MB_SEED_N =
  '[published] Manitoba Agriculture, Guidelines for Safely Applying Fertilizer with Seed (urea-N, good-to-excellent seedbed moisture)';
const MB_CANOLA_N = '[published] Manitoba Agriculture, Seed-Placed Nitrogen Fertilizer (canola)';
const MB_CANOLA_N_TABLE =
  '[published] Manitoba Agriculture, Seed-Placed Nitrogen Fertilizer: A Second Opinion Please, Table 1 (urea-N with canola seed, good-to-excellent moisture)';

export const SEED_ROW: Pick<TablesInput, 'seed_row_n' | 'dry_seedbed_factor'> = {
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
};
