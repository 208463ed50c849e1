/**
 * Rows of cells (from CSV or a spreadsheet) to point records: finds the header row below a lab's report lines,
 * a second header row of units or depths, skips blank rows, repeated headers and notes below the table, and takes
 * each row's position from latitude / longitude columns, one "lat, lon" column, or easting / northing with a
 * stated coordinate system. Values stay as read; src/validate parses and judges them.
 */
import proj4 from 'proj4';
import { UserError } from '../errors.js';
import type { ColumnMap } from './columns.js';
import { classifyHeader, isHeaderNote, type Role } from './headers.js';
import { parseCrs } from './crs.js';
import type { RawRecord, RawTable, RawValue } from './records.js';

/** A cell as read: text from CSV; text, number, boolean or date from a spreadsheet. */
export type Cell = string | number | boolean | Date | null;

export interface TableOptions {
  /** --crs text for easting / northing columns (e.g. "EPSG:26913") */
  crs?: string;
}

const text = (c: Cell | undefined): string =>
  (c === null || c === undefined ? '' : c instanceof Date ? isoDate(c) : String(c)).trim();
const isoDate = (d: Date) =>
  d.getUTCHours() || d.getUTCMinutes()
    ? d.toISOString().slice(0, 16).replace('T', ' ')
    : d.toISOString().slice(0, 10);

/** Position columns a header row must have (by the map or by recognised names). */
function positionRoles(cells: string[], map: ColumnMap): Role[] {
  return cells
    .map((c) => {
      for (const e of map) if (e.name.toLowerCase() === c.toLowerCase()) return e.role;
      return c ? (classifyHeader(c)?.role ?? null) : null;
    })
    .filter((r): r is Role => r !== null);
}

const hasPosition = (roles: Role[]) =>
  (roles.includes('lat') && roles.includes('lon')) ||
  roles.includes('latlon') ||
  (roles.includes('x') && roles.includes('y'));

/** Index of the header row (first of the first 50 that names a position), or -1. */
function findHeader(rows: Cell[][], map: ColumnMap): number {
  for (let i = 0; i < Math.min(rows.length, 50); i++)
    if (hasPosition(positionRoles(rows[i].map(text), map))) return i;
  return -1;
}

/** Column names (blank ones inherit a spanning header from the left when a second row names them) and second-row notes. */
function headerNames(
  head: string[],
  second: string[] | null,
): { columns: string[]; notes: (string | null)[] } {
  const seen = new Map<string, number>();
  const notes: (string | null)[] = [];
  let left = '';
  const columns = head.map((c, i) => {
    const note = second?.[i] ? second[i] : null;
    let name = c;
    if (!name && note && left) name = `${left} ${note}`;
    else if (name) left = name;
    notes.push(c ? note : null);
    name ||= `column ${i + 1}`;
    const n = (seen.get(name) ?? 0) + 1;
    seen.set(name, n);
    return n > 1 ? `${name} (${n})` : name;
  });
  return { columns, notes };
}

const NUM = /^[-+]?(\d+(\.\d*)?|\.\d+)([eE][-+]?\d+)?$/;
const num = (v: RawValue): number =>
  typeof v === 'number' ? v : typeof v === 'string' && NUM.test(v.trim()) ? Number(v) : NaN;

type Locate = (p: Record<string, RawValue>) => {
  lon: number;
  lat: number;
  bad: string | null;
  empty: boolean;
};

