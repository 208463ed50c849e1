/** Plain-text rendering of a variability study (what `tilth variability` prints). */
import type { VariabilityReport } from './index.js';
import { GSTAT_NAME, RANGE_NOTE } from './models.js';

const f = (x: number, d = 1) => (Number.isFinite(x) ? x.toFixed(d) : '-');
const g = (x: number) => {
  if (!Number.isFinite(x)) return '-';
  if (x === 0) return '0';
  const a = Math.abs(x);
  return a >= 1000 ? x.toFixed(0) : a >= 0.001 ? String(Number(x.toPrecision(3))) : x.toExponential(2);
};
const pad = (s: string, n: number) => (s.length >= n ? s : s + ' '.repeat(n - s.length));
const lpad = (s: string, n: number) => (s.length >= n ? s : ' '.repeat(n - s.length) + s);

/**
 * Formats a report as text for people: statistics, semivariogram table, fits, dependence, sampling, low spots,
 * and the sulphate statements.
 * @example process.stdout.write(variabilityText(analyzeVariability(samples, field)))
 */
export function variabilityText(r: VariabilityReport): string {
  const L: string[] = [];
  L.push(`Within-field variability of ${r.label}, ${r.unit}`);
  L.push('');
  statsLines(L, r);
  L.push('');
  semivariogramLines(L, r);
  L.push('');
  fitLines(L, r);
  L.push('');
  if (r.dependence && r.best) {
    L.push(
      `Spatial dependence: ${r.dependence.class.toUpperCase()} (nugget / sill ${f(100 * r.dependence.ratio, 0)} %; < 25 % strong, 25-75 % moderate, > 75 % weak: Cambardella et al. 1994, Soil Sci. Soc. Am. J. 58:1501-1511)`,
    );
  } else {
    L.push('Spatial dependence: not determined (no model fitted)');
  }
  L.push('');
  L.push('Sampling');
  L.push(wrap(r.sampling.text, '  '));
  L.push('');
  lowSpotLines(L, r);
  chanceLines(L, r);
  sulphurLines(L, r);
  for (const w of r.warnings) L.push(wrap(`warning: ${w.message}`, ''));
  return L.join('\n') + '\n';
}

/** Statistics, the threshold with its source and the shares below it. */
function statsLines(L: string[], r: VariabilityReport): void {
  const s = r.stats;
  L.push('Statistics');
  L.push(
    `  samples tested  ${s.n}${s.censoredBelow ? `  (${s.censoredBelow} below detection)` : ''}${s.censoredAbove ? `  (${s.censoredAbove} above range)` : ''}`,
  );
  L.push(
    `  mean ${f(s.mean)}   median ${f(s.median)}   SD ${f(s.sd)}   CV ${f(100 * s.cv, 0)} %   min ${f(s.min)}   max ${f(s.max)}`,
  );
  if (!r.threshold) {
    L.push('  threshold       none for this nutrient (give --threshold to mark low spots)');
    return;
  }
  L.push(
    `  threshold       ${r.threshold.value} ${r.threshold.unit} ("low" is ${r.threshold.inclusive ? 'at or below' : 'below'} it)`,
  );
  L.push(wrap(`source: ${r.threshold.source}`, '                  '));
  const sb = r.shareBelow;
  if (sb)
    L.push(
      wrap(
        `  below it        ${f(100 * sb.samples, 0)} % of samples; ${sb.area === null ? 'share of the mapped area: not computed (no surface)' : `${f(100 * sb.area, 0)} % of the mapped area (${f(sb.areaAc ?? NaN)} ac; ${sb.surface})`}`,
        '                  ',
      ),
    );
}

/** The semivariogram table, one line per lag (those with under 30 pairs marked). */
function semivariogramLines(L: string[], r: VariabilityReport): void {
  const v = r.semivariogram;
  L.push(
    `Semivariogram${r.transform === 'log' ? ' of ln(value)' : ''} (Matheron; ${v.lag.length} lags of ${f(v.width, 0)} m up to ${f(v.cutoff, 0)} m, a third of the samples' bounding-box diagonal unless set)`,
  );
  L.push(
    `  ${lpad('lag', 3)}  ${lpad('from-to m', 13)}  ${lpad('pairs', 5)}  ${lpad('mean dist m', 11)}  ${lpad('semivariance', 12)}`,
  );
  for (let j = 0; j < v.lag.length; j++) {
    const k = v.lag[j];
    const few = v.np[j] < 30 ? '  < 30 pairs' : '';
    L.push(
      `  ${lpad(String(k + 1), 3)}  ${lpad(`${f(k * v.width, 0)}-${f(Math.min((k + 1) * v.width, v.cutoff), 0)}`, 13)}  ${lpad(String(v.np[j]), 5)}  ${lpad(f(v.dist[j], 1), 11)}  ${lpad(g(v.gamma[j]), 12)}${few}`,
    );
  }
}

