/** Check `crs`: the layer's coordinate system is known and its coordinates fit it. */
import { UserError } from '../errors.js';
import { lineWriter, lonlatLike, type CheckContext } from './context.js';
import type { CheckLine } from './types.js';

/**
 * The `crs` line. Throws UserError for a layer without a coordinate system when `strict`.
 * @example
 * checkCrs(ctx) // a GeoJSON naming EPSG:3857 (tests/check/fixtures/crs/in/fail-unknown-crs.geojson):
 * // [{ check: 'crs', status: 'fail', message: 'coordinate system not recognised (urn:ogc:def:crs:EPSG::3857); ...', zones: [] }]
 */
export function checkCrs(ctx: CheckContext): CheckLine[] {
  const { lines, add } = lineWriter();
  if (!ctx.layer.crs) {
    if (ctx.opts.strict)
      throw new UserError(
        `${ctx.layer.label}: has no coordinate system (no .prj file beside the .shp). Fix: copy the .prj that belongs to it beside it, or drop --strict to read the coordinates as WGS 84 longitude/latitude.`,
        { file: ctx.layer.label },
      );
    if (ctx.frame.kind === 'lonlat')
      add(
        'crs',
        'warn',
        'no .prj: coordinates are in longitude/latitude range and are read as WGS 84 (EPSG:4326); add the .prj before loading it in a terminal',
      );
    else
      add(
        'crs',
        'fail',
        'no .prj and the coordinates are not longitude/latitude: the coordinate system is unknown; measures below use them as metres',
      );
  } else if (ctx.layer.crs.kind === null) {
    add(
      'crs',
      'fail',
      `coordinate system not recognised (${ctx.layer.crs.label}); tilth knows WGS 84, NAD83 and NAD83(CSRS) longitude/latitude and UTM` +
        (ctx.frame.kind === 'lonlat'
          ? '; read as WGS 84 longitude/latitude'
          : '; measures below use the coordinates as metres'),
    );
  } else if (ctx.frame.kind === 'lonlat' && !lonlatLike(ctx.feats)) {
    add(
      'crs',
      'fail',
      `${ctx.layer.crs.label} declared but coordinates lie outside longitude -180..180 / latitude -90..90`,
    );
  } else {
    const nad =
      ctx.layer.crs.datum !== 'WGS84'
        ? ` (${ctx.layer.crs.datum} is used as WGS 84; they differ by 1-2 m)`
        : '';
    add('crs', ctx.layer.crs.datum === 'WGS84' ? 'pass' : 'warn', `${ctx.layer.crs.label}${nad}`);
  }
  return lines;
}
