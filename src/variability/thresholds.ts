/**
 * Default response thresholds ("low" means below) per analyte, each with its source as marked in the project's
 * agronomy reference (see docs/variability.md). Every value is a default the user can replace (--threshold);
 * none is a recommendation by itself.
 */
import type { Analyte, PMethod } from '../types.js';

export interface Threshold {
  value: number;
  /** true when the value itself counts as low (the source says "<= value"); default: only below it */
  inclusive?: boolean;
  unit: string;
  source: string;
}

/**
 * The default threshold for an analyte, or null where tilth has none (nitrate-N is judged by a mass balance,
 * not a threshold; organic matter and pH have no response threshold here).
 * @example defaultThreshold('so4_s') // { value: 20, unit: 'lb S/ac 0-24 in', ... }
 */
export function defaultThreshold(analyte: Analyte, pMethod: PMethod = 'olsen'): Threshold | null {
  switch (analyte) {
    case 'so4_s':
      return {
        value: 20,
        unit: 'lb S/ac 0-24 in',
        source:
          '[published] Canola Council of Canada, Canola Encyclopedia, Sulphur Fertilizer Management: canola responded where sulphate-S to 60 cm was below 20-30 lb/ac; tilth takes the lower end as "low" and reports 20-30 as marginal',
      };
    case 'p':
      return pMethod === 'olsen'
        ? {
            value: 10,
            inclusive: true,
            unit: 'ppm Olsen P 0-6 in',
            source: '[published] Canola Council of Canada, Canola Encyclopedia: "low" is <= 10 ppm Olsen P',
          }
        : {
            value: 17,
            inclusive: true,
            unit: 'ppm modified Kelowna P 0-6 in',
            source:
              '[published] Canola Council of Canada, Canola Encyclopedia: "low" is <= 17 ppm modified Kelowna P',
          };
    case 'k':
      return {
        value: 125,
        unit: 'ppm K 0-6 in',
        source: 'common practice: critical level about 125 ppm ammonium acetate K',
      };
    default:
      return null;
  }
}

/** Upper end of the marginal sulphate band, lb S/ac 0-24 in ([published] Canola Encyclopedia: below 20-30 lb/ac). */
export const S_MARGINAL_UPPER = 30;

/** Default sulphate-S floor for canola, lb S/ac, applied regardless of the soil test (common practice;
 * [published] Canola Encyclopedia: 10-20 lb S/ac whatever the test). */
export const S_FLOOR_DEFAULT = 10;
