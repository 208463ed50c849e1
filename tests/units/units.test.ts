import { describe, expect, it } from 'vitest';
import * as u from '../../src/units/index.js';

describe('units (published conversion values, source beside each)', () => {
  it('P to P2O5 and K to K2O from IUPAC atomic weights', () => {
    // source: IUPAC atomic weights; extension tables print 2.29 and 0.4364
    // the sheet prints 2.2914; from the atomic weights it is 2.29132 (agrees to 3 decimals)
    expect(u.P_TO_P2O5).toBeCloseTo(2.2914, 3);
    expect(u.P_TO_P2O5).toBeCloseTo(141.943 / 61.948, 6);
    expect(1 / u.P_TO_P2O5).toBeCloseTo(0.4364, 4);
    // source: IUPAC atomic weights; K2O x 0.8301 = K
    expect(u.K_TO_K2O).toBeCloseTo(1.2046, 4);
    expect(1 / u.K_TO_K2O).toBeCloseTo(0.8301, 3); // 0.83015 from the atomic weights
    expect(u.pFromP2o5(u.p2o5FromP(13.7))).toBeCloseTo(13.7, 12);
    expect(u.kFromK2o(u.k2oFromK(13.7))).toBeCloseTo(13.7, 12);
  });

  it('lb/ac to kg/ha', () => {
    // source: international yard and pound agreement (1959): 1 lb = 0.45359237 kg, 1 ac = 0.40468564224 ha
    expect(u.LBAC_TO_KGHA).toBeCloseTo(1.12085, 5);
    expect(u.lbacToKgha(100)).toBeCloseTo(112.085, 3);
    expect(u.kghaToLbac(u.lbacToKgha(37))).toBeCloseTo(37, 12);
    expect(u.acToHa(160)).toBeCloseTo(64.7497, 4);
    expect(u.m2ToAc(4046.8564224)).toBeCloseTo(1, 12);
  });

  it('ppm to lb/ac by depth', () => {
    // source: Manitoba Agriculture, Soil Fertility Guide: x2 per 6 in; 0-24 in x8, 6-24 in x6
    expect(u.ppmToLbacFactor(0, 6)).toBe(2);
    expect(u.ppmToLbacFactor(0, 24)).toBe(8);
    expect(u.ppmToLbacFactor(6, 24)).toBe(6);
    // source: common practice: K critical 125 ppm = 250 lb/ac in 0-6 in
    expect(u.ppmToLbac(125, 0, 6)).toBe(250);
    expect(u.lbacToPpm(250, 0, 6)).toBe(125);
    expect(() => u.ppmToLbacFactor(6, 6)).toThrow();
  });

  it('bu/ac to t/ha by bushel weight', () => {
    // source: Canada Grains Council bushel/tonne factors (1999): canola 50, wheat 60, barley 48 lb/bu
    expect(u.BUSHEL_LB.canola).toBe(50);
    expect(u.BUSHEL_LB.wheat).toBe(60);
    expect(u.BUSHEL_LB.barley).toBe(48);
    // arithmetic on the published factors: 50 bu x 50 lb x 0.45359237 kg / 0.40468564224 ha = 2802.1 kg/ha
    expect(u.buacToTha(50, 50)).toBeCloseTo(2.8021, 4);
    // 1 t/ha of wheat is 14.870 bu/ac (60 lb/bu)
    expect(u.thaToBuac(1, 60)).toBeCloseTo(14.8697, 3);
    expect(u.thaToBuac(u.buacToTha(42, 48), 48)).toBeCloseTo(42, 10);
  });
});

