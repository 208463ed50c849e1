/**
 * Check `overlap`: no two zones overlap. When the zones' areas add up to their union's, nothing overlaps and the
 * pairwise search (the slow part) is skipped.
 */
import * as clip from 'polyclip-ts';
import { isUserError } from '../errors.js';
import { boxesMeet, fmt, lineWriter, list, overlayFailed, SLIVER_M2, type CheckContext } from './context.js';
import type { CheckLine } from './types.js';
import { polysArea, type Poly } from './shape.js';

/**
 * The `overlap` line, and the union of the usable zones (null when the overlay failed).
 * @example
 * checkOverlap(ctx).lines // zone 3 reaching 50 m into zone 2:
 * // [{ check: 'overlap', status: 'fail', message: 'zones overlap, ...: zone 2 & zone 3 (20011.1 m2)', zones: ['zone 2', 'zone 3'] }]
 */
export function checkOverlap(ctx: CheckContext): { lines: CheckLine[]; covered: Poly[] | null } {
  const { lines, add } = lineWriter();
  let covered: Poly[] | null = null;
  const ok = ctx.usable.filter((m): m is Poly[] => !!m);
  try {
    covered = ok.length ? (clip.union(ok[0] as clip.Geom, ...(ok.slice(1) as clip.Geom[])) as Poly[]) : [];
    const overlapTotal = ok.reduce((s, m) => s + polysArea(m), 0) - polysArea(covered);
    const pairs: string[] = [],
      overlapZones = new Set<string>();
    if (overlapTotal >= SLIVER_M2)
      for (let i = 0; i < ctx.usable.length; i++)
        for (let j = i + 1; j < ctx.usable.length; j++) {
          if (!ctx.usable[i] || !ctx.usable[j] || !boxesMeet(ctx.boxes[i]!, ctx.boxes[j]!)) continue;
          const a = ctx.significant(
            clip.intersection(ctx.usable[i]! as clip.Geom, ctx.usable[j]! as clip.Geom) as Poly[],
            ctx.scale,
          );
          if (a >= SLIVER_M2) {
            pairs.push(`${ctx.names[i]} & ${ctx.names[j]} (${fmt(a)} m2)`);
            overlapZones.add(ctx.names[i]);
            overlapZones.add(ctx.names[j]);
          }
        }
    if (pairs.length)
      add('overlap', 'fail', `zones overlap, the controller would pick one rate: ${list(pairs, 8)}`, [
        ...overlapZones,
      ]);
    else add('overlap', 'pass', 'no zones overlap');
  } catch (e) {
    overlayFailed(add, 'overlap', e, isUserError);
  }
  return { lines, covered };
}
