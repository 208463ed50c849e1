/**
 * How many cases a property test draws: all of them in the full tier (`npm run test:all`, CI), a quarter (at
 * least 3) in the fast tier (`npm test`, TILTH_TIER=fast), which keeps the edit-test loop under a minute. Seeded
 * properties draw the same first cases in both tiers, so the fast tier repeats the start of the full one.
 * @example fc.assert(prop, { numRuns: tierRuns(120), seed: 7 })
 */
export function tierRuns(full: number): number {
  return process.env.TILTH_TIER === 'fast' ? Math.max(3, Math.round(full / 4)) : full;
}
