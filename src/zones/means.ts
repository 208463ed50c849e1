/**
 * Area-weighted means of a per-cell value over each zone: the zone's soil values that go through the
 * rate engine (see docs/zones.md, "Where a zone's rate comes from").
 */

/**
 * Mean of `values` over each zone, weighted by `weights` (the grid's fraction, so edge cells count only
 * their inside share). Cells whose value is NaN are left out; a zone with no value gets NaN.
 *
 * @param zoneOfCell per cell: zone id or -1 (ZoneSet.zoneOfCell)
 * @param count number of zones (ZoneSet.zones.length)
 * @example const p = zoneMeans(zs.zoneOfCell, zs.zones.length, surfaces.p, grid.fraction); p[3] // mean P ppm of zone 3
 */
export function zoneMeans(
  zoneOfCell: Int32Array,
  count: number,
  values: ArrayLike<number>,
  weights?: ArrayLike<number>,
): Float64Array {
  const sw = new Float64Array(count),
    sv = new Float64Array(count);
  for (let i = 0; i < zoneOfCell.length; i++) {
    const z = zoneOfCell[i],
      v = values[i];
    if (z < 0 || v !== v) continue;
    const w = weights ? weights[i] : 1;
    if (!(w > 0)) continue;
    sw[z] += w;
    sv[z] += w * v;
  }
  const out = new Float64Array(count);
  for (let z = 0; z < count; z++) out[z] = sw[z] > 0 ? sv[z] / sw[z] : NaN;
  return out;
}
