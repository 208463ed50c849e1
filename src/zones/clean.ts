/**
 * Cleaning a class raster: 3 x 3 majority filter, 4-connected zones, and merging zones smaller than a
 * minimum area into the neighbour sharing the longest border. Rasters are row-major, north-up,
 * Int16Array classes with -1 = no class.
 */
import { kmhToMs, M2_PER_AC } from '../units/index.js';

/**
 * Smallest zone an applicator can follow, m2: swath width x the distance travelled during one rate
 * change (speed x `changeSeconds`, 4 s by default, common practice), or `floorAc` (0.5 ac by default),
 * whichever is larger.
 *
 * @param swathM implement swath width, m
 * @param speedKmh travel speed, km/h
 * @example minZoneAreaM2({ swathM: 18.3, speedKmh: 8 }) // max(18.3 x 8.89, 2023.4) = 2023.4 m2 (0.5 ac)
 */
export function minZoneAreaM2(opts: {
  swathM: number;
  speedKmh: number;
  changeSeconds?: number;
  floorAc?: number;
}): number {
  const { swathM, speedKmh } = opts;
  if (!(swathM > 0) || !(speedKmh > 0))
    throw new RangeError(`swath (${swathM} m) and speed (${speedKmh} km/h) must be positive`);
  const travel = kmhToMs(speedKmh) * (opts.changeSeconds ?? 4);
  return Math.max(swathM * travel, (opts.floorAc ?? 0.5) * M2_PER_AC);
}

/**
 * 3 x 3 majority filter: each classed cell takes the most frequent class among itself and its classed
 * neighbours (8-neighbourhood); on a tie it keeps its own class when that is among the most frequent,
 * else the lowest tied class. Unclassed cells (-1) stay unclassed and are not counted.
 * @param iterations passes; default 1
 * @example const smooth = majorityFilter(c.classOf, grid.cols, grid.rows, 2);
 */
export function majorityFilter(classes: Int16Array, cols: number, rows: number, iterations = 1): Int16Array {
  let src = classes;
  let nc = 0;
  for (let i = 0; i < src.length; i++) if (src[i] + 1 > nc) nc = src[i] + 1;
  const counts = new Int32Array(Math.max(1, nc));
  for (let it = 0; it < iterations; it++) {
    const dst = new Int16Array(src.length);
    let changed = false;
    for (let r = 0; r < rows; r++) {
      const r0 = r > 0 ? r - 1 : r,
        r1 = r < rows - 1 ? r + 1 : r;
      // the class of the previous cell of the row when its whole window held only that class (or
      // unclassed cells), else -2: a cell of that class then needs only its window's new column checked
      let run = -2;
      for (let c = 0; c < cols; c++) {
        const i = r * cols + c,
          own = src[i];
        if (own < 0) {
          dst[i] = own;
          run = -2;
          continue;
        }
        const c0 = c > 0 ? c - 1 : c,
          c1 = c < cols - 1 ? c + 1 : c;
        // fast path: all neighbours equal to own
        let same = true;
        const from = run === own ? (c1 > c ? c1 : c1 + 1) : c0;
        for (let rr = r0; rr <= r1 && same; rr++)
          for (let cc = from; cc <= c1; cc++) {
            const v = src[rr * cols + cc];
            if (v !== own && v >= 0) {
              same = false;
              break;
            }
          }
        if (same) {
          dst[i] = own;
          run = own;
          continue;
        }
        run = -2;
        counts.fill(0);
        for (let rr = r0; rr <= r1; rr++)
          for (let cc = c0; cc <= c1; cc++) {
            const v = src[rr * cols + cc];
            if (v >= 0) counts[v]++;
          }
        let best = own,
          bc = counts[own];
        for (let k = 0; k < nc; k++)
          if (counts[k] > bc) {
            bc = counts[k];
            best = k;
          }
        dst[i] = best;
        if (best !== own) changed = true;
      }
    }
    src = dst;
    if (!changed) break;
  }
  return src === classes ? Int16Array.from(classes) : src;
}

/**
 * Labels 4-connected components of equal class. Returns per cell a label 0..count-1 (-1 where unclassed)
 * and each label's class. Linear time (scan + union-find).
 * @example const { label, count, classOfLabel } = labelComponents(classes, cols, rows);
 */
