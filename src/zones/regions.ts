/**
 * Merging neighbouring regions of a label raster (classes or zones) until every pair of neighbours is
 * judged different enough to keep apart. The judge is supplied by the caller (the zones stage knows
 * nothing of agronomy): it turns a region's area-weighted mean layer values into a profile (e.g. the
 * product rates the rate engine gives that soil) and compares two profiles. The raster is read once into a
 * region graph (sums, areas, shared border lengths); merging works on the graph.
 */

/** How regions are described and compared. */
export interface RegionJudge<P, Why = string> {
  /** per-cell values (NaN = none) whose area-weighted means describe a region, e.g. soil values */
  layers: ArrayLike<number>[];
  /** a region's profile from its mean layer values (NaN where no cell has a value) and its area, m2 */
  profile(means: Float64Array, areaM2: number): P;
  /** whether two neighbouring regions stay apart, and if not, how alike they are (lowest score merges first) */
  compare(a: P, b: P): { apart: boolean; score: number; why: Why | null };
  /** called once with the first profiles and areas, before any merge (e.g. to fix thresholds from field means) */
  prepare?(profiles: P[], areasM2: Float64Array): void;
}

/** Regions as a graph: per region the weighted sums of each layer, its area and its neighbours. */
export interface RegionGraph {
  count: number;
  layers: number;
  /** per region x layer: summed weight and summed weight x value */
  sw: Float64Array;
  sv: Float64Array;
  areaM2: Float64Array;
  /** per region: neighbour -> shared border in cell edges (0 = not touching, for `allPairs`) */
  adj: Map<number, number>[];
}

/** Regions after merging (relabel cells with `of`: new id = of[old id]). */
export interface MergedRegions<P, Why = string> {
  count: number;
  /** per input region: its new id */
  of: Int32Array;
  profiles: P[];
  areaM2: Float64Array;
  /** every pair of touching regions left, with the border length and the judge's reason for keeping them apart */
  pairs: { a: number; b: number; border: number; why: Why | null }[];
  /** the merged regions as a graph (for a further merge without reading the raster again) */
  graph: RegionGraph;
  merges: number;
}

/**
 * Reads a label raster into a region graph: area-weighted layer sums, areas (fraction x cell area) and
 * border lengths between regions that share a cell edge. One pass over the cells.
 * @example const g = regionGraph(zone, n, grid.cols, grid.rows, grid.fraction, grid.cell ** 2, [pValues]);
 */
export function regionGraph(
  label: ArrayLike<number>,
  count: number,
  cols: number,
  rows: number,
  fraction: ArrayLike<number>,
  cellAreaM2: number,
  layers: ArrayLike<number>[],
): RegionGraph {
  const L = layers.length;
  const sw = new Float64Array(count * L),
    sv = new Float64Array(count * L),
    area = new Float64Array(count);
  const adj: Map<number, number>[] = Array.from({ length: count }, () => new Map());
  // border lengths: a dense table for a few regions (classes, cleaned zones), maps for many
  const dense = count <= 512 ? new Float64Array(count * count) : null;
  const add = dense
    ? (a: number, b: number) => {
        dense[a * count + b]++;
      }
    : (a: number, b: number) => {
        adj[a].set(b, (adj[a].get(b) ?? 0) + 1);
        adj[b].set(a, (adj[b].get(a) ?? 0) + 1);
      };
  for (let r = 0, i = 0; r < rows; r++)
    for (let c = 0; c < cols; c++, i++) {
      const z = label[i];
      if (z < 0) continue;
      if (c + 1 < cols) {
        const b = label[i + 1];
        if (b >= 0 && b !== z) add(z, b);
      }
      if (r + 1 < rows) {
        const b = label[i + cols];
        if (b >= 0 && b !== z) add(z, b);
      }
      const w = fraction[i];
      if (!(w > 0)) continue;
      area[z] += w * cellAreaM2;
      for (let l = 0; l < L; l++) {
        const v = layers[l][i];
        if (v === v) {
          sw[z * L + l] += w;
          sv[z * L + l] += w * v;
        }
      }
    }
  if (dense)
    for (let a = 0; a < count; a++)
      for (let b = a + 1; b < count; b++) {
        const len = dense[a * count + b] + dense[b * count + a];
        if (len > 0) {
          adj[a].set(b, len);
          adj[b].set(a, len);
        }
      }
  return { count, layers: L, sw, sv, areaM2: area, adj };
}

