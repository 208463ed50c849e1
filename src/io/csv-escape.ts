/**
 * CSV cells that a spreadsheet cannot run: a text cell beginning with `=`, `+`, `-`, `@`, tab or carriage return
 * is read as a formula by Excel, LibreOffice and Google Sheets (OWASP, "CSV Injection"). Such a cell gets a
 * leading apostrophe `'`, which spreadsheets show as text and which a reader can strip; numbers (a number
 * value, or text that is exactly a decimal number such as "-3.5") are left as they are. Then RFC 4180 quoting.
 */

const FORMULA_START = /^[=+\-@\t\r]/;
const PLAIN_NUMBER = /^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/;

/**
 * One CSV cell: neutralised (see the file comment) and quoted per RFC 4180 when it holds `"`, `,`, CR or LF.
 * @example csvCell('=HYPERLINK("http://x")') // "\"'=HYPERLINK(\"\"http://x\"\")\""
 * @example csvCell(-3.5) // '-3.5'
 */
export function csvCell(v: unknown): string {
  let s = v === null || v === undefined ? '' : String(v);
  if (typeof v !== 'number' && FORMULA_START.test(s) && !PLAIN_NUMBER.test(s)) s = `'${s}`;
  return /[",\n\r]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}
