/** Axis and colour-bar ticks: nice steps and labels with as many decimals as the step needs. */

/**
 * "Nice" axis ticks (1, 2, 2.5, 5 x 10^k steps) inside [lo, hi], or, with `cover`, reaching just past both ends.
 * @example niceTicks(0, 0.7) // [0, 0.1, 0.2, ..., 0.7]
 * @example niceTicks(0, 1597, 6, true) // [0, 500, 1000, 1500, 2000]
 */
export function niceTicks(lo: number, hi: number, target = 6, cover = false): number[] {
  if (!(hi > lo)) return [lo];
  const raw = (hi - lo) / target;
  const mag = Math.pow(10, Math.floor(Math.log10(raw)));
  const step = [1, 2, 2.5, 5, 10].map((m) => m * mag).find((s) => s >= raw) ?? 10 * mag;
  const out: number[] = [];
  const first = cover ? Math.floor(lo / step + 1e-9) : Math.ceil(lo / step - 1e-9);
  const last = cover ? Math.ceil(hi / step - 1e-9) : Math.floor(hi / step + 1e-9);
  for (let k = first; k <= last; k++) {
    const t = k * step;
    out.push(Math.abs(t) < step * 1e-9 ? 0 : Number(t.toPrecision(12)));
  }
  return out;
}

/** A tick label with as many decimals as the step needs. */
export function fmtTick(t: number, step: number): string {
  const d = step >= 1 ? 0 : Math.min(6, Math.ceil(-Math.log10(step) - 1e-9));
  return t.toFixed(d);
}
