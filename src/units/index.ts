/**
 * Unit conversions: the one source of truth. Every factor here has its source beside it and in
 * tests/units/units.test.ts.
 */

/** Atomic weights (IUPAC): P 30.974, K 39.098, O 15.999. */
const P = 30.974,
  K = 39.098,
  O = 15.999;

/** P to P2O5 mass factor, about 2.2914 (from atomic weights). */
export const P_TO_P2O5 = (2 * P + 5 * O) / (2 * P);
/** K to K2O mass factor, about 1.2046 (from atomic weights). */
export const K_TO_K2O = (2 * K + O) / (2 * K);

/** 1 lb = 0.45359237 kg exactly; 1 acre = 0.40468564224 ha exactly (1959 agreement). */
export const KG_PER_LB = 0.45359237;
export const HA_PER_AC = 0.40468564224;
export const M2_PER_AC = 4046.8564224;
/** lb/ac to kg/ha, about 1.12085. */
export const LBAC_TO_KGHA = KG_PER_LB / HA_PER_AC;

/** Bushel weights, lb per bushel (Canada Grains Council bushel/tonne factors). */
export const BUSHEL_LB: Readonly<Record<string, number>> = {
  canola: 50,
  wheat: 60,
  peas: 60,
  barley: 48,
  oats: 34,
  flax: 56,
};

/** Element to oxide, e.g. `p2o5FromP(10)` = 22.9 lb P2O5. */
export const p2o5FromP = (p: number): number => p * P_TO_P2O5;
export const pFromP2o5 = (p2o5: number): number => p2o5 / P_TO_P2O5;
export const k2oFromK = (k: number): number => k * K_TO_K2O;
export const kFromK2o = (k2o: number): number => k2o / K_TO_K2O;

/** kg per tonne (metric ton), SI. */
export const KG_PER_TONNE = 1000;
/** kg to tonnes. @example kgToTonnes(2500) // 2.5 */
export const kgToTonnes = (kg: number): number => kg / KG_PER_TONNE;

export const lbacToKgha = (v: number): number => v * LBAC_TO_KGHA;
export const kghaToLbac = (v: number): number => v / LBAC_TO_KGHA;
export const acToHa = (v: number): number => v * HA_PER_AC;
export const haToAc = (v: number): number => v / HA_PER_AC;
export const m2ToAc = (v: number): number => v / M2_PER_AC;
export const m2ToHa = (v: number): number => v / 10000;

/**
 * Factor from ppm to lb/ac for a soil layer of the given thickness in inches:
 * 2 per 6 in of depth (about 2,000,000 lb of soil per acre-6 in). 0-24 in = 8, 6-24 in = 6.
 * @example ppmToLbacFactor(0, 6) // 2
 */
export function ppmToLbacFactor(topIn: number, bottomIn: number): number {
  if (!(bottomIn > topIn) || topIn < 0) throw new RangeError(`bad depth interval ${topIn}-${bottomIn} in`);
  return (2 * (bottomIn - topIn)) / 6;
}
/** ppm in a layer to lb/ac. @example ppmToLbac(10, 0, 6) // 20 */
export const ppmToLbac = (ppm: number, topIn: number, bottomIn: number): number =>
  ppm * ppmToLbacFactor(topIn, bottomIn);
/** lb/ac in a layer to ppm. @example lbacToPpm(250, 0, 6) // 125 */
export const lbacToPpm = (lbac: number, topIn: number, bottomIn: number): number =>
  lbac / ppmToLbacFactor(topIn, bottomIn);

/**
 * Yield in bu/ac to t/ha, given the crop's bushel weight in lb.
 * @example buacToTha(50, 50) // canola: 50 bu/ac = 2.80 t/ha
 */
export function buacToTha(buPerAc: number, lbPerBu: number): number {
  return (buPerAc * lbPerBu * KG_PER_LB) / 1000 / HA_PER_AC;
}
export function thaToBuac(tPerHa: number, lbPerBu: number): number {
  return (tPerHa * 1000 * HA_PER_AC) / (lbPerBu * KG_PER_LB);
}

