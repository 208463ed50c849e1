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