/** How a row's position is read from its cells. */
function locator(
  columns: string[],
  roleOf: (c: string) => Role | null,
  file: string,
  opts: TableOptions,
): { locate: Locate; how: string } {
  const col = (r: Role) => columns.find((c) => roleOf(c) === r);
  const lat = col('lat'),
    lon = col('lon'),
    ll = col('latlon'),
    x = col('x'),
    y = col('y');
  const empty = (p: Record<string, RawValue>, cs: string[]) => cs.every((c) => p[c] === null);
  if (lat && lon)
    return {
      how: `degrees from "${lat}" and "${lon}"`,
      locate: (p) => ({
        lat: num(p[lat]),
        lon: num(p[lon]),
        bad: Number.isFinite(num(p[lat])) ? lon : lat,
        empty: empty(p, [lat, lon]),
      }),
    };
  if (ll) {
    const lonFirst =
      /lon|lng/i.test(ll) && ll.toLowerCase().search(/lon|lng/) < ll.toLowerCase().search(/lat/);
    return {
      how: `degrees from "${ll}" (${lonFirst ? 'longitude, latitude' : 'latitude, longitude'})`,
      locate: (p) => {
        const m = /^\s*\(?\s*([-+]?\d+(?:\.\d+)?)\s*[,; ]\s*([-+]?\d+(?:\.\d+)?)\s*\)?\s*$/.exec(
          String(p[ll] ?? ''),
        );
        const a = m ? Number(m[1]) : NaN,
          b = m ? Number(m[2]) : NaN;
        return lonFirst
          ? { lon: a, lat: b, bad: ll, empty: empty(p, [ll]) }
          : { lat: a, lon: b, bad: ll, empty: empty(p, [ll]) };
      },
    };
  }
  const crs = opts.crs ? parseCrs(opts.crs) : null;
  const conv = crs?.proj4 ? proj4(crs.proj4, 'EPSG:4326') : null;
  return {
    how: crs
      ? `"${x}" / "${y}" in ${crs.label} (${crs.code})${conv ? ', reprojected to WGS 84' : ''}`
      : `"${x}" / "${y}" as longitude / latitude degrees`,
    locate: (p) => {
      const e = num(p[x!]),
        n = num(p[y!]);
      const bad = Number.isFinite(e) ? y! : x!;
      if (!conv) {
        if (!crs && Number.isFinite(e) && Number.isFinite(n) && (Math.abs(e) > 180 || Math.abs(n) > 90)) {
          throw new UserError(
            `${file}: columns "${x}" and "${y}" hold metres (e.g. ${e}, ${n}), not degrees, and no coordinate system was given. ` +
              'Fix: say which with --crs, e.g. --crs EPSG:26913 (NAD83 / UTM zone 13N) or --crs EPSG:32613 (WGS 84 / UTM zone 13N).',
            { file, field: x, value: e },
          );
        }
        return { lon: e, lat: n, bad, empty: empty(p, [x!, y!]) };
      }
      if (!Number.isFinite(e) || !Number.isFinite(n))
        return { lon: NaN, lat: NaN, bad, empty: empty(p, [x!, y!]) };
      const [lo, la] = conv.forward([e, n]);
      return { lon: lo, lat: la, bad, empty: false };
    },
  };
}

/**
 * Reads rows of cells into point records.
 * @param rowNumbers for each row, its number as a person counts it in the file (for messages)
 * @param map the user's column map (parseColumnMap), may be empty
 * @example readTable([['Sample','Lat','Long'],['A','52.3','-106.4']], [1, 2], 't.csv', []).records[0].lat // 52.3
 */
