/**
 * The report's stylesheet: screen and print. Printing fits both US Letter (216 x 279 mm) and A4
 * (210 x 297 mm): 12 mm margins leave at least 186 x 255 mm, so every map is sized to 186 mm wide and at
 * most 230 mm tall, one map per page; tables avoid breaking inside rows and, where they fit, inside
 * the table.
 */
import { MAP_CSS } from '../draw/style.js';

export const REPORT_CSS = `
:root { --ink: #1a1a1a; --muted: #555; --rule: #c8c8c8; --band: #f3f3f3; --warn: #7a4a00; }
* { box-sizing: border-box; }
html { -webkit-text-size-adjust: 100%; }
body { margin: 0 auto; max-width: 960px; padding: 24px; font: 14px/1.45 system-ui, -apple-system, "Segoe UI", Roboto, "Noto Sans", "DejaVu Sans", sans-serif; color: var(--ink); background: #fff; }
h1 { font-size: 24px; margin: 0 0 4px; }
h2 { font-size: 19px; margin: 28px 0 8px; padding-bottom: 3px; border-bottom: 2px solid var(--ink); break-after: avoid; page-break-after: avoid; }
h3 { font-size: 15px; margin: 16px 0 6px; break-after: avoid; page-break-after: avoid; }
.title-block { border: 2px solid var(--ink); padding: 14px 18px; }
.title-block dl { display: grid; grid-template-columns: max-content 1fr max-content 1fr; gap: 2px 14px; margin: 10px 0 0; }
.title-block dt { font-weight: 600; color: var(--muted); }
.title-block dd { margin: 0; overflow-wrap: anywhere; }
.title-block .plan { grid-column: 2 / span 3; }
.title-block .notes { margin: 8px 0 0; padding-left: 18px; color: var(--muted); }
.hash { font-family: ui-monospace, "DejaVu Sans Mono", monospace; }
.caution { border-left: 6px solid var(--warn); background: #fff7e6; padding: 8px 14px; margin: 14px 0; break-inside: avoid; }
.caution ul { margin: 4px 0; padding-left: 18px; }
.summary { display: flex; flex-wrap: wrap; gap: 8px 28px; margin: 12px 0; }
.summary div b { display: block; font-size: 20px; }
.table-wrap { overflow-x: auto; break-inside: avoid; page-break-inside: avoid; margin: 6px 0 12px; }
table { border-collapse: collapse; width: 100%; font-size: 12.5px; }
th, td { border-bottom: 1px solid var(--rule); padding: 3px 6px; text-align: left; vertical-align: top; }
thead th { border-bottom: 2px solid var(--ink); background: var(--band); }
tfoot td { border-top: 2px solid var(--ink); font-weight: 600; }
td.num, th.num { text-align: right; font-variant-numeric: tabular-nums; }
tr { break-inside: avoid; page-break-inside: avoid; }
tr.chosen td { font-weight: 600; }
tr.zone-note td { color: var(--warn); border-bottom-style: dashed; }
.warnings li { margin: 3px 0; }
.warnings .code { font-family: ui-monospace, "DejaVu Sans Mono", monospace; font-size: 12px; background: var(--band); padding: 0 4px; }
.warnings .where { color: var(--muted); }
figure.map-page { margin: 20px 0; }
figure.map-page h3 { margin-top: 0; }
figure.map-page svg { display: block; width: 100%; max-width: 820px; height: auto; border: 1px solid var(--rule); }
figure.map-page figcaption { color: var(--muted); font-size: 12.5px; margin-top: 4px; }
figure.chart img { display: block; max-width: 100%; height: auto; border: 1px solid var(--rule); }
${MAP_CSS}
footer { margin-top: 28px; color: var(--muted); font-size: 12px; border-top: 1px solid var(--rule); padding-top: 6px; }
@media print {
  @page { margin: 12mm; }
  body { max-width: none; padding: 0; font-size: 10pt; }
  h2 { margin-top: 14px; }
  #maps > h2 { break-before: page; page-break-before: always; }
  figure.map-page { break-before: page; page-break-before: always; break-inside: avoid; page-break-inside: avoid; margin: 0; }
  #maps > h2 + figure.map-page { break-before: avoid; page-break-before: avoid; }
  figure.map-page svg { width: 186mm; max-width: 100%; max-height: 225mm; border: none; }
  figure.chart { break-inside: avoid; page-break-inside: avoid; }
  figure.chart img { max-height: 200mm; }
  .table-wrap { overflow: visible; }
  table { font-size: 8.5pt; }
  thead { display: table-header-group; }
  a { color: inherit; text-decoration: none; }
}
`;
