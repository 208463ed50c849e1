/**
 * The variability charts as report entries (src/report's `ReportChart`: title, complete SVG, caption), so the
 * build's report shows the same pictures `tilth variability --out` writes.
 */
import type { ReportChart } from '../report/types.js';
import type { Field, Samples } from '../types.js';
import type { VariabilityReport } from './index.js';
import { sampleMapSvg, semivariogramSvg } from './charts.js';

/**
 * The semivariogram and low-spot map of one study, with captions that carry the findings.
 * @example input.charts.push(...variabilityReportCharts(analyzeVariability(samples, field), samples, field))
 */
export function variabilityReportCharts(r: VariabilityReport, samples: Samples, field: Field, surface?: Parameters<typeof sampleMapSvg>[0]['surface']): ReportChart[] {
  const best = r.best;
  const dep = r.dependence;
  const svCaption = best && dep
    ? `Best fit ${best.kind}: nugget ${best.nugget.toPrecision(3)}, sill ${best.sill.toPrecision(3)}, effective range ${best.effectiveRange.toFixed(0)} m; spatial dependence ${dep.class} (nugget/sill ${(100 * dep.ratio).toFixed(0)} %, Cambardella et al. 1994). ${r.sampling.text}`
    : `No semivariogram model could be fitted. ${r.sampling.text}`;
  const lowIds = r.low.map((l) => l.id).join(', ');
  const mapCaption = r.threshold
    ? `${r.low.length} of ${r.stats.n} samples ${r.threshold.inclusive ? 'at or below' : 'below'} ${r.threshold.value} ${r.unit}${lowIds ? `: ${lowIds}` : ''}.${r.sulphur ? ` ${r.sulphur.compositeText} ${r.sulphur.notLowIsUncertain} ${r.sulphur.floorText}` : ''}`
    : `Samples coloured by ${r.label}; no threshold for this nutrient.`;
  return [
    { title: `Semivariogram of ${r.label}`, svg: semivariogramSvg({ semivariogram: r.semivariogram, fits: r.fits, best: r.best, label: r.label, unit: r.unit, transform: r.transform }), caption: svCaption },
    {
      title: `${r.label}: low spots`,
      svg: sampleMapSvg({
        parts: field.parts, xy: samples.xy, values: samples.values[r.nutrient], ids: samples.ids, label: r.label, unit: r.unit,
        threshold: r.threshold?.value ?? null, thresholdInclusive: r.threshold?.inclusive, surface,
      }),
      caption: mapCaption,
    },
  ];
}
