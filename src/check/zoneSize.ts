/** Check `zone_size`: every zone is long (and wide) enough to reach its rate at the travel speed. */
import { DEFAULT_TRANSITION_S, fmt, lineWriter, list, type CheckContext } from './context.js';
import type { CheckLine } from './types.js';
import { hullExtent, polysArea } from './shape.js';
import { lengthM, quantityText, speedMs, type Length, type Speed } from '../units/index.js';

/**
 * The `zone_size` line (skipped without a speed): a rate change takes transitionS seconds, so a zone shorter
 * than speed x transition never reaches its rate. Speed and swath are named as given (mph and ft with km/h and m).
 * @example
 * checkZoneSize(ctx) // with { speed: { value: 60, unit: 'km/h' }, transitionS: 10 }:
 * // [{ check: 'zone_size', status: 'fail', message: 'at 60 km/h a rate change takes 10 s = 166.7 m; no part longer than that: zone 4 (141.4 m)', zones: ['zone 4'] }]
 */
export function checkZoneSize(ctx: CheckContext): CheckLine[] {
  const { lines, add } = lineWriter();
  const o = ctx.opts;
  const speed: Speed | undefined =
    o.speed ?? (o.speedKmh === undefined ? undefined : { value: o.speedKmh, unit: 'km/h' });
  const swath: Length | undefined =
    o.swath ?? (o.swathM === undefined ? undefined : { value: o.swathM, unit: 'm' });
  if (speed === undefined) add('zone_size', 'skip', 'no --speed given');
  else {
    const t = ctx.opts.transitionS ?? DEFAULT_TRANSITION_S;
    const d = speedMs(speed) * t;
    const swathM = swath && lengthM(swath);
    const tooShort: string[] = [],
      narrow: string[] = [],
      tiny: string[] = [];
    ctx.usable.forEach((m, i) => {
      if (!m) return;
      for (const part of m) {
        const { diameter, width } = hullExtent(part[0]);
        const a = polysArea([part]) / ctx.scale;
        if (diameter < d) {
          tooShort.push(`${ctx.names[i]} (${fmt(diameter)} m)`);
          return;
        }
        if (swathM !== undefined && a < d * swathM) {
          tiny.push(`${ctx.names[i]} (${fmt(a)} m2)`);
          return;
        }
        if (width < d) {
          narrow.push(`${ctx.names[i]} (${fmt(width)} m)`);
          return;
        }
      }
    });
    const head = `at ${quantityText(speed)} a rate change takes ${t} s = ${fmt(d)} m`;
    if (tooShort.length || tiny.length) {
      const parts = [
        tooShort.length ? `no part longer than that: ${list(tooShort)}` : '',
        tiny.length ? `smaller than ${fmt(d)} m x ${quantityText(swath!)} swath: ${list(tiny)}` : '',
      ].filter(Boolean);
      add(
        'zone_size',
        'fail',
        `${head}; ${parts.join('; ')}`,
        [...tooShort, ...tiny].map((s) => s.replace(/ \(.*$/, '')),
      );
    } else if (narrow.length)
      add(
        'zone_size',
        'warn',
        `${head}; narrower than that across (crossing them the rate is not reached): ${list(narrow)}`,
        narrow.map((s) => s.replace(/ \(.*$/, '')),
      );
    else add('zone_size', 'pass', `${head}; every zone is longer and wider than that`);
  }
  return lines;
}
