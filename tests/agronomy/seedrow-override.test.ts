/**
 * A seed-row N override far above the published table is kept but warned (table: Manitoba Agriculture,
 * Seed-Placed Nitrogen Fertilizer, as in the default tables); an override at the table is not.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { decide, defaultTables, parsePlan, parseSoilSpec } from '../../src/agronomy/index.js';
import { ROOT } from '../helpers/cli.js';

const text = readFileSync(join(ROOT, 'sample-fields', 'quarter', 'plan.yaml'), 'utf8');
const withOverride = (v: string) =>
  parsePlan(text.replace(/^ {2}safe_n_lb: null.*$/m, `  safe_n_lb: ${v}`), 'plan.yaml', defaultTables());
const soil = parseSoilSpec('no3=25,p=8,k=140,s=12,om=4,texture=light');

describe('seed-row N override', () => {
  it('60 lb N/ac against the published table: kept, with a plain warning', () => {
    const d = decide(soil, withOverride('60'), defaultTables());
    const w = d.warnings.find((x) => x.code === 'seed-row-override-high');
    expect(w?.message).toMatch(
      /seed-row N 60 lb N\/ac from plan key seed_row\.safe_n_lb is far above the published table's .*can injure or kill seedlings/,
    );
  });
  it('no override, or one near the table: no such warning', () => {
    expect(
      decide(soil, withOverride('null'), defaultTables()).warnings.some(
        (x) => x.code === 'seed-row-override-high',
      ),
    ).toBe(false);
    expect(
      decide(soil, withOverride('5'), defaultTables()).warnings.some(
        (x) => x.code === 'seed-row-override-high',
      ),
    ).toBe(false);
  });
});