/**
 * Merges neighbouring regions (sharing a cell edge; any two regions with `allPairs`, e.g. classes, or zones
 * grouped into rate classes) whose profiles the judge does not keep apart, the most alike pair first,
 * recomputing the merged region's profile from its pooled sums each time, until every neighbouring pair is
 * apart. Regions with no area in the field (fraction 0) first join the neighbour with the longest border.
 * New ids follow the order of each region's first cell (`order: 'scan'`, default) or of its smallest input
 * label (`order: 'label'`, for classes numbered by need).
 *
 * @param label per cell: region 0..count-1 or -1
 * @param fraction per cell share of the field; areas are fraction x cellAreaM2
 * @example const m = mergeRegions(zone, n, grid.cols, grid.rows, grid.fraction, grid.cell ** 2, judge); m.count
 */
export function mergeRegions<P, Why>(
  label: ArrayLike<number>,
  count: number,
  cols: number,
  rows: number,
  fraction: ArrayLike<number>,
  cellAreaM2: number,
  judge: RegionJudge<P, Why>,
  order: 'scan' | 'label' = 'scan',
  allPairs = false,
): MergedRegions<P, Why> {
  const g = regionGraph(label, count, cols, rows, fraction, cellAreaM2, judge.layers);
  const m = mergeGraph(g, judge, allPairs);
  const newId = new Int32Array(count).fill(-1);
  let n = 0;
  if (order === 'label') {
    for (let z = 0; z < count; z++) if (newId[m.root[z]] < 0) newId[m.root[z]] = n++;
  } else
    for (let i = 0; i < label.length; i++) {
      const z = label[i];
      if (z >= 0 && newId[m.root[z]] < 0) newId[m.root[z]] = n++;
    }
  const of = new Int32Array(count);
  for (let z = 0; z < count; z++) of[z] = newId[m.root[z]];
  return { ...collapse(g, m, of, n), count: n, of, merges: m.merges };
}

/** Result of merging on a graph: each input region's root, profiles and judgements of the roots. */
interface GraphMerge<P, Why> {
  root: Int32Array;
  prof: P[];
  cmp: Map<number, { apart: boolean; score: number; why: Why | null }>;
  merges: number;
}

/**
 * The merging itself, on a region graph (modified in place: sums, areas and borders pool into each root).
 * @example const m = mergeGraph(regionGraph(label, n, cols, rows, fraction, 25, judge.layers), judge, false);
 */
export function mergeGraph<P, Why>(
  g: RegionGraph,
  judge: RegionJudge<P, Why>,
  allPairs: boolean,
): GraphMerge<P, Why> {
  const { count, layers: L, sw, sv, areaM2: area, adj } = g;
  if (allPairs)
    for (let a = 0; a < count; a++)
      for (let b = 0; b < count; b++) if (a !== b && !adj[a].has(b)) adj[a].set(b, 0);
  const parent = Int32Array.from({ length: count }, (_, k) => k);
  const find = (x: number) => {
    while (parent[x] !== x) {
      parent[x] = parent[parent[x]];
      x = parent[x];
    }
    return x;
  };
  const join = (into: number, from: number) => {
    parent[from] = into;
    area[into] += area[from];
    for (let l = 0; l < L; l++) {
      sw[into * L + l] += sw[from * L + l];
      sv[into * L + l] += sv[from * L + l];
    }
    for (const [nb, len] of adj[from]) {
      adj[nb].delete(from);
      if (nb === into) continue;
      adj[into].set(nb, (adj[into].get(nb) ?? 0) + len);
      adj[nb].set(into, (adj[nb].get(into) ?? 0) + len);
    }
    adj[from].clear();
    adj[into].delete(from);
  };
  for (let z = 0; z < count; z++) {
    // regions outside the field join their longest-border neighbour
    if (area[z] > 0 || parent[z] !== z) continue;
    let best = -1,
      bl = 0;
    for (const [nb, len] of adj[z])
      if (len > bl) {
        bl = len;
        best = nb;
      }
    if (best >= 0) join(find(best), z);
  }
  const means = (z: number) =>
    Float64Array.from({ length: L }, (_, l) => (sw[z * L + l] > 0 ? sv[z * L + l] / sw[z * L + l] : NaN));
  const prof: P[] = new Array(count);
  for (let z = 0; z < count; z++) if (parent[z] === z) prof[z] = judge.profile(means(z), area[z]);
  const roots = [...Array(count).keys()].filter((z) => parent[z] === z);
  judge.prepare?.(
    roots.map((z) => prof[z]),
    Float64Array.from(roots, (z) => area[z]),
  );
  const pk = (a: number, b: number) => (a < b ? a * count + b : b * count + a);
  const cmp = new Map<number, { apart: boolean; score: number; why: Why | null }>();
  const version = new Int32Array(count);
  const heap = new MinHeap();
  const judgePairs = (z: number) => {
    for (const nb of adj[z].keys()) {
      const c = judge.compare(prof[z], prof[nb]);
      cmp.set(pk(z, nb), c);
      if (!c.apart) heap.push(c.score, z, nb, version[z], version[nb]);
    }
  };
  for (const z of roots) judgePairs(z);
  let merges = 0;
  for (let top = heap.pop(); top; top = heap.pop()) {
    const { a, b, va, vb } = top;
    if (parent[a] !== a || parent[b] !== b || version[a] !== va || version[b] !== vb) continue;
    const [into, from] = area[a] >= area[b] ? [a, b] : [b, a];
    for (const nb of adj[from].keys()) cmp.delete(pk(from, nb));
    join(into, from);
    version[into]++;
    prof[into] = judge.profile(means(into), area[into]);
    judgePairs(into);
    merges++;
  }
  const root = Int32Array.from({ length: count }, (_, z) => find(z));
  return { root, prof, cmp, merges };
}

