/**
 * Zone polygons from a zone raster: shared arcs simplified once, rings rebuilt, zones near the boundary clipped
 * to it; and zone coordinates in lon/lat. See docs/zones.md, "Smooth, shared edges".
 */
import type { Field, Grid, RingsPart } from '../types.js';
import { partsArea } from '../geo/area.js';
import type { Projector } from '../geo/utm.js';
import { arcsToParts, ringsVertexCount, vertexCount, zoneArcs } from './arcs.js';
import { boundaryCells, clipParts } from './clip.js';
import { simplifyArcs } from './simplify.js';

/** Vertices of the zone rings before and after edge simplification (before clipping), and as returned. */
export interface ZoneVertices {
  traced: number;
  simplified: number;
  clipped: number;
}

/**
 * Zone polygons from a zone raster (`cellArea`: each zone's area from its cells, m2): arcs simplified to `tol`
 * cells (0 = staircase), rings rebuilt, zones near the boundary clipped to it. The arcs are simplified as a
 * partition of the raster's cells, and the field boundary cuts through edge cells, so a shortcut can move the
 * in-field part of a zone along the edge into its neighbour; a zone that smoothing takes below half its own area,
 * or below `minAreaM2` although its cells reach it, keeps its staircase borders (simplification is redone with
 * them fixed; after three rounds every border keeps its staircase).
 */
export function zonePolygons(
  grid: Grid,
  field: Field,
  label: Int32Array,
  count: number,
  cellArea: Float64Array,
  tol: number,
  minAreaM2: number,
): { parts: RingsPart[][]; vertices: ZoneVertices; scale: number } {
  const arcs = zoneArcs(label, count, grid);
  const staircase = simplifyArcs(arcs, 0);
  const needsClip = zonesNearBoundary(field, grid, label, count, Math.ceil(tol) + 1);
  const planarField = partsArea(field.parts);
  const scale = planarField > 0 ? field.areaM2 / planarField : 1;
  const keep = new Uint8Array(count);
  for (let attempt = 0; ; attempt++) {
    const smoothing = tol > 0 && attempt < 3;
    const smooth = smoothing ? simplifyArcs(arcs, tol) : staircase;
    const traced = arcsToParts(arcs, smooth, grid);
    const parts = traced.map((p, z) => (needsClip[z] ? clipParts(p, field.parts, grid.xmin, grid.ymax) : p));
    const shrunk = smoothing ? shrunkZones(parts, cellArea, minAreaM2, keep) : [];
    for (const z of shrunk) {
      keep[z] = 1;
      arcs.arcs.forEach((_, k) => {
        if (arcs.left[k] === z || arcs.right[k] === z) arcs.fixed[k] = true;
      });
    }
    if (shrunk.length === 0) {
      const vertices = {
        traced: ringsVertexCount(arcs, staircase),
        simplified: ringsVertexCount(arcs, smooth),
        clipped: parts.reduce((s, p) => s + vertexCount(p), 0),
      };
      return { parts, vertices, scale };
    }
  }
}

/**
 * Zones (not yet kept as staircases) whose smoothed, clipped polygons fall below half their area from cells
 * (tilth's rule: a zone that gives up more than half of itself to its neighbours is no longer where its cells
 * are), or below `minAreaM2` although their cells reach it.
 */
function shrunkZones(
  parts: RingsPart[][],
  cellArea: Float64Array,
  minAreaM2: number,
  keep: Uint8Array,
): number[] {
  const out: number[] = [];
  for (let z = 0; z < parts.length; z++) {
    if (keep[z]) continue;
    const floor = Math.max(cellArea[z] >= minAreaM2 ? minAreaM2 : 0, cellArea[z] / 2);
    if (partsArea(parts[z]) < floor * (1 - 1e-9)) out.push(z);
  }
  return out;
}

/** Zones with a cell within `reach` cells of one the boundary crosses, or of a cell outside: these are clipped. */
function zonesNearBoundary(
  field: Field,
  grid: Grid,
  label: Int32Array,
  count: number,
  reach: number,
): Uint8Array {
  const { cols, rows } = grid;
  const band = boundaryCells(field.parts, grid);
  const out = new Uint8Array(count);
  for (let i = 0; i < label.length; i++) if (label[i] >= 0 && (!grid.mask[i] || band[i])) out[label[i]] = 1;
  // smoothed borders move up to about `reach` cells: zones that near the boundary are clipped too
  for (let r = 0; r < rows; r++)
    for (let c = 0; c < cols; c++) {
      if (!band[r * cols + c]) continue;
      for (let rr = Math.max(0, r - reach); rr <= Math.min(rows - 1, r + reach); rr++) {
        for (let cc = Math.max(0, c - reach); cc <= Math.min(cols - 1, c + reach); cc++) {
          const z = label[rr * cols + cc];
          if (z >= 0) out[z] = 1;
        }
      }
    }
  return out;
}

/**
 * Polygon parts in metres to MultiPolygon lon/lat coordinates.
 * @example toLonLat(zone.parts, projector(field.utm)) // [[[[lon, lat], ...]]]
 */
export function toLonLat(parts: RingsPart[], p: Projector): number[][][][] {
  const ring = (r: Float64Array) => {
    const ll = p.inverse(r);
    const out: number[][] = [];
    for (let i = 0; i + 1 < ll.length; i += 2) out.push([ll[i], ll[i + 1]]);
    return out;
  };
  return parts.map((pt) => [ring(pt.exterior), ...pt.holes.map(ring)]);
}
