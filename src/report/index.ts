/** The field report: `renderReport(input)` -> one self-contained HTML page. See docs/report.md. */
export { renderReport } from './render.js';
export { parseReportInput, serializeReportInput } from './serialize.js';
export type * from './types.js';
