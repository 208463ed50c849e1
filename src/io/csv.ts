/**
 * Lab-style CSV: RFC 4180 cells with the delimiter sniffed (comma, semicolon, tab), a byte-order mark dropped,
 * decimal commas read where the delimiter is a semicolon or tab; then src/io/table.ts finds the header below any
 * report lines and reads one record per row (a sample may take several rows, one per depth).
 */
import { UserError } from '../errors.js';
import type { ColumnMap } from './columns.js';
import type { RawTable } from './records.js';
import { readTable, type TableOptions } from './table.js';

/** The delimiter that splits the first lines most evenly into more than one cell (comma, semicolon, tab). */
function sniffDelimiter(t: string): string {
  const lines = t
    .slice(0, 8000)
    .split(/\r?\n/)
    .filter((l) => l.trim() !== '')
    .slice(0, 30);
  // semicolons with every comma between digits: decimal commas, whatever the counts say
  const head = lines.join('\n');
  if (head.includes(';') && !head.replace(/\d,\d/g, '').includes(',')) return ';';
  let best = ',',
    bestScore = -1;
  for (const d of [',', ';', '\t']) {
    const counts = lines.map((l) => l.split(d).length - 1);
    const max = Math.max(0, ...counts);
    // the count that most lines share (a table's width), weighted by how many share it
    const mode = counts.filter((c) => c === max).length;
    const score = max > 0 ? mode * 1000 + max : -1;
    if (score > bestScore) {
      best = d;
      bestScore = score;
    }
  }
  return best;
}

/**
 * Splits CSV text into rows of cells (RFC 4180: quotes, doubled quotes, CRLF). The delimiter is sniffed from
 * the first lines (comma, semicolon or tab); a leading byte-order mark is dropped.
 * @example parseCsv('a,b\n1,"x, y"\n').rows // [['a','b'],['1','x, y']]
 */
export function parseCsv(text: string): { rows: string[][]; lines: number[]; delimiter: string } {
  const t = text.replace(/^\uFEFF/, '');
  const delim = sniffDelimiter(t);
  const rows: string[][] = [];
  const lines: number[] = [];
  let row: string[] = [];
  let cell = '';
  let q = false;
  let line = 1;
  let rowLine = 1;
  for (let i = 0; i < t.length; i++) {
    const c = t[i];
    if (q) {
      if (c === '"') {
        if (t[i + 1] === '"') {
          cell += '"';
          i++;
        } else q = false;
      } else {
        if (c === '\n') line++;
        cell += c;
      }
    } else if (c === '"' && cell.trim() === '') {
      q = true;
      cell = '';
    } else if (c === delim) {
      row.push(cell);
      cell = '';
    } else if (c === '\n' || c === '\r') {
      if (c === '\r' && t[i + 1] === '\n') i++;
      row.push(cell);
      rows.push(row);
      lines.push(rowLine);
      row = [];
      cell = '';
      line++;
      rowLine = line;
    } else cell += c;
  }
  if (cell !== '' || row.length) {
    row.push(cell);
    rows.push(row);
    lines.push(rowLine);
  }
  return { rows, lines, delimiter: delim };
}

/** "12,5", "<0,5", "-102,01" -> with a decimal point; anything else unchanged. */
const decimalComma = (c: string) => (/^\s*[<>]?=?\s*[-+]?\d+,\d+\s*$/.test(c) ? c.replace(',', '.') : c);

/**
 * Reads lab-style CSV into records (see src/io/table.ts readTable for the header, positions and skipped rows).
 * @param map the user's column map (parseColumnMap), may be empty
 * @param opts --crs for easting / northing columns
 * @example readCsvRecords(text, 'samples.csv', []).records.length
 */
export function readCsvRecords(
  text: string,
  file: string,
  map: ColumnMap,
  opts: TableOptions = {},
): RawTable {
  if (text.replace(/^\uFEFF/, '').trim() === '')
    throw new UserError(`${file} is empty. Fix: export the lab results again; the file has no content.`, {
      file,
    });
  const { rows, lines, delimiter } = parseCsv(text);
  const cells = delimiter === ',' ? rows : rows.map((r) => r.map(decimalComma));
  return readTable(cells, lines, file, map, opts);
}
