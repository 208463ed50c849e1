/**
 * `.xlsx` lab files through read-excel-file (maintained, reads cells as the lab typed them: numbers as numbers,
 * dates as dates, text as text, so "<2" and ids such as "007" stay text). The first sheet, or the one named; then
 * the same header recognition and row reading as CSV (src/io/table.ts). Why this library: docs/formats.md.
 */
import { UserError } from '../errors.js';
import { readZip } from './zip.js';
import type { ColumnMap } from './columns.js';
import type { RawTable } from './records.js';
import { readTable, type Cell, type TableOptions } from './table.js';

export interface XlsxOptions extends TableOptions {
  /** sheet name (default: the first sheet) */
  sheet?: string;
}

/** Rows and columns of a worksheet at most: 1 048 576 and 16 384 ([published] Microsoft, Excel specifications and limits). */
export const XLSX_MAX_ROWS = 1_048_576;
export const XLSX_MAX_COLUMNS = 16_384;
/**
 * Cells a worksheet may span (last row x last column): 5 000 000 (a lab sheet of 100 000 rows x 50 columns). The
 * spreadsheet library fills every gap up to the last row and column, so a row numbered 1e999 or a cell in
 * column XFD of row 1 000 000 would otherwise take all memory.
 */
export const XLSX_MAX_SPAN = 5_000_000;

const ROW_REF = /<(?:[A-Za-z_][\w.-]*:)?row\b([^>]*)>/g;
const CELL_REF = /<(?:[A-Za-z_][\w.-]*:)?c\b([^>]*)>/g;
const R_ATTR = /\sr\s*=\s*(?:"([^"]*)"|'([^']*)')/;

/** 1-based column of letters "A".."XFD" (beyond: Infinity). */
function columnNumber(letters: string): number {
  let n = 0;
  for (const ch of letters) n = n * 26 + (ch.charCodeAt(0) - 64);
  return letters.length > 3 ? Infinity : n;
}

/**
 * Refuses a worksheet whose row numbers or cell references are not whole numbers within Excel's limits, or whose
 * extent (last row x last column, and the number of rows) exceeds {@link XLSX_MAX_SPAN} / {@link XLSX_MAX_ROWS},
 * before the library reads it. Scans every XML part of the archive (a sheet may live at any path).
 * @example checkSheetExtent(readZip(bytes, 'lab.xlsx'), 'lab.xlsx')
 */
export function checkSheetExtent(entries: Record<string, Uint8Array>, file: string): void {
  for (const [name, data] of Object.entries(entries)) {
    if (!/\.xml$/i.test(name)) continue; // every part: the workbook's relations may put a sheet anywhere
    const xml = Buffer.from(data.buffer, data.byteOffset, data.byteLength).toString('latin1');
    const fail = (what: string) =>
      new UserError(
        `${file}: part ${name} ${what}. Fix: open the workbook in a spreadsheet and save it again as .xlsx, or export the sheet as CSV.`,
        { file, where: name },
      );
    let rows = 0,
      lastRow = 0,
      lastCol = 0;
    for (const m of xml.matchAll(ROW_REF)) {
      rows++;
      const r = R_ATTR.exec(m[1]!);
      const v = r ? (r[1] ?? r[2])! : null;
      if (v !== null && !/^[1-9]\d{0,6}$/.test(v))
        throw fail(`has a row numbered "${v.slice(0, 40)}" (not a whole number)`);
      if (v !== null) lastRow = Math.max(lastRow, Number(v));
      if (rows > XLSX_MAX_ROWS || lastRow > XLSX_MAX_ROWS)
        throw fail(
          `has more than ${XLSX_MAX_ROWS.toLocaleString('en-US')} rows, more than any spreadsheet holds`,
        );
    }
    for (const m of xml.matchAll(CELL_REF)) {
      const r = R_ATTR.exec(m[1]!);
      if (!r) continue;
      const v = (r[1] ?? r[2])!;
      const a = /^([A-Z]{1,3})([1-9]\d{0,6})$/.exec(v);
      const col = a ? columnNumber(a[1]!) : Infinity,
        row = a ? Number(a[2]) : Infinity;
      if (!a || col > XLSX_MAX_COLUMNS || row > XLSX_MAX_ROWS)
        throw fail(`has a cell at "${v.slice(0, 40)}", outside any spreadsheet (A1 to XFD1048576)`);
      lastRow = Math.max(lastRow, row);
      lastCol = Math.max(lastCol, col);
    }
    if (Math.max(lastRow, rows) * Math.max(lastCol, 1) > XLSX_MAX_SPAN)
      throw fail(
        `spans ${Math.max(lastRow, rows).toLocaleString('en-US')} rows x ${lastCol.toLocaleString('en-US')} columns, more than the ${XLSX_MAX_SPAN.toLocaleString('en-US')} cells tilth reads from a sheet`,
      );
  }
}