export function labelComponents(
  classes: Int16Array,
  cols: number,
  rows: number,
): { label: Int32Array; count: number; classOfLabel: Int16Array } {
  const n = classes.length;
  const parent = new Int32Array(n);
  const find = (x: number) => {
    while (parent[x] !== x) {
      parent[x] = parent[parent[x]];
      x = parent[x];
    }
    return x;
  };
  for (let i = 0; i < n; i++) parent[i] = i;
  for (let r = 0; r < rows; r++) {
    for (let c = 0; c < cols; c++) {
      const i = r * cols + c,
        k = classes[i];
      if (k < 0) continue;
      if (c > 0 && classes[i - 1] === k) {
        const a = find(i),
          b = find(i - 1);
        if (a !== b) parent[a < b ? b : a] = a < b ? a : b;
      }
      if (r > 0 && classes[i - cols] === k) {
        const a = find(i),
          b = find(i - cols);
        if (a !== b) parent[a < b ? b : a] = a < b ? a : b;
      }
    }
  }
  const label = new Int32Array(n).fill(-1);
  const cls: number[] = [];
  for (let i = 0; i < n; i++) {
    if (classes[i] < 0) continue;
    const root = find(i);
    if (root === i) {
      label[i] = cls.length;
      cls.push(classes[i]);
    } else label[i] = label[root];
  }
  return { label, count: cls.length, classOfLabel: Int16Array.from(cls) };
}

/**
 * Gives every unclassed cell of the grid the class of its nearest classed cell (4-connected breadth-first
 * growth), so traced zones cover cells whose centre is outside the field but part of whose area is
 * inside; clipping to the boundary then trims them. Returns a new raster.
 * @example const filled = fillUnclassed(smooth, grid.cols, grid.rows);
 */
export function fillUnclassed(classes: Int16Array, cols: number, rows: number): Int16Array {
  const out = Int16Array.from(classes);
  const n = out.length;
  // start from classed cells that touch an unclassed one (a thin ring, not every cell)
  let front: Int32Array = new Int32Array(1024),
    len = 0;
  const push = (arr: Int32Array, l: number, i: number): Int32Array => {
    if (l === arr.length) {
      const b = new Int32Array(arr.length * 2);
      b.set(arr);
      arr = b;
    }
    arr[l] = i;
    return arr;
  };
  let any = false;
  for (let i = 0; i < n; i++) {
    if (out[i] < 0) continue;
    any = true;
    const r = (i / cols) | 0,
      c = i - r * cols;
    if (
      (c > 0 && out[i - 1] < 0) ||
      (c < cols - 1 && out[i + 1] < 0) ||
      (r > 0 && out[i - cols] < 0) ||
      (r < rows - 1 && out[i + cols] < 0)
    )
      front = push(front, len++, i);
  }
  if (!any) return out;
  let next: Int32Array = new Int32Array(1024);
  while (len > 0) {
    let nl = 0;
    for (let t = 0; t < len; t++) {
      const i = front[t],
        r = (i / cols) | 0,
        c = i - r * cols,
        k = out[i];
      if (c > 0 && out[i - 1] < 0) {
        out[i - 1] = k;
        next = push(next, nl++, i - 1);
      }
      if (c < cols - 1 && out[i + 1] < 0) {
        out[i + 1] = k;
        next = push(next, nl++, i + 1);
      }
      if (r > 0 && out[i - cols] < 0) {
        out[i - cols] = k;
        next = push(next, nl++, i - cols);
      }
      if (r < rows - 1 && out[i + cols] < 0) {
        out[i + cols] = k;
        next = push(next, nl++, i + cols);
      }
    }
    const tmp = front;
    front = next;
    next = tmp;
    len = nl;
  }
  return out;
}

/** Result of merging small zones. */
export interface Merged {
  /** per cell: zone id 0..count-1, -1 where unclassed */
  zone: Int32Array;
  count: number;
  /** per zone: its class */
  classOfZone: Int16Array;
  /** per zone: area m2 from cell fractions */
  areaM2: Float64Array;
  /** per cell: class after merging */
  classes: Int16Array;
}

/**
 * Merges every zone (4-connected component of one class) smaller than `minAreaM2` into the neighbouring
 * zone that shares the longest border with it (counted in cell edges), smallest zones first, repeating
 * until none is left that has a neighbour. A merged zone that comes to touch another zone of its new
 * class is joined with it. Areas come from `fraction` x cell^2, so edge cells count only their inside share.
 * Zones with no neighbour (an isolated part of the field) are kept whatever their size.
 *
 * @example const m = mergeSmallZones(classes, grid.cols, grid.rows, grid.fraction, grid.cell, 2023);
 */
export function mergeSmallZones(
  classes: Int16Array,
  cols: number,
  rows: number,
  fraction: ArrayLike<number>,
  cell: number,
  minAreaM2: number,
): Merged {
  const { label, count, classOfLabel } = labelComponents(classes, cols, rows);
  const area = new Float64Array(count);
  const cellA = cell * cell;
  for (let i = 0; i < label.length; i++) if (label[i] >= 0) area[label[i]] += fraction[i] * cellA;
  const adj = smallZoneBorders(label, cols, rows, area, minAreaM2);
  const u = new ZoneUnion(Int16Array.from(classOfLabel), area, adj);
  if (minAreaM2 > 0) mergeSmall(u, minAreaM2);
  return relabel(label, u);
}

/**
 * Border lengths (in cell edges) between touching zones, kept only for pairs with at least one zone under the
 * minimum: a zone at or above the minimum never has to choose a neighbour, and two large zones of one class are
 * never adjacent.
 */
