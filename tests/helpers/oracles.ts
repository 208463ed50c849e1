/** Brute-force oracles for property tests of hand-written algorithms (not part of the library). */

/**
 * Brute-force k nearest (the oracle for src/surface/knn.ts): ascending squared distances and indices within maxD2.
 * @example bruteKnn(xy, 10, 20, 12)
 */
export function bruteKnn(
  xy: ArrayLike<number>,
  qx: number,
  qy: number,
  k: number,
  maxD2 = Infinity,
  skip = -1,
): { d2: number[]; idx: number[] } {
  const all: [number, number][] = [];
  for (let i = 0; 2 * i < xy.length; i++) {
    if (i === skip) continue;
    const dx = xy[2 * i] - qx,
      dy = xy[2 * i + 1] - qy;
    const dd = dx * dx + dy * dy;
    if (dd <= maxD2) all.push([dd, i]);
  }
  all.sort((a, b) => a[0] - b[0] || a[1] - b[1]);
  const top = all.slice(0, k);
  return { d2: top.map((t) => t[0]), idx: top.map((t) => t[1]) };
}
