/**
 * The classes every chance map shares (the report's and the variability study's): limits in chance 0..1,
 * labels in %, and colours, light (unlikely) to dark (likely) on magma as the response-chance maps.
 */
import { classColours } from './colour.js';

/** Class limits of the chance maps' legends (chance 0..1): under 10 %, 10-25, 25-50, 50-75, 75-90, 90 % or more. */
export const CHANCE_BREAKS: readonly number[] = [0.1, 0.25, 0.5, 0.75, 0.9];

/**
 * The chance classes' labels in %, lowest first.
 * @example chanceClassLabels() // ['under 10 %', '10-25 %', '25-50 %', '50-75 %', '75-90 %', '90 % or more']
 */
export function chanceClassLabels(): string[] {
  const p = CHANCE_BREAKS.map((b) => Math.round(100 * b));
  return [`under ${p[0]} %`, ...p.slice(1).map((b, i) => `${p[i]}-${b} %`), `${p[p.length - 1]} % or more`];
}

/**
 * The chance classes' colours, lowest chance first: magma, light (unlikely) to dark (likely), as the report's
 * response-chance maps.
 */
export function chanceColours(): string[] {
  return classColours('magma', CHANCE_BREAKS.length + 1).reverse();
}

/** The chance class of a value 0..1 (0 = lowest), -1 for NaN. */
export function chanceClass(p: number): number {
  if (!Number.isFinite(p)) return -1;
  let c = 0;
  while (c < CHANCE_BREAKS.length && p >= CHANCE_BREAKS[c]) c++;
  return c;
}