/**
 * Reads one sheet of an .xlsx workbook into rows of cells.
 * @example const { rows, sheet } = await readXlsxRows(bytes, 'lab.xlsx', {}); rows[0][0]
 */
export async function readXlsxRows(
  bytes: Uint8Array,
  file: string,
  opts: { sheet?: string } = {},
): Promise<{ rows: Cell[][]; sheet: string; sheets: string[] }> {
  if (bytes[0] !== 0x50 || bytes[1] !== 0x4b) {
    throw new UserError(
      `${file} is not an .xlsx workbook (an old .xls, or another file renamed?). Fix: save it from the spreadsheet as .xlsx (Excel Workbook) or as CSV.`,
      { file },
    );
  }
  // an .xlsx is a zip: its size and ratio limits first (src/io/zip.ts), then the sheets' extent; the library has neither
  checkSheetExtent(readZip(bytes, file), file);
  const { default: readXlsxFile } = await import('read-excel-file/node');
  let sheets: { sheet: string; data: unknown[][] }[];
  try {
    sheets = (await readXlsxFile(Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength), {
      trim: false,
    })) as unknown as { sheet: string; data: unknown[][] }[];
  } catch (e) {
    throw new UserError(
      `${file} cannot be read as an .xlsx workbook (${(e as Error).message}). Fix: open it in a spreadsheet and save it again as .xlsx, or export CSV.`,
      { file },
    );
  }
  const names = sheets.map((s) => s.sheet);
  const chosen =
    opts.sheet === undefined
      ? sheets[0]
      : (sheets.find((s) => s.sheet === opts.sheet) ??
        sheets.find((s) => s.sheet.trim().toLowerCase() === opts.sheet!.trim().toLowerCase()));
  if (!chosen) {
    throw new UserError(
      `${file}: there is no sheet "${opts.sheet}". Fix: give one of ${names.map((n) => `--sheet "${n}"`).join(', ')}.`,
      { file, value: opts.sheet },
    );
  }
  const rows = chosen.data.map((r) => r.map((c) => (c === undefined ? null : (c as Cell))));
  return { rows, sheet: chosen.sheet, sheets: names };
}

/**
 * Reads an .xlsx lab file into point records (header recognition as for CSV).
 * @example const table = await readXlsxRecords(bytes, 'lab.xlsx', [], { sheet: 'Results' });
 */
export async function readXlsxRecords(
  bytes: Uint8Array,
  file: string,
  map: ColumnMap,
  opts: XlsxOptions = {},
): Promise<RawTable> {
  const { rows, sheet, sheets } = await readXlsxRows(bytes, file, opts);
  if (rows.length === 0 || rows.every((r) => r.every((c) => c === null || String(c).trim() === ''))) {
    throw new UserError(
      `${file}: sheet "${sheet}" is empty${sheets.length > 1 ? ` (sheets: ${sheets.join(', ')})` : ''}. Fix: give the sheet with the results, e.g. --sheet "${sheets[1] ?? sheet}".`,
      { file },
    );
  }
  const name = sheets.length > 1 ? `${file} [${sheet}]` : file;
  return readTable(
    rows,
    rows.map((_, i) => i + 1),
    name,
    map,
    opts,
  );
}
