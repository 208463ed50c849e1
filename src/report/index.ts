/** The field report: `renderReport(input)` -> one self-contained HTML page. See docs/report.md. */
export { renderReport } from './render.js';
export { parseReportInput, serializeReportInput } from './serialize.js';
export { REPORT_SCHEMA } from './types.js';
export type * from './types.js';
export { classColours, rampRgb, type RampName } from './colour.js';
export { esc } from './escape.js';