/** The model fits table and the best fit's range note. */
function fitLines(L: string[], r: VariabilityReport): void {
  const method = r.fits[0]?.method ?? 7;
  L.push(
    `Model fits (weighted least squares, weights ${method === 7 ? 'N_j / h_j^2 (gstat fit.method 7)' : method === 2 ? 'N_j / gamma(h_j)^2 (Cressie; gstat fit.method 2)' : `gstat fit.method ${method}`})`,
  );
  L.push(
    `  ${pad('model', 17)} ${lpad('nugget', 9)} ${lpad('p. sill', 9)} ${lpad('sill', 9)} ${lpad('range a m', 10)} ${lpad('eff. range m', 12)} ${lpad('nugget/sill', 11)}  note`,
  );
  for (const m of r.fits) {
    if (!m.ok) {
      L.push(`  ${pad(m.kind, 17)} no usable fit: ${m.problem}`);
      continue;
    }
    const best = m === r.best ? 'best fit' : '';
    const notes = [
      best,
      m.nuggetFixedAtZero ? 'nugget fixed at 0' : '',
      m.rangeAtLimit ? 'no sill reached' : '',
    ]
      .filter(Boolean)
      .join('; ');
    L.push(
      `  ${pad(`${m.kind} (${GSTAT_NAME[m.kind]})`, 17)} ${lpad(g(m.nugget), 9)} ${lpad(g(m.psill), 9)} ${lpad(g(m.sill), 9)} ${lpad(f(m.range, 0), 10)} ${lpad(f(m.effectiveRange, 0), 12)} ${lpad(f((100 * m.nugget) / m.sill, 0) + ' %', 11)}  ${notes}`,
    );
  }
  if (r.best) L.push(`  Range: ${RANGE_NOTE[r.best.kind]}.`);
}

/** The low samples with their positions. */
function lowSpotLines(L: string[], r: VariabilityReport): void {
  if (!r.threshold) return;
  L.push(
    `Low spots (${r.threshold.inclusive ? 'at or below' : 'below'} ${r.threshold.value} ${r.unit}):${r.low.length ? '' : ' none among the samples'}`,
  );
  for (const l of r.low)
    L.push(
      `  ${pad(l.id, 10)} ${lpad(f(l.value), 7)} ${r.unit}${l.censored < 0 ? ' (below detection; half the limit used)' : l.censored > 0 ? ' (above range)' : ''}   lat ${f(l.lat, 6)} lon ${f(l.lon, 6)}  (UTM ${f(l.x, 0)} E, ${f(l.y, 0)} N)`,
    );
  L.push('');
}

/** The chance below the threshold from kriging: how it was made and what it says, or why there is none. */
function chanceLines(L: string[], r: VariabilityReport): void {
  const c = r.chance;
  if (!c) return;
  const below = `${c.inclusive ? 'at or below' : 'below'} ${c.threshold} ${r.unit}`;
  if (c.refused) {
    L.push(wrap(`Chance ${below}: no map: ${c.refused}.`, '  '));
    L.push('');
    return;
  }
  L.push(`Chance ${below} (from kriging; Gaussian assumption)`);
  const msse = c.msse !== null && Number.isFinite(c.msse) ? `; leave-one-out MSSE ${f(c.msse, 2)}` : '';
  L.push(wrap(`  ${c.method}${msse}`, '    '));
  if (c.expectedShare !== null && c.shareLikely)
    L.push(
      wrap(
        `  expected share of the field ${below}: ${f(100 * c.expectedShare, 0)} % (${f(c.expectedAc ?? NaN)} ac); at least 50 % likely on ${f(100 * c.shareLikely.p50, 0)} % of the field, at least 90 % likely on ${f(100 * c.shareLikely.p90, 0)} %`,
        '    ',
      ),
    );
  L.push(wrap(`  ${c.assumption}`, '    '));
  L.push('');
}

/** The sulphate-S statements: marginal samples, a not-low test is uncertain, the composite, the floor. */
function sulphurLines(L: string[], r: VariabilityReport): void {
  const su = r.sulphur;
  if (!su) return;
  if (su.marginal.length)
    L.push(
      wrap(
        `Marginal (${r.threshold?.value}-${su.marginalUpper} lb S/ac, where canola may still respond): ${su.marginal.map((m) => `${m.id} ${f(m.value)}`).join(', ')}`,
        '',
      ),
    );
  L.push(wrap(su.notLowIsUncertain, ''));
  L.push(wrap(su.compositeText, ''));
  L.push(wrap(su.floorText, ''));
  L.push('');
}

function wrap(text: string, indent: string, width = 110): string {
  const lead = /^\s*/.exec(text)?.[0] ?? '';
  const words = text.trim().split(/\s+/);
  const lines: string[] = [];
  let cur = lead || indent;
  for (const w of words) {
    if (cur.length + w.length + 1 > width && cur.trim()) {
      lines.push(cur);
      cur = indent + w;
    } else cur = cur.trim() ? `${cur} ${w}` : cur + w;
  }
  if (cur.trim()) lines.push(cur);
  return lines.join('\n');
}