function smallZoneBorders(
  label: Int32Array,
  cols: number,
  rows: number,
  area: Float64Array,
  minAreaM2: number,
): Map<number, number>[] {
  const count = area.length;
  const isSmall = new Uint8Array(count);
  for (let z = 0; z < count; z++) if (area[z] < minAreaM2) isSmall[z] = 1;
  const adj: Map<number, number>[] = Array.from({ length: count }, () => new Map());
  const addEdge = (a: number, b: number) => {
    if (!isSmall[a] && !isSmall[b]) return;
    adj[a].set(b, (adj[a].get(b) ?? 0) + 1);
    adj[b].set(a, (adj[b].get(a) ?? 0) + 1);
  };
  for (let r = 0; r < rows; r++) {
    for (let c = 0; c < cols; c++) {
      const i = r * cols + c,
        a = label[i];
      if (a < 0) continue;
      if (c + 1 < cols) {
        const b = label[i + 1];
        if (b >= 0 && b !== a) addEdge(a, b);
      }
      if (r + 1 < rows) {
        const b = label[i + cols];
        if (b >= 0 && b !== a) addEdge(a, b);
      }
    }
  }
  return adj;
}

/** Zones being merged: union-find over zone ids, with each root's class, area and borders to other roots. */
class ZoneUnion {
  readonly parent: Int32Array;
  constructor(
    readonly cls: Int16Array,
    readonly area: Float64Array,
    readonly adj: Map<number, number>[],
  ) {
    this.parent = Int32Array.from({ length: area.length }, (_, i) => i);
  }

  find(x: number): number {
    const parent = this.parent;
    while (parent[x] !== x) {
      parent[x] = parent[parent[x]];
      x = parent[x];
    }
    return x;
  }

  /** Root `from` joins root `into`: area and borders move over. */
  absorb(into: number, from: number): void {
    const adj = this.adj;
    this.parent[from] = into;
    this.area[into] += this.area[from];
    for (const [nb, len] of adj[from]) {
      if (nb === into) {
        adj[into].delete(from);
        continue;
      }
      adj[into].set(nb, (adj[into].get(nb) ?? 0) + len);
      const m = adj[nb];
      m.delete(from);
      m.set(into, (m.get(into) ?? 0) + len);
    }
    adj[from].clear();
  }

  /** Zone z goes into the neighbour with the longest shared border (lowest id on a tie); returns that root. */
  mergeIntoNeighbour(z: number): number {
    let best = -1,
      bl = -1;
    for (const [nb, len] of this.adj[z])
      if (len > bl || (len === bl && nb < best)) {
        bl = len;
        best = nb;
      }
    const target = this.find(best);
    this.absorb(target, z);
    // join same-class zones the merge has connected
    for (let again = true; again;) {
      again = false;
      for (const nb of [...this.adj[target].keys()])
        if (this.cls[nb] === this.cls[target] && this.parent[nb] === nb) {
          this.absorb(target, nb);
          again = true;
        }
    }
    return target;
  }
}

/** Merges zones under the minimum that have a neighbour, smallest first, pass after pass until none is left. */
function mergeSmall(u: ZoneUnion, minAreaM2: number): void {
  const { parent, area, adj } = u;
  const count = area.length;
  for (let pass = 0; pass < 1000; pass++) {
    const small: number[] = [];
    for (let z = 0; z < count; z++)
      if (parent[z] === z && area[z] < minAreaM2 && adj[z].size > 0) small.push(z);
    if (small.length === 0) break;
    small.sort((a, b) => area[a] - area[b] || a - b);
    let merged = 0;
    for (const z of small) {
      if (parent[z] !== z || area[z] >= minAreaM2 || adj[z].size === 0) continue;
      u.mergeIntoNeighbour(z);
      merged++;
    }
    if (merged === 0) break;
  }
}

/** The merged zones numbered in order of their first label, per cell and with class and area per zone. */
function relabel(label: Int32Array, u: ZoneUnion): Merged {
  const count = u.area.length;
  const ids = new Int32Array(count).fill(-1);
  let nz = 0;
  const zoneCls: number[] = [],
    zoneArea: number[] = [];
  for (let z = 0; z < count; z++)
    if (u.parent[z] === z) {
      ids[z] = nz++;
      zoneCls.push(u.cls[z]);
      zoneArea.push(u.area[z]);
    }
  const zone = new Int32Array(label.length).fill(-1);
  const outCls = new Int16Array(label.length).fill(-1);
  for (let i = 0; i < label.length; i++) {
    if (label[i] < 0) continue;
    const id = ids[u.find(label[i])];
    zone[i] = id;
    outCls[i] = zoneCls[id];
  }
  return {
    zone,
    count: nz,
    classOfZone: Int16Array.from(zoneCls),
    areaM2: Float64Array.from(zoneArea),
    classes: outCls,
  };
}
