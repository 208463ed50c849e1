/**
 * The report's tables: zones, product totals, cross-validation, warnings, default tables used.
 * Every string from the input is escaped; numbers are formatted for people (see escape.ts).
 */
import { m2ToAc, m2ToHa } from '../units/index.js';
import { esc, fmt } from '../draw/escape.js';
import type { ReportInput, ReportZoneSet } from './types.js';

/**
 * An area in the plan's unit, e.g. "12.3 ac".
 * @example areaLabel(40468.564224, 'ac') // '10.0 ac'
 */
export function areaLabel(m2: number, unit: 'ac' | 'ha'): string {
  return `${fmt(unit === 'ha' ? m2ToHa(m2) : m2ToAc(m2), 1)} ${unit}`;
}

const th = (s: string, cls = ''): string => `<th${cls ? ` class="${cls}"` : ''}>${esc(s)}</th>`;
const td = (s: string, cls = ''): string => `<td${cls ? ` class="${cls}"` : ''}>${esc(s)}</td>`;
const num = (v: number | undefined, d = 0): string => td(fmt(v, d), 'num');

/**
 * Two tables of one zone set, so each fits a printed page: soil (area, class, soil means, nutrient targets)
 * and rates (area, product rate per placement, binding limit, notes).
 */
export function zonesTables(input: ReportInput, set: ReportZoneSet): string {
  const nutKeys = input.nutrients.filter((n) => set.zones.some((z) => n.key in z.soilMeans));
  const targetKeys = [...new Set(set.zones.flatMap((z) => Object.keys(z.targets)))];
  const rateCols = [
    ...new Map(
      set.zones.flatMap((z) => z.rates.map((r) => [`${r.product}\u0000${r.placement}`, r] as const)),
    ).values(),
  ];
  const decimals = (v: number): number => (Number.isInteger(v) ? 0 : 1);
  const areaOf = (m2: number): number => (input.units.area === 'ha' ? m2ToHa(m2) : m2ToAc(m2));
  const total = set.zones.reduce((s, z) => s + z.areaM2, 0);
  const foot = (extra: number): string =>
    `</tbody><tfoot><tr>${td(`${set.zones.length} zones`)}${num(areaOf(total), 1)}${extra ? `<td colspan="${extra}"></td>` : ''}</tr></tfoot></table>`;

  let soil =
    '<table class="zones zones-soil"><thead><tr>' +
    th('Zone') +
    th(`Area (${input.units.area})`, 'num') +
    th('Class', 'num');
  for (const n of nutKeys) soil += th(`${n.label}${n.unit ? ` (${n.unit})` : ''}`, 'num');
  for (const t of targetKeys) soil += th(`${t} target (${set.targetUnit})`, 'num');
  soil += '</tr></thead><tbody>';
  for (const z of set.zones) {
    soil +=
      `<tr data-zone="${esc(z.id)}">` +
      td(z.id) +
      num(areaOf(z.areaM2), 1) +
      td(z.class === null ? '–' : String(z.class + 1), 'num');
    for (const n of nutKeys) soil += num(z.soilMeans[n.key], n.decimals ?? 0);
    for (const t of targetKeys) soil += num(z.targets[t], decimals(z.targets[t] ?? 0));
    soil += '</tr>';
  }
  soil += foot(1 + nutKeys.length + targetKeys.length);

  let rates =
    '<table class="zones zones-rates"><thead><tr>' + th('Zone') + th(`Area (${input.units.area})`, 'num');
  for (const r of rateCols) rates += th(`${r.product}, ${r.placement} (${r.unit})`, 'num');
  rates += th('Binding limit') + '</tr></thead><tbody>';
  for (const z of set.zones) {
    rates += '<tr>' + td(z.id) + num(areaOf(z.areaM2), 1);
    for (const r of rateCols) {
      const v = z.rates.find((x) => x.product === r.product && x.placement === r.placement)?.rate;
      rates += num(v, v === undefined ? 0 : decimals(v));
    }
    rates += td(z.bindingLimit ?? 'none') + '</tr>';
    if (z.notes?.length)
      rates += `<tr class="zone-note"><td></td><td colspan="${2 + rateCols.length}">${z.notes.map(esc).join('<br>')}</td></tr>`;
  }
  rates += foot(1 + rateCols.length);
  return (
    `<h3>Soil and targets${input.zoneSets.length > 1 ? `: ${esc(set.name)}` : ''}</h3><div class="table-wrap">${soil}</div>` +
    `<h3>Product rates${input.zoneSets.length > 1 ? `: ${esc(set.name)}` : ''}</h3><div class="table-wrap">${rates}</div>` +
    (set.design?.length
      ? `<h3>How the zones were drawn${input.zoneSets.length > 1 ? `: ${esc(set.name)}` : ''}</h3><ul class="zone-design">${set.design.map((l) => `<li>${esc(l)}</li>`).join('')}</ul>`
      : '')
  );
}