/**
 * Exchangeable K in meq/100 g (= cmol(+)/kg) to ppm (mg/kg): x 390.98 (K 39.098 g/mol, one charge; 1 meq/100 g =
 * 10 mmol(+)/kg). @example kMeqToPpm(0.5) // 195.49
 */
export const kMeqToPpm = (meq: number): number => meq * K * 10;
/** Electrical conductivity µS/cm to dS/m (1 dS/m = 1 mS/cm = 1 mmho/cm = 1000 µS/cm). @example uscmToDsm(850) // 0.85 */
export const uscmToDsm = (v: number): number => v / 1000;

/** Rate units the plan may ask for. */
export type RateUnit = 'lb/ac' | 'kg/ha';
/** Converts a rate held in lb/ac into the requested unit. */
export const rateIn = (lbac: number, unit: RateUnit): number => (unit === 'kg/ha' ? lbacToKgha(lbac) : lbac);

/** Metres per international foot, exact by definition [published] international yard and pound agreement (1959). */
export const M_PER_FT = 0.3048;
export const mToFt = (m: number): number => m / M_PER_FT;

/** Metres per international mile (5280 ft), exact by definition [published] international yard and pound agreement (1959). */
export const M_PER_MI = 1609.344;
/** Miles per hour to metres per second. */
export const mphToMs = (mph: number): number => (mph * M_PER_MI) / 3600;
/** Kilometres per hour to metres per second (1 km/h = 1000 m / 3600 s). @example kmhToMs(18) // 5 */
export const kmhToMs = (kmh: number): number => kmh / 3.6;

/**
 * ISO 11783-10 process data units. DDI 6 (setpoint mass per area) counts mg/m2 and DDI 1 (setpoint
 * volume per area) mm3/m2, both with resolution 1 [published] ISO 11783-11 data dictionary.
 * 1 kg/ha = 10^6 mg / 10^4 m2 = 100 mg/m2; 1 L/ha = 10^6 mm3 / 10^4 m2 = 100 mm3/m2 (SI prefixes).
 */
export const MGM2_PER_KGHA = 100;
export const MM3M2_PER_LHA = 100;
/** kg/ha to mg/m2 (DDI 6). @example kghaToMgm2(112.085) // 11208.5 */
export const kghaToMgm2 = (v: number): number => v * MGM2_PER_KGHA;
export const mgm2ToKgha = (v: number): number => v / MGM2_PER_KGHA;
/** L/ha to mm3/m2 (DDI 1). @example lhaToMm3m2(50) // 5000 */
export const lhaToMm3m2 = (v: number): number => v * MM3M2_PER_LHA;
export const mm3m2ToLha = (v: number): number => v / MM3M2_PER_LHA;
/** Product mass per area (kg/ha) to volume per area (L/ha) for a liquid of the given density (kg/L). */
export const kghaToLha = (kgha: number, densityKgPerL: number): number => kgha / densityKgPerL;
/** Density kg/L to the ISO 11783-10 product density unit mg/L (PDT DensityMassPerVolume). */
export const kgPerLToMgPerL = (v: number): number => v * 1e6;
/** Litres per US gallon, exact by definition (231 cubic inches) [published] NIST Handbook 44, Appendix C. */
export const L_PER_US_GAL = 3.785411784;
/** L/ha to US gal/ac. @example lhaToGalac(93.54) // ~10 */
export const lhaToGalac = (v: number): number => (v / L_PER_US_GAL) * HA_PER_AC;

/** Speed units tilth reads: kilometres or (international) miles per hour. */
export type SpeedUnit = 'km/h' | 'mph';
/** Length units tilth reads for a swath: metres or (international) feet. */
export type LengthUnit = 'm' | 'ft';
/** A speed as given, with its unit (convert with {@link speedMs}). */
export interface Speed {
  value: number;
  unit: SpeedUnit;
}
/** A length as given, with its unit (convert with {@link lengthM}). */
export interface Length {
  value: number;
  unit: LengthUnit;
}