/** The merged regions as a new graph with new ids, their profiles, areas and touching pairs. */
function collapse<P, Why>(
  g: RegionGraph,
  m: GraphMerge<P, Why>,
  of: Int32Array,
  n: number,
): Omit<MergedRegions<P, Why>, 'count' | 'of' | 'merges'> {
  const L = g.layers;
  const graph: RegionGraph = {
    count: n,
    layers: L,
    sw: new Float64Array(n * L),
    sv: new Float64Array(n * L),
    areaM2: new Float64Array(n),
    adj: Array.from({ length: n }, () => new Map()),
  };
  const profiles: P[] = new Array(n);
  const pairs: MergedRegions<P, Why>['pairs'] = [];
  const pk = (a: number, b: number) => (a < b ? a * g.count + b : b * g.count + a);
  for (let z = 0; z < g.count; z++) {
    if (m.root[z] !== z || of[z] < 0) continue;
    const k = of[z];
    profiles[k] = m.prof[z];
    graph.areaM2[k] = g.areaM2[z];
    for (let l = 0; l < L; l++) {
      graph.sw[k * L + l] = g.sw[z * L + l];
      graph.sv[k * L + l] = g.sv[z * L + l];
    }
    for (const [nb, len] of g.adj[z]) {
      if (len <= 0) continue;
      graph.adj[k].set(of[nb], len);
      if (z < nb)
        pairs.push({
          a: Math.min(k, of[nb]),
          b: Math.max(k, of[nb]),
          border: len,
          why: m.cmp.get(pk(z, nb))?.why ?? null,
        });
    }
  }
  pairs.sort((p, q) => p.a - q.a || p.b - q.b);
  return { profiles, areaM2: graph.areaM2, pairs, graph };
}

/** A binary min-heap of candidate merges (score, regions a and b, and their versions when judged). */
class MinHeap {
  private items: { s: number; a: number; b: number; va: number; vb: number }[] = [];
  push(s: number, a: number, b: number, va: number, vb: number): void {
    const h = this.items;
    h.push({ s, a, b, va, vb });
    for (let i = h.length - 1; i > 0;) {
      const p = (i - 1) >> 1;
      if (!less(h[i], h[p])) break;
      [h[i], h[p]] = [h[p], h[i]];
      i = p;
    }
  }
  pop(): { a: number; b: number; va: number; vb: number } | undefined {
    const h = this.items;
    if (h.length === 0) return undefined;
    const top = h[0],
      last = h.pop()!;
    if (h.length > 0) {
      h[0] = last;
      for (let i = 0; ;) {
        const l = 2 * i + 1,
          r = l + 1;
        let m = i;
        if (l < h.length && less(h[l], h[m])) m = l;
        if (r < h.length && less(h[r], h[m])) m = r;
        if (m === i) break;
        [h[i], h[m]] = [h[m], h[i]];
        i = m;
      }
    }
    return top;
  }
}

/** Lower score first; ties by the smaller pair, so merges do not depend on the heap's layout. */
function less(x: { s: number; a: number; b: number }, y: { s: number; a: number; b: number }): boolean {
  if (x.s !== y.s) return x.s < y.s;
  const xa = Math.min(x.a, x.b),
    ya = Math.min(y.a, y.b);
  return xa !== ya ? xa < ya : Math.max(x.a, x.b) < Math.max(y.a, y.b);
}
