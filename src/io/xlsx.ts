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
  readZip(bytes, file); // an .xlsx is a zip: its size and ratio limits first (src/io/zip.ts), the library has none
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