const SPEED_NAMES: Record<string, SpeedUnit> = {
  'km/h': 'km/h',
  kmh: 'km/h',
  kph: 'km/h',
  'km/hr': 'km/h',
  mph: 'mph',
  'mi/h': 'mph',
};
const LENGTH_NAMES: Record<string, LengthUnit> = {
  m: 'm',
  metre: 'm',
  metres: 'm',
  meter: 'm',
  meters: 'm',
  ft: 'ft',
  feet: 'ft',
  foot: 'ft',
};

/** "8mph", "8 mph", "13 km/h", or a plain number in `plain`; undefined when it is none of these. */
function parseQuantity<U extends string>(
  text: string | number,
  names: Record<string, U>,
  plain: U | undefined,
): { value: number; unit: U } | undefined {
  if (typeof text === 'number')
    return plain && Number.isFinite(text) ? { value: text, unit: plain } : undefined;
  const m = /^\s*([0-9]+(?:\.[0-9]*)?|\.[0-9]+)\s*([A-Za-z/]*)\s*$/.exec(text);
  if (!m) return undefined;
  const value = Number(m[1]);
  const unit = m[2] ? names[m[2].toLowerCase()] : plain;
  return unit && Number.isFinite(value) ? { value, unit } : undefined;
}

/**
 * Reads a speed with its unit: "8mph", "8 mph", "13km/h", "13 kph". A plain number (or number text) is in
 * `plain`; without `plain` a unit is required. Undefined when the text is not a speed.
 * @example parseSpeed('8mph') // { value: 8, unit: 'mph' }; parseSpeed('12', 'km/h') // { value: 12, unit: 'km/h' }
 */
export function parseSpeed(text: string | number, plain?: SpeedUnit): Speed | undefined {
  return parseQuantity(text, SPEED_NAMES, plain);
}

/**
 * Reads a length with its unit: "60ft", "60 ft", "18m", "18 metres". A plain number (or number text) is in
 * `plain`; without `plain` a unit is required. Undefined when the text is not a length.
 * @example parseLength('60ft') // { value: 60, unit: 'ft' }; parseLength('18', 'm') // { value: 18, unit: 'm' }
 */
export function parseLength(text: string | number, plain?: LengthUnit): Length | undefined {
  return parseQuantity(text, LENGTH_NAMES, plain);
}

/** A speed in m/s. @example speedMs({ value: 18, unit: 'km/h' }) // 5 */
export const speedMs = (s: Speed): number => (s.unit === 'mph' ? mphToMs(s.value) : kmhToMs(s.value));
/** A speed in km/h. @example speedKmh({ value: 5, unit: 'mph' }) // 8.04672 */
export const speedKmh = (s: Speed): number => (s.unit === 'mph' ? (s.value * M_PER_MI) / 1000 : s.value);
/** A length in metres. @example lengthM({ value: 60, unit: 'ft' }) // 18.288 */
export const lengthM = (l: Length): number => (l.unit === 'ft' ? l.value * M_PER_FT : l.value);

/**
 * A speed or length as given, with the metric value beside one given in mph or ft.
 * @example quantityText({ value: 8, unit: 'mph' }) // '8 mph (12.9 km/h)'; quantityText({ value: 18, unit: 'm' }) // '18 m'
 */
export function quantityText(q: Speed | Length, metric = true): string {
  const given = `${q.value} ${q.unit}`;
  if (!metric || q.unit === 'km/h' || q.unit === 'm') return given;
  return q.unit === 'mph'
    ? `${given} (${speedKmh(q as Speed).toFixed(1)} km/h)`
    : `${given} (${lengthM(q as Length).toFixed(1)} m)`;
}
