/**
 * mulberry32: a tiny seeded pseudo-random generator (uniform in [0, 1)), so that k-means starts, demo data
 * and benchmarks are reproducible.
 * @example const rnd = mulberry32(1); rnd() // 0.6270739405881613
 */
export function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}