export function readTable(
  rows: Cell[][],
  rowNumbers: number[],
  file: string,
  map: ColumnMap,
  opts: TableOptions = {},
): RawTable {
  const h = findHeader(rows, map);
  if (h < 0) throw noHeader(rows, file, map);
  const head = rows[h].map(text);
  const next = rows[h + 1]?.map(text) ?? null;
  const second = next && next.some((c) => c !== '') && next.every((c) => isHeaderNote(c)) ? next : null;
  const { columns, notes } = headerNames(head, second);
  const roles = new Map<string, Role | null>();
  const roleOf = (c: string): Role | null => {
    if (!roles.has(c)) {
      const i = columns.indexOf(c);
      const e = map.find((m) => m.name.toLowerCase() === c.toLowerCase());
      roles.set(c, e ? e.role : (classifyHeader(notes[i] ? `${c} ${notes[i]}` : c)?.role ?? null));
    }
    return roles.get(c)!;
  };
  const { locate, how } = locator(columns, roleOf, file, opts);
  const records: RawRecord[] = [];
  const idCol = columns.find((c) => roleOf(c) === 'id');
  const byId = new Map<string, RawRecord>();
  const skipped: { where: string; why: string }[] = [];
  let pendingNoPosition: string | null = null;
  const first = h + (second ? 2 : 1);
  for (let i = first; i < rows.length; i++) {
    const r = rows[i];
    const where = `row ${rowNumbers[i]}`;
    if (r.every((c) => text(c) === '')) continue;
    if (r.map(text).join('\u0000') === head.join('\u0000')) {
      skipped.push({ where, why: 'the header repeated' });
      continue;
    }
    const props: Record<string, RawValue> = {};
    columns.forEach((c, j) => {
      const v = r[j];
      props[c] =
        v === null || v === undefined || text(v) === ''
          ? null
          : typeof v === 'number' || typeof v === 'boolean'
            ? v
            : text(v);
    });
    let pos = locate(props);
    const prev = idCol && props[idCol] !== null ? byId.get(String(props[idCol])) : undefined;
    if (pos.empty && prev) pos = { lon: prev.lon, lat: prev.lat, bad: null, empty: false }; // deeper layer rows often omit the position
    if (pos.empty) {
      pendingNoPosition ??= where;
      skipped.push({ where, why: 'no position (a note below the table?)' });
      continue;
    }
    if (pendingNoPosition) throw noPosition(file, pendingNoPosition, columns, roleOf);
    if (!Number.isFinite(pos.lat) || !Number.isFinite(pos.lon)) {
      throw new UserError(
        `${file} ${where}, column "${pos.bad}": "${props[pos.bad!] ?? ''}" is not a coordinate. ` +
          "Fix: give each sample's position as decimal degrees (e.g. 52.3175 and -106.4125), or easting / northing in metres with --crs.",
        { file, where, field: pos.bad!, value: props[pos.bad!] },
      );
    }
    const rec = { where, lon: pos.lon, lat: pos.lat, props };
    records.push(rec);
    if (idCol && props[idCol] !== null && !byId.has(String(props[idCol])))
      byId.set(String(props[idCol]), rec);
  }
  return { file, columns, records, headerNotes: notes, headerRow: rowNumbers[h], skipped, position: how };
}

function noPosition(
  file: string,
  where: string,
  columns: string[],
  roleOf: (c: string) => Role | null,
): UserError {
  const pos = columns.filter((c) => ['lat', 'lon', 'latlon', 'x', 'y'].includes(roleOf(c) ?? ''));
  return new UserError(
    `${file} ${where}: the sample has no position (${pos.map((c) => `"${c}"`).join(', ')} empty). Fix: give its coordinates, or remove the row.`,
    { file, where, field: pos[0] },
  );
}

function noHeader(rows: Cell[][], file: string, map: ColumnMap): UserError {
  let best = 0,
    bestN = -1;
  for (let i = 0; i < Math.min(rows.length, 50); i++) {
    const n = positionRoles(rows[i].map(text), map).length;
    if (n > bestN) {
      best = i;
      bestN = n;
    }
  }
  const cells = (rows[best] ?? []).map(text).filter(Boolean);
  return new UserError(
    `${file}: no header row with sample positions (latitude and longitude, one "lat, lon" column, or easting and northing) was found in the first 50 rows` +
      (cells.length
        ? `; the likeliest header row has ${cells
            .slice(0, 12)
            .map((c) => `"${c}"`)
            .join(', ')}`
        : '') +
      '. Fix: name the position columns, e.g. --columns "id=Sample ID,lat=Lat,lon=Long" (degrees) or --columns "x=E,y=N" --crs EPSG:26913 (metres).',
    { file },
  );
}
