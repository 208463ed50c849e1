import { describe, expect, it } from 'vitest';
import { defaultTables, loadTables, tablesToYaml } from '../../src/agronomy/index.js';
import { DEFAULT_TABLES } from '../../src/agronomy/tables/defaults.js';
import { isUserError } from '../../src/errors.js';

/** Every object in the tree that holds a value (value, safe_n, analysis, class) must carry a marked source. */
function walk(o: unknown, path: string, visit: (path: string, node: Record<string, unknown>) => void): void {
  if (Array.isArray(o)) o.forEach((v, i) => walk(v, `${path}[${i}]`, visit));
  else if (o && typeof o === 'object') {
    visit(path, o as Record<string, unknown>);
    for (const [k, v] of Object.entries(o)) walk(v, path ? `${path}.${k}` : k, visit);
  }
}
const MARK = /^(\[published\] \S|common practice|from memory|missing: |arithmetic: )/;

describe('default tables', () => {
  it('every entry carries a source marked as in agronomy.md', () => {
    let entries = 0;
    walk(DEFAULT_TABLES, '', (path, node) => {
      const holdsValue =
        'value' in node ||
        'rule' in node ||
        'safe_n' in node ||
        'missing' in node ||
        'response_probability' in node ||
        ('p2o5' in node && 'label' in node) ||
        ('n' in node && 'k2o' in node && 'form' in node);
      const isEff = path.startsWith('placement_efficiency.') && path.split('.').length === 2;
      if (!holdsValue && !isEff) return;
      entries++;
      expect(typeof node.source, path).toBe('string');
      expect(node.source as string, path).toMatch(MARK);
      if ('price_per_tonne' in node) expect(node.price_source as string, path).toMatch(MARK);
    });
    expect(entries).toBeGreaterThan(100);
  });

  it('ships the published values of the reference sheet', () => {
    const t = defaultTables();
    // [published] International Fertilizer Association product tables
    expect([t.products.map!.n, t.products.map!.p2o5]).toEqual([11, 52]);
    expect([t.products.ammonium_sulphate!.n, t.products.ammonium_sulphate!.s]).toEqual([21, 24]);
    expect(t.products.potash!.k2o).toBe(60);
    // [published] Manitoba Agriculture, Safe Rates of Seed-Placed Phosphorus (as MAP, 1 in spread, 6-7 in rows):
    // cereals 50, canola 20, peas 20; Saskatchewan alongside: 50, 25, 15
    expect(['wheat', 'canola', 'peas'].map((c) => t.crops[c]!.seed_row_p2o5.manitoba.value)).toEqual([
      50, 20, 20,
    ]);
    expect(['wheat', 'canola', 'peas'].map((c) => t.crops[c]!.seed_row_p2o5.saskatchewan.value)).toEqual([
      50, 25, 15,
    ]);
    expect(t.crops.canola!.seed_row_p2o5.manitoba).toMatchObject({ spread_in: 1 });
    // the P2O5 limit is stated as MAP: MAP's N is within it, urea-type N counts against the urea-N table
    expect(t.products.map!.seed_row_n).toBe('within_p_limit');
    for (const k of ['urea', 'ammonium_sulphate', 'uan', 'ammonium_thiosulphate'])
      expect(t.products[k]!.seed_row_n).toBe('counts');
    // [published] Alberta Agriculture potassium guide (older edition): canola and peas 15 lb K2O alone; cereals N + K2O 40
    expect([t.crops.canola!.seed_row_k2o_max.value, t.crops.canola!.seed_row_k2o_alone.value]).toEqual([
      15,
      true,
    ]);
    expect(t.crops.wheat!.seed_row_n_k2o_max.value).toBe(40);
    // [published] Manitoba Agriculture, Seed-Placed Nitrogen Fertilizer: A Second Opinion Please, Table 1:
    // canola medium soil, 1 in spread, 0 on 6 and 9 in rows; the cells not found are null (asked, never invented)
    const med = t.seed_row_n.canola!.medium;
    expect('missing' in med).toBe(false);
    if (!('missing' in med)) {
      expect(med.safe_n[0]!.slice(0, 2)).toEqual([0, 0]);
      expect(med.safe_n.flat().filter((v) => v === null).length).toBe(7);
    }
    expect('missing' in t.seed_row_n.canola!.heavy).toBe(true);
    // [published] Manitoba Agriculture, Fertilizer Recommendation Guidelines Based on Soil Tests: 8 lb/ac mineralizes
    // between fall sampling and spring; Canola Digest 2018: spring band about 20 % above spring broadcast (100)
    expect(t.soil.spring_mineralization_lb.value).toBe(8);
    const eff = t.n_relative_efficiency;
    expect(['spring', 'fall'].map((x) => eff[x as 'spring'].broadcast)).toMatchObject([
      { value: 100 },
      { missing: true },
    ]);
    expect(eff.spring.band).toMatchObject({ value: 120 });
  });

  it('a user file overrides one entry and adds a product; the rest stays default', () => {
    const t = loadTables(
      'crops:\n  canola:\n    n_per_bu: { value: 2.8, source: "our hybrid trials 2025" }\n' +
        'products:\n  esn:\n    { label: "coated urea 44-0-0", n: 44, p2o5: 0, k2o: 0, s: 0, form: granular, placements: [side_band], price_per_tonne: 1000, source: "dealer sheet", price_source: "dealer quote" }\n',
      'my-tables.yaml',
    );
    expect(t.crops.canola!.n_per_bu).toEqual({ value: 2.8, source: 'our hybrid trials 2025' });
    expect(t.crops.canola!.removal_per_bu.p2o5.value).toBe(0.9);
    expect(t.products.esn!.n).toBe(44);
    expect(t.products.map!.p2o5).toBe(52);
  });

  it('the printed YAML loads back to the same tables', () => {
    const t = defaultTables();
    expect(loadTables(tablesToYaml(t), 'x.yaml')).toEqual(t);
  });

  it('errors name the file and the key', () => {
    try {
      loadTables('crops:\n  canola:\n    n_per_bu: { value: -1 }\n', 'my-tables.yaml');
      expect.unreachable();
    } catch (e) {
      expect(isUserError(e)).toBe(true);
      expect((e as Error).message).toContain('my-tables.yaml');
      expect((e as Error).message).toContain('crops.canola.n_per_bu');
    }
    expect(() => loadTables('crops:\n  oats:\n    label: oats\n', 'f.yaml')).toThrow(/crops\.oats/);
    expect(() => loadTables('crops:\n  canola:\n    seed_row_group: lentil\n', 'f.yaml')).toThrow(
      /seed_row_group.*allowed: cereal, canola, peas/,
    );
  });
});
