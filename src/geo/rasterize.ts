/**
 * Polygons onto a regular lon/lat grid by cell centres (a scanline per row): the cell takes the polygon
 * that holds its centre. Rows run south to north, as in ISO 11783-10 grids.
 */

/** A lon/lat grid: south-west corner, cell size in degrees, columns and rows (row 0 = south). */
export interface LonLatFrame {
  /** south-west corner of the south-west cell, degrees */
  south: number;
  west: number;
  /** cell size, degrees */
  cellNorth: number;
  cellEast: number;
  cols: number;
  rows: number;
}

/**
 * Index of the polygon holding each cell's centre, -1 for none. Polygons are GeoJSON-style
 * MultiPolygon coordinates ([polygon][ring][point][lon, lat]); holes by the even-odd rule. Where polygons
 * overlap, the later one wins.
 *
 * @param shapes per shape: MultiPolygon coordinates in lon/lat
 * @example rasterizeLonLat([[[[[0,0],[2,0],[2,1],[0,1],[0,0]]]]], { south: 0, west: 0, cellNorth: 1, cellEast: 1, cols: 3, rows: 1 }) // Int32Array [0, 0, -1]
 */
export function rasterizeLonLat(shapes: number[][][][][], f: LonLatFrame): Int32Array {
  const out = new Int32Array(f.cols * f.rows).fill(-1);
  shapes.forEach((polys, si) => {
    const crossings = new Map<number, number[]>();
    for (const poly of polys)
      for (const ring of poly) {
        for (let i = 0; i + 1 < ring.length; i++) {
          const [x1, y1] = ring[i],
            [x2, y2] = ring[i + 1];
          if (y1 === y2) continue;
          const lo = Math.min(y1, y2),
            hi = Math.max(y1, y2);
          // rows whose centre latitude c satisfies lo <= c < hi
          const r0 = Math.max(0, Math.ceil((lo - f.south) / f.cellNorth - 0.5));
          const r1 = Math.min(f.rows - 1, Math.ceil((hi - f.south) / f.cellNorth - 0.5) - 1);
          for (let r = r0; r <= r1; r++) {
            const c = f.south + (r + 0.5) * f.cellNorth;
            if (c < lo || c >= hi) continue;
            const x = x1 + ((c - y1) * (x2 - x1)) / (y2 - y1);
            let list = crossings.get(r);
            if (!list) crossings.set(r, (list = []));
            list.push(x);
          }
        }
      }
    for (const [r, xs] of crossings) {
      xs.sort((a, b) => a - b);
      for (let k = 0; k + 1 < xs.length; k += 2) {
        // columns whose centre longitude lies in [xs[k], xs[k+1])
        const c0 = Math.max(0, Math.ceil((xs[k] - f.west) / f.cellEast - 0.5));
        const c1 = Math.min(f.cols - 1, Math.ceil((xs[k + 1] - f.west) / f.cellEast - 0.5) - 1);
        for (let c = c0; c <= c1; c++) out[r * f.cols + c] = si;
      }
    }
  });
  return out;
}
