/**
 * Header recognition as a property: a header composed from a soil value's name (its usual spellings), a unit, a
 * depth, a ratio and a method, in any order and bracketing, reads back as exactly those pieces: a ratio is never a
 * depth, a formula's digits never a depth, a method never a unit. The spellings and units are those labs print
 * (common practice); cm depths and ratios as in prairie lab reports.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { classifyHeader } from '../../src/io/headers.js';

const NAMES: Record<string, string[]> = {
  no3_n: ['NO3-N', 'Nitrate', 'Nitrate-N', 'N', 'NO3'],
  so4_s: ['SO4-S', 'Sulfate', 'Sulphate-S', 'Sulfate-S', 'S'],
  p: ['P', 'Phosphorus', 'Olsen P', 'Bicarb P', 'P (NaHCO3)'],
  k: ['K', 'Potassium', 'Exch K', 'Exch. K'],
  om: ['OM', 'Org Matter', 'O.M.', 'Organic Matter', 'LOI'],
  ph: ['pH', 'Soil pH'],
  ec: ['EC', 'E.C.', 'Soluble Salts'],
};
const UNITS: Record<string, [string, string | null][]> = {
  no3_n: [
    ['ppm', 'ppm'],
    ['mg/kg', 'ppm'],
    ['lb/ac', 'lbac'],
    ['lbs/A', 'lbac'],
    ['kg/ha', 'kgha'],
    ['', null],
  ],
  om: [
    ['%', 'pct'],
    ['', null],
  ],
  ph: [['', null]],
  ec: [
    ['dS/m', 'dsm'],
    ['mmhos/cm', 'dsm'],
    ['', null],
  ],
};
UNITS.so4_s = UNITS.no3_n;
UNITS.p = UNITS.no3_n;
UNITS.k = [...UNITS.no3_n, ['meq/100g', 'meq100g']];
const DEPTHS: [string, [number, number] | null, 'in' | 'cm' | null][] = [
  ['', null, null],
  ['0-6"', [0, 6], 'in'],
  ['6-24 in', [6, 24], 'in'],
  ['0-15 cm', [0, 15], 'cm'],
  ['15-60 cm', [15, 60], 'cm'],
  ['0-24', [0, 24], null],
];
const RATIOS = ['', '(1:2)', '1:1', '1:2 water'];
const METHODS: [string, string | null][] = [
  ['', null],
  ['Olsen', 'olsen'],
  ['(NaHCO3)', 'olsen'],
  ['bicarbonate', 'olsen'],
  ['modified Kelowna', 'kelowna'],
];

describe('header recognition (property)', () => {
  it('name + unit + depth + ratio + method in any order read back as those pieces', () => {
    const arb = fc.constantFrom(...Object.keys(NAMES)).chain((role) =>
      fc.record({
        role: fc.constant(role),
        name: fc.constantFrom(...NAMES[role]),
        unit: fc.constantFrom(...UNITS[role]),
        depth: fc.constantFrom(...DEPTHS),
        ratio: role === 'ph' || role === 'ec' ? fc.constantFrom(...RATIOS) : fc.constant(''),
        method:
          role === 'p' ? fc.constantFrom(...METHODS) : fc.constant(['', null] as [string, string | null]),
        order: fc.shuffledSubarray([0, 1, 2, 3], { minLength: 4, maxLength: 4 }),
        paren: fc.boolean(),
        sep: fc.constantFrom(' ', ' ', '_'),
      }),
    );
    fc.assert(
      fc.property(arb, (h) => {
        const name = h.role === 'p' && h.method[0] && /olsen|bicarb|nahco3/i.test(h.name) ? 'P' : h.name;
        const unit = h.unit[0] && h.paren ? `(${h.unit[0]})` : h.unit[0];
        const extras = [unit, h.depth[0], h.ratio, h.method[0]];
        const header = [name, ...h.order.map((i) => extras[i])]
          .filter(Boolean)
          .join(' ')
          .replace(/ /g, h.sep === '_' && !/[()"/:.]/.test(name + extras.join('')) ? '_' : ' ');
        const r = classifyHeader(header);
        expect(r, header).not.toBeNull();
        expect(r!.role, header).toBe(h.role);
        if (h.role !== 'ph') expect(r!.unit, header).toBe(h.unit[1]);
        expect(r!.depth, header).toEqual(h.depth[1]);
        if (h.depth[1]) expect(r!.depthUnit, header).toBe(h.depth[2]);
        if (h.ratio)
          expect(r!.method, header).toMatch(new RegExp(`^1:${h.ratio.includes('1:1') ? 1 : 2} water`));
        const pm = h.method[1] ?? (/olsen|bicarb|nahco3/i.test(h.name) ? 'olsen' : null);
        if (h.role === 'p') expect(r!.pMethod, header).toBe(pm);
      }),
      { seed: 16, numRuns: 3000 },
    );
  });
});
