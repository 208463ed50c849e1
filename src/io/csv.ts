/**
 * Lab-style CSV reader: finds the header row itself (labs print report lines above it), reads one
 * record per row (a sample may take several rows, one per depth), and takes positions from the
 * latitude/longitude columns. Values stay text here; src/validate parses and judges them.
 */
import { UserError } from '../errors.js';
import { classifyHeader, type ColumnMap, type Role } from './columns.js';
import type { RawRecord, RawTable } from './records.js';

/**
 * Splits CSV text into rows of cells (RFC 4180: quotes, doubled quotes, CRLF). The delimiter is the
 * first of comma, semicolon or tab that appears in the first lines.
 * @example parseCsv('a,b\n1,"x, y"\n') // [['a','b'],['1','x, y']]
 */
export function parseCsv(text: string): { rows: string[][]; lines: number[] } {
  const t = text.replace(/^\uFEFF/, '');
  const head = t.slice(0, 4000);
  const counts = [',', ';', '\t'].map((d) => head.split(d).length);
  const delim = [',', ';', '\t'][counts.indexOf(Math.max(...counts))];
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
        if (t[i + 1] === '"') { cell += '"'; i++; } else q = false;
      } else {
        if (c === '\n') line++;
        cell += c;
      }
    } else if (c === '"' && cell.trim() === '') {
      q = true;
      cell = '';
    } else if (c === delim) {
      row.push(cell); cell = '';
    } else if (c === '\n' || c === '\r') {
      if (c === '\r' && t[i + 1] === '\n') i++;
      row.push(cell); rows.push(row); lines.push(rowLine);
      row = []; cell = ''; line++; rowLine = line;
    } else cell += c;
  }
  if (cell !== '' || row.length) { row.push(cell); rows.push(row); lines.push(rowLine); }
  return { rows, lines };
}

/**
 * Reads lab-style CSV into records. The header is the first row (of the first 50) that names a
 * latitude and a longitude column, by the column map or by recognisable names.
 * @param map the user's column map (parseColumnMap), may be empty
 * @example readCsvRecords(text, 'samples.csv', []).records.length
 */
export function readCsvRecords(text: string, file: string, map: ColumnMap): RawTable {
  if (text.replace(/^\uFEFF/, '').trim() === '') throw new UserError(`${file} is empty. Fix: export the lab results again; the file has no content.`, { file });
  const { rows, lines } = parseCsv(text);
  const role = (cell: string): Role | null => {
    const c = cell.trim();
    for (const e of map) if (e.name.toLowerCase() === c.toLowerCase()) return e.role;
    return classifyHeader(c)?.role ?? null;
  };
  let h = -1;
  for (let i = 0; i < Math.min(rows.length, 50); i++) {
    const roles = rows[i].map(role);
    if (roles.includes('lat') && roles.includes('lon')) { h = i; break; }
  }
  if (h < 0) {
    throw new UserError(
      `${file}: no header row with latitude and longitude columns was found in the first 50 rows. ` +
        'Fix: name the columns, e.g. --columns "id=Sample ID,lat=Lat,lon=Long" (tilth needs each sample\'s position in WGS 84 degrees).',
      { file },
    );
  }
  const header = rows[h].map((c) => c.trim());
  const seen = new Map<string, number>();
  const columns = header.map((c, i) => {
    const name = c || `column ${i + 1}`;
    const n = (seen.get(name) ?? 0) + 1;
    seen.set(name, n);
    return n > 1 ? `${name} (${n})` : name;
  });
  const latCol = columns.findIndex((c) => role(c) === 'lat');
  const lonCol = columns.findIndex((c) => role(c) === 'lon');
  const records: RawRecord[] = [];
  for (let i = h + 1; i < rows.length; i++) {
    const r = rows[i];
    if (r.every((c) => c.trim() === '')) continue;
    const props: Record<string, string | null> = {};
    columns.forEach((c, j) => {
      const v = (r[j] ?? '').trim();
      props[c] = v === '' ? null : v;
    });
    const num = (s: string | null) => (s === null || !/^[-+]?\d+(\.\d*)?([eE][-+]?\d+)?$|^[-+]?\.\d+$/.test(s) ? NaN : Number(s));
    const where = `row ${lines[i]}`;
    const lat = num(props[columns[latCol]]), lon = num(props[columns[lonCol]]);
    if (!Number.isFinite(lat) || !Number.isFinite(lon)) {
      const bad = !Number.isFinite(lat) ? columns[latCol] : columns[lonCol];
      throw new UserError(
        `${file} ${where}, column "${bad}": "${props[bad] ?? ''}" is not a coordinate in decimal degrees. ` +
          'Fix: give latitude and longitude as decimal degrees (e.g. 52.3175 and -106.4125) on every row.',
        { file, where, field: bad, value: props[bad] },
      );
    }
    records.push({ where, lon, lat, props });
  }
  return { file, columns, records };
}
