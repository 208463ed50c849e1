/** Checks `outside` and `gaps` against the field boundary: no zone reaches outside it, no part of it is in no zone. */
import * as clip from 'polyclip-ts';
import { UserError, isUserError } from '../errors.js';
import { m2ToAc } from '../units/index.js';
import { usableFeatures } from './coords.js';
import {
  bbox,
  boxesMeet,
  fmt,
  frameOf,
  list,
  overlayFailed,
  SLIVER_M2,
  toMetres,
  lineWriter,
  type AddLine,
  type CheckContext,
} from './context.js';
import type { CheckLine } from './types.js';
import { polysArea, ringCentroid, type Poly } from './shape.js';

/**
 * The `outside` and `gaps` lines (skipped without `opts.boundary`). Throws UserError for a boundary that
 * cannot be used.
 * @example
 * checkBoundary(ctx)[1] // a 400 m x 50 m strip in no zone:
 * // { check: 'gaps', status: 'fail', message: '1 part of the field (20011.1 m2, 4.945 ac) ...', zones: ['zone 1', 'zone 2', 'zone 3'] }
 */
export function checkBoundary(ctx: CheckContext): CheckLine[] {
  const { lines, add } = lineWriter();
  const bl = ctx.opts.boundary;
  if (!bl) return skipBoth(add, lines, 'no --boundary given');
  const bp = usableFeatures(bl.features).problems.findIndex(Boolean);
  if (bp >= 0)
    throw new UserError(
      `${bl.label} feature ${bp + 1}: ${usableFeatures([bl.features[bp]!]).problems[0]}. Fix: export the field boundary again.`,
      { file: bl.label, where: `feature ${bp + 1}` },
    );
  const bframe = frameOf(bl);
  if (!ctx.work || bframe.kind === 'planar')
    return skipBoth(add, lines, 'the prescription or the boundary has no known coordinate system');
  if (!ctx.covered) return skipBoth(add, lines, 'the zones could not be merged (see overlap)');
  try {
    const cov = ctx.covered;
    const bpolys = toMetres(bl.features, bframe, ctx.work, ctx.origin)
      .filter((m): m is Poly[] => !!m)
      .flat();
    if (!bpolys.length)
      throw new UserError(
        `${bl.label}: holds no polygon to use as the field boundary. Fix: give the field's boundary polygon.`,
        { file: bl.label },
      );
    const boundary = clip.union(bpolys[0] as clip.Geom, ...(bpolys.slice(1) as clip.Geom[])) as Poly[];
    addOutside(ctx, add, cov, boundary);
    addGaps(ctx, add, cov, boundary);
  } catch (e) {
    if (!lines.some((l) => l.check === 'outside')) overlayFailed(add, 'outside', e, isUserError);
    overlayFailed(add, 'gaps', e, isUserError);
  }
  return lines;
}

function skipBoth(add: AddLine, lines: CheckLine[], why: string): CheckLine[] {
  add('outside', 'skip', why);
  add('gaps', 'skip', why);
  return lines;
}

/** `outside`: the zones' parts beyond the boundary, by zone (slivers left out). */
function addOutside(ctx: CheckContext, add: AddLine, cov: Poly[], boundary: Poly[]): void {
  const out: string[] = [],
    outZones: string[] = [];
  const outsideTotal = cov.length
    ? polysArea(clip.difference(cov as clip.Geom, boundary as clip.Geom) as Poly[])
    : 0;
  if (outsideTotal >= SLIVER_M2)
    ctx.usable.forEach((m, i) => {
      if (!m) return;
      const a = ctx.significant(clip.difference(m as clip.Geom, boundary as clip.Geom) as Poly[], ctx.scale);
      if (a >= SLIVER_M2) {
        out.push(`${ctx.names[i]} (${fmt(a)} m2)`);
        outZones.push(ctx.names[i]);
      }
    });
  if (out.length) add('outside', 'fail', `parts outside the boundary: ${list(out, 8)}`, outZones);
  else add('outside', 'pass', 'every zone lies inside the boundary');
}

/** `gaps`: the parts of the field in no zone, largest first, each with where it lies and the zones beside it. */
function addGaps(ctx: CheckContext, add: AddLine, cov: Poly[], boundary: Poly[]): void {
  const gaps = (cov.length ? clip.difference(boundary as clip.Geom, cov as clip.Geom) : boundary) as Poly[];
  const pieces = gaps
    .map((p) => ({ p, a: polysArea([p]) / ctx.scale }))
    .filter((g) => g.a >= SLIVER_M2 && ctx.significant([g.p], ctx.scale) > 0)
    .sort((a, b) => b.a - a.a);
  if (!pieces.length) return add('gaps', 'pass', 'the zones cover the whole field');
  const beside = (p: Poly) =>
    ctx.usable.map((m, i) => (m && boxesMeet(ctx.boxes[i]!, bbox([p])) ? ctx.names[i] : '')).filter(Boolean);
  const where = pieces.slice(0, 5).map(({ p, a }) => {
    const [cx, cy] = ringCentroid(p[0]);
    const [lon, lat] = ctx.work!.toLonLat(cx + ctx.origin[0], cy + ctx.origin[1]);
    const near = beside(p);
    return `${fmt(a)} m2 near lat ${lat.toFixed(6)}, lon ${lon.toFixed(6)}${near.length ? ` (beside ${list(near, 4)})` : ''}`;
  });
  const total = pieces.reduce((s, g) => s + g.a, 0);
  const near = new Set<string>();
  for (const { p } of pieces)
    ctx.usable.forEach((m, i) => m && boxesMeet(ctx.boxes[i]!, bbox([p])) && near.add(ctx.names[i]));
  add(
    'gaps',
    'fail',
    `${pieces.length} part${pieces.length > 1 ? 's' : ''} of the field (${fmt(total)} m2, ${fmt(m2ToAc(total), 3)} ac) ${pieces.length > 1 ? 'lie' : 'lies'} in no zone and get the terminal's default rate: ${where.join('; ')}`,
    [...near],
  );
}
