/**
 * renderReport: one self-contained HTML page (inline CSS and SVG, images as data: URIs, no script,
 * no network) that a specialist can send to the farmer and the applicator and that prints on Letter or A4.
 */
import { m2ToAc, m2ToHa } from '../units/index.js';
import { esc, fmt } from '../draw/escape.js';
import { buildMaps, zoneDefs } from './maps.js';
import { base64 } from '../draw/png.js';
import { REPORT_CSS } from './style.js';
import { areaLabel, cvTable, tablesUsedTable, totalsTable, warningsList, zonesTables } from './tables.js';
import type { ReportChart, ReportInput } from './types.js';

/**
 * A chart from another stage, as an <img> of a data: URI: an SVG shown as an image cannot run script
 * or load anything, so a chart string can never inject into the page.
 */
function chartFigure(c: ReportChart, i: number): string {
  const uri = 'data:image/svg+xml;base64,' + base64(new TextEncoder().encode(c.svg));
  return (
    `<figure class="chart" id="chart-${i + 1}"><h3>${esc(c.title)}</h3><img alt="${esc(c.title)}" src="${uri}">` +
    (c.caption ? `<figcaption>${esc(c.caption)}</figcaption>` : '') +
    '</figure>'
  );
}

/**
 * Renders the field report as one HTML string.
 * Defaults: areas in `input.units.area`; colour ramps viridis (soil), magma (response), cividis (rates).
 * @example
 * import { renderReport } from 'tilth/report';
 * writeFileSync('report.html', renderReport(input)); // (the CLI writes it atomically)
 */
export function renderReport(input: ReportInput): string {
  const t = input.title;
  const zoneCount = input.zoneSets.reduce((s, z) => s + z.zones.length, 0);
  const maps = buildMaps(input);
  const area = input.field.areaM2;
  const areaOther = input.units.area === 'ac' ? `${fmt(m2ToHa(area), 1)} ha` : `${fmt(m2ToAc(area), 1)} ac`;
  const products = [...new Set(input.totals.map((x) => x.product))];
  const head =
    `<!DOCTYPE html><html lang="en"><head><meta charset="utf-8">` +
    `<meta http-equiv="Content-Security-Policy" content="default-src 'none'; img-src data:; style-src 'unsafe-inline'">` +
    `<meta name="viewport" content="width=device-width, initial-scale=1">` +
    `<meta name="generator" content="tilth ${esc(t.version)}">` +
    `<title>${esc(`${t.farm}: ${t.field}, ${t.crop} prescription`)}</title><style>${REPORT_CSS}</style></head>`;
  const dl = (k: string, v: string, cls = ''): string =>
    `<dt>${esc(k)}</dt><dd${cls ? ` class="${cls}"` : ''}>${esc(v)}</dd>`;
  const title =
    `<header class="title-block"><h1>Fertilizer prescription: ${esc(t.field)}</h1><dl>` +
    dl('Farm', t.farm) +
    dl('Field', t.field) +
    dl('Crop', t.crop) +
    dl('Target yield', t.targetYield) +
    dl('Date', t.date) +
    dl('tilth', t.version) +
    dl('Prepared by', t.preparedBy ?? '–') +
    dl('Inputs and plan', t.hash, 'hash') +
    `<dt>Plan</dt><dd class="plan">${esc(t.planSummary)}</dd></dl>` +
    (t.notes?.length ? `<ul class="notes">${t.notes.map((n) => `<li>${esc(n)}</li>`).join('')}</ul>` : '') +
    '</header>';
  const summary =
    `<section class="summary" aria-label="Summary">` +
    `<div>Field area<b>${esc(areaLabel(area, input.units.area))}</b>${esc(areaOther)}</div>` +
    `<div>Zones<b id="zone-count" data-count="${zoneCount}">${zoneCount}</b>${input.zoneSets.length} zone set${input.zoneSets.length === 1 ? '' : 's'}</div>` +
    `<div>Samples<b>${input.samples.ids.length}</b>${esc(area > 0 ? `${fmt(m2ToAc(area) / Math.max(1, input.samples.ids.length), 1)} ac per sample` : '')}</div>` +
    `<div>Products<b>${products.length}</b>${esc(products.join(', '))}</div>` +
    `<div>Warnings<b>${input.warnings.length}</b></div></section>`;
  const cautions = `<section class="caution" id="cautions"><strong>Caution.</strong><ul>${input.cautions.map((c) => `<li>${esc(c)}</li>`).join('')}</ul></section>`;
  const zones = input.zoneSets.map((s) => zonesTables(input, s)).join('');
  const mapFigs = maps
    .map(
      (m) =>
        `<figure class="map-page" id="${m.id}"><h3>${esc(m.title)}</h3>${m.svg}<figcaption>${esc(m.caption)}</figcaption></figure>`,
    )
    .join('');
  // zone outlines once for all maps (see zoneDefs)
  const defs = `<svg class="defs" width="0" height="0" aria-hidden="true" style="position:absolute"><defs>${zoneDefs(input)}</defs></svg>`;
  const body =
    `<body data-zone-count="${zoneCount}" data-map-count="${maps.length}">${defs}${title}${summary}${cautions}` +
    `<section id="totals"><h2>Product totals for ordering and loading</h2><div class="table-wrap">${totalsTable(input)}</div></section>` +
    `<section id="zones"><h2>Zones</h2>${zones}</section>` +
    `<section id="maps"><h2>Maps</h2>${mapFigs}</section>` +
    (input.charts.length
      ? `<section id="charts"><h2>Charts</h2>${input.charts.map(chartFigure).join('')}</section>`
      : '') +
    `<section id="cv"><h2>How the surfaces were interpolated</h2><p>Leave-one-out cross-validation of each method; the chosen method has the lowest error.</p><div class="table-wrap">${cvTable(input)}</div></section>` +
    `<section id="warnings"><h2>Warnings</h2>${warningsList(input)}</section>` +
    `<section id="sources"><h2>Default tables used and their sources</h2><div class="table-wrap">${tablesUsedTable(input)}</div></section>` +
    `<footer>tilth ${esc(t.version)} · inputs and plan <span class="hash">${esc(t.hash)}</span> · ${esc(t.date)} · ` +
    `Maps in UTM zone ${input.utm.zone}${input.utm.south ? 'S' : 'N'} (EPSG:${input.utm.epsg}). This page works offline and loads nothing.</footer></body></html>`;
  return head + body + '\n';
}
