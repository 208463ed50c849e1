/** Check `crs`: the layer's coordinate system is known and its coordinates fit it; and the working metres. */
import { UserError } from '../errors.js';
import { arealScale, projector, utmZoneFor, type Projector } from '../geo/utm.js';
import { bboxOf, lonlatLike, type CheckContext, type Frame } from './context.js';
import type { CheckLayer } from './layer.js';

/**
 * Adds the `crs` line. Throws UserError for a layer without a coordinate system when `strict`.
 * @example checkCrs(ctx)
 */
export function checkCrs(ctx: CheckContext): void {
  if (!ctx.layer.crs) {
    if (ctx.opts.strict)
      throw new UserError(
        `${ctx.layer.label}: has no coordinate system (no .prj file beside the .shp). Fix: copy the .prj that belongs to it beside it, or drop --strict to read the coordinates as WGS 84 longitude/latitude.`,
        { file: ctx.layer.label },
      );
    if (ctx.frame.kind === 'lonlat')
      ctx.add(
        'crs',
        'warn',
        'no .prj: coordinates are in longitude/latitude range and are read as WGS 84 (EPSG:4326); add the .prj before loading it in a terminal',
      );
    else
      ctx.add(
        'crs',
        'fail',
        'no .prj and the coordinates are not longitude/latitude: the coordinate system is unknown; measures below use them as metres',
      );
  } else if (ctx.layer.crs.kind === null) {
    ctx.add(
      'crs',
      'fail',
      `coordinate system not recognised (${ctx.layer.crs.label}); tilth knows WGS 84, NAD83 and NAD83(CSRS) longitude/latitude and UTM` +
        (ctx.frame.kind === 'lonlat'
          ? '; read as WGS 84 longitude/latitude'
          : '; measures below use the coordinates as metres'),
    );
  } else if (ctx.frame.kind === 'lonlat' && !lonlatLike(ctx.feats)) {
    ctx.add(
      'crs',
      'fail',
      `${ctx.layer.crs.label} declared but coordinates lie outside longitude -180..180 / latitude -90..90`,
    );
  } else {
    const nad =
      ctx.layer.crs.datum !== 'WGS84'
        ? ` (${ctx.layer.crs.datum} is used as WGS 84; they differ by 1-2 m)`
        : '';
    ctx.add('crs', ctx.layer.crs.datum === 'WGS84' ? 'pass' : 'warn', `${ctx.layer.crs.label}${nad}`);
  }
}

/**
 * The working frame: a UTM projection (the layer's own, or the zone of its centre for lon/lat), the areal scale
 * at the centre and a local origin; planar (file units as metres) when the system is unknown.
 * @example const { work, scale, origin } = workingFrame(layer, frameOf(layer))
 */
export function workingFrame(
  layer: CheckLayer,
  frame: Frame,
): { work: Projector | null; scale: number; origin: [number, number] } {
  const [bx0, by0, bx1, by1] = bboxOf(layer.features);
  let work: Projector | null = null;
  let scale = 1;
  let origin: [number, number] = Number.isFinite(bx0) ? [(bx0 + bx1) / 2, (by0 + by1) / 2] : [0, 0];
  if (frame.kind !== 'planar' && Number.isFinite(bx0)) {
    if (frame.kind === 'utm') {
      work = frame.utmProj;
      const [clon, clat] = work!.toLonLat(origin[0], origin[1]);
      scale = arealScale(work!, clon, clat);
    } else if (lonlatLike(layer.features)) {
      const [clon, clat] = origin;
      work = projector(utmZoneFor(clon, clat));
      scale = arealScale(work, clon, clat);
      origin = work.toMetres(clon, clat);
    }
  }
  return { work, scale, origin };
}