describe('library entry', () => {
  it('src/index.ts exports the pipeline (what dist/index.js bundles)', async () => {
    const lib = await import('../../src/index.js');
    for (const name of [
      'prepareInputs',
      'buildPrescription',
      'decide',
      'parsePlan',
      'nutrientSurface',
      'makeZones',
      'writeShapefile',
      'checkPrescription',
      'renderReport',
    ]) {
      expect(typeof (lib as Record<string, unknown>)[name], name).toBe('function');
    }
  });
  it('ISO 11783-10 rate units (DDI 6 mg/m2, DDI 1 mm3/m2) and the US gallon', () => {
    // source: SI prefixes: 1 kg/ha = 1e6 mg / 1e4 m2 = 100 mg/m2; 1 L = 1e6 mm3, so 1 L/ha = 100 mm3/m2
    expect(u.kghaToMgm2(1)).toBe(100);
    expect(u.lhaToMm3m2(1)).toBe(100);
    expect(u.mgm2ToKgha(u.kghaToMgm2(37.5))).toBeCloseTo(37.5, 12);
    // 1 lb/ac = 1.12085 kg/ha (1959 agreement) = 112.085 mg/m2
    expect(u.kghaToMgm2(u.lbacToKgha(1))).toBeCloseTo(112.085, 3);
    // source: NIST Handbook 44 Appendix C: 1 US gal = 3.785411784 L exactly; 10 US gal/ac = 93.54 L/ha
    expect(u.lhaToGalac(93.5396)).toBeCloseTo(10, 4);
    expect(u.kgPerLToMgPerL(1.28)).toBe(1_280_000);
  });
});

describe('machine settings with their unit (speed, swath)', () => {
  it('reads the number with its unit; a plain number only where a unit is implied', () => {
    expect(u.parseSpeed('8mph')).toEqual({ value: 8, unit: 'mph' });
    expect(u.parseSpeed(' 13 km/h ')).toEqual({ value: 13, unit: 'km/h' });
    expect(u.parseSpeed('13KPH')).toEqual({ value: 13, unit: 'km/h' });
    expect(u.parseSpeed('12.5', 'km/h')).toEqual({ value: 12.5, unit: 'km/h' });
    expect(u.parseSpeed(12, 'km/h')).toEqual({ value: 12, unit: 'km/h' });
    expect(u.parseSpeed('12')).toBeUndefined(); // no unit and none implied
    expect(u.parseSpeed(12)).toBeUndefined();
    expect(u.parseSpeed('8 knots')).toBeUndefined();
    expect(u.parseSpeed('-8mph')).toBeUndefined();
    expect(u.parseSpeed('8 mph 2')).toBeUndefined();
    expect(u.parseLength('60ft')).toEqual({ value: 60, unit: 'ft' });
    expect(u.parseLength('18 m')).toEqual({ value: 18, unit: 'm' });
    expect(u.parseLength('18 metres')).toEqual({ value: 18, unit: 'm' });
    expect(u.parseLength('30', 'm')).toEqual({ value: 30, unit: 'm' });
    expect(u.parseLength('60 yd')).toBeUndefined();
  });

  it('converts with the exact international mile and foot', () => {
    // source: international yard and pound agreement (1959): 1 ft = 0.3048 m, 1 mi = 1609.344 m, both exact
    expect(u.lengthM({ value: 60, unit: 'ft' })).toBeCloseTo(18.288, 12);
    expect(u.lengthM({ value: 18, unit: 'm' })).toBe(18);
    expect(u.speedKmh({ value: 5, unit: 'mph' })).toBeCloseTo(8.04672, 12);
    expect(u.speedMs({ value: 5, unit: 'mph' })).toBeCloseTo(2.2352, 12);
    // source: SI: 1 km/h = 1000 m / 3600 s
    expect(u.speedMs({ value: 18, unit: 'km/h' })).toBeCloseTo(5, 12);
    expect(u.kmhToMs(36)).toBeCloseTo(10, 12);
    // source: SI: 1 t = 1000 kg
    expect(u.kgToTonnes(2500)).toBe(2.5);
  });

  it('names a quantity as given, with km/h or m beside mph or ft', () => {
    expect(u.quantityText({ value: 8, unit: 'mph' })).toBe('8 mph (12.9 km/h)');
    expect(u.quantityText({ value: 60, unit: 'ft' })).toBe('60 ft (18.3 m)');
    expect(u.quantityText({ value: 12, unit: 'km/h' })).toBe('12 km/h');
    expect(u.quantityText({ value: 60, unit: 'ft' }, false)).toBe('60 ft');
  });
});