/** Product totals for ordering and loading. */
export function totalsTable(input: ReportInput): string {
  if (!input.totals.length) return '<p>No product is applied.</p>';
  let h =
    '<table class="totals"><thead><tr>' +
    th('Product') +
    th('Placement') +
    th('Total', 'num') +
    th('Packaging') +
    th('Mean rate', 'num') +
    th('Min', 'num') +
    th('Max', 'num') +
    '</tr></thead><tbody>';
  for (const t of input.totals) {
    h +=
      '<tr>' +
      td(t.product) +
      td(t.placement) +
      td(`${fmt(t.total, t.total < 100 ? 1 : 0)} ${t.totalUnit}`, 'num') +
      td(t.packaging ?? '') +
      td(`${fmt(t.meanRate, 1)} ${t.rateUnit}`, 'num') +
      num(t.minRate, Number.isInteger(t.minRate) ? 0 : 1) +
      num(t.maxRate, Number.isInteger(t.maxRate) ? 0 : 1) +
      '</tr>';
  }
  return h + '</tbody></table>';
}

/** Cross-validation results that chose each nutrient's interpolation. */
export function cvTable(input: ReportInput): string {
  if (!input.crossValidation.length)
    return '<p>No cross-validation was run (zone-composite samples are not interpolated).</p>';
  const nut = new Map(input.nutrients.map((n) => [n.key, n]));
  let h =
    '<table class="cv"><thead><tr>' +
    th('Nutrient') +
    th('Method') +
    th('RMSE', 'num') +
    th('Mean error', 'num') +
    th('MAE', 'num') +
    th('Chosen') +
    '</tr></thead><tbody>';
  for (const r of input.crossValidation) {
    const n = nut.get(r.nutrient);
    const d = (n?.decimals ?? 0) + 1;
    h +=
      `<tr${r.chosen ? ' class="chosen"' : ''}>` +
      td(n ? `${n.label}${n.unit ? ` (${n.unit})` : ''}` : r.nutrient) +
      td(r.method) +
      num(r.rmse, d) +
      num(r.meanError, d) +
      num(r.mae, d) +
      td(r.chosen ? 'chosen' : '') +
      '</tr>';
  }
  return h + '</tbody></table>';
}

/** Warnings, each with where it applies. */
export function warningsList(input: ReportInput): string {
  if (!input.warnings.length) return '<p>No warnings.</p>';
  return (
    '<ul class="warnings">' +
    input.warnings
      .map((w) => {
        const where = [w.file, w.where, w.field].filter(Boolean).join(', ');
        return `<li><span class="code">${esc(w.code)}</span> ${esc(w.message)}${where ? ` <span class="where">(${esc(where)})</span>` : ''}</li>`;
      })
      .join('') +
    '</ul>'
  );
}

/** The default tables the plan used, with their sources. */
export function tablesUsedTable(input: ReportInput): string {
  if (!input.tablesUsed.length) return '<p>No default tables were used.</p>';
  let h =
    '<table class="sources"><thead><tr>' +
    th('Table') +
    th('Source') +
    th('Basis') +
    th('Edited by the user') +
    '</tr></thead><tbody>';
  for (const t of input.tablesUsed)
    h += '<tr>' + td(t.name) + td(t.source) + td(t.mark ?? '') + td(t.edited ? 'yes' : 'no') + '</tr>';
  return h + '</tbody></table>';
}
