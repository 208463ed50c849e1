/**
 * Per-file size limits on inputs, checked from the file's size before a byte is read: every reader holds its
 * whole file in memory (and a parsed copy several times larger), so a file far beyond any field's data is
 * refused at once with its size, the limit and the fix, instead of exhausting memory. Numbers:
 * docs/reliability.md, "Bounded resources".
 */
import { UserError } from '../../errors.js';

const MiB = 1024 * 1024;

/** One kind of input file, by name ending, with its limit in bytes. */
export interface SizeLimit {
  kind: string;
  /** name endings, lower case, without the dot */
  ext: readonly string[];
  bytes: number;
  /** what such a file holds for one field, for the message */
  typical: string;
}

/**
 * The limits, by file kind (common practice for the sizes: a lab file of 10 000 samples is a few MB; a gridded
 * prescription of a million cells a few hundred MB as a shapefile). A name with no ending listed here is read
 * as text (GeoJSON) and takes the GeoJSON limit.
 */
export const SIZE_LIMITS: readonly SizeLimit[] = [
  {
    kind: 'CSV',
    ext: ['csv', 'tsv', 'txt'],
    bytes: 50 * MiB,
    typical: 'a lab file of 10 000 samples is about 3 MB',
  },
  { kind: 'xlsx', ext: ['xlsx'], bytes: 50 * MiB, typical: 'a lab workbook is well under 1 MB' },
  {
    kind: 'task data XML',
    ext: ['xml'],
    bytes: 100 * MiB,
    typical: 'TASKDATA.XML of a field with a few hundred zones is under 10 MB',
  },
  {
    kind: 'zip',
    ext: ['zip'],
    bytes: 256 * MiB,
    typical: 'unpacked, an archive may hold at most 256 MiB anyway',
  },
  {
    kind: 'shapefile or task data grid',
    ext: ['shp', 'shx', 'dbf', 'bin'],
    bytes: 512 * MiB,
    typical: 'a prescription of a million grid cells is about 200 MB',
  },
  { kind: 'YAML', ext: ['yaml', 'yml'], bytes: 4 * MiB, typical: 'a plan is a few KB' },
  {
    kind: 'GeoJSON',
    ext: ['geojson', 'json'],
    bytes: 100 * MiB,
    typical: 'a boundary of 100 000 vertices is about 4 MB',
  },
];

const GEOJSON = SIZE_LIMITS.find((l) => l.kind === 'GeoJSON')!;

/**
 * The limit that applies to a file, by its name's ending (a name with another ending: the GeoJSON limit).
 * @example sizeLimitOf('samples.CSV').bytes // 52428800
 */
export function sizeLimitOf(path: string, limits: readonly SizeLimit[] = SIZE_LIMITS): SizeLimit {
  const ext = (/\.([^./\\]+)$/.exec(path)?.[1] ?? '').toLowerCase();
  return limits.find((l) => l.ext.includes(ext)) ?? limits.find((l) => l.kind === 'GeoJSON') ?? GEOJSON;
}

/** 4 MiB for a whole number of MiB, else one decimal (50.0 MiB for one byte over 50 MiB: the bytes follow). */
const mib = (n: number) => `${n % MiB === 0 ? n / MiB : (n / MiB).toFixed(1)} MiB`;

/**
 * Refuses a file larger than its kind's limit: a UserError (exit 2) with the file, its size, the limit and the fix.
 * @param size the file's size in bytes (from stat, before reading)
 * @example checkInputSize('samples.csv', 80 * 1024 * 1024, 'samples') // throws: 80 MiB, over the 50 MiB CSV limit
 */
export function checkInputSize(
  path: string,
  size: number,
  what: string,
  limits: readonly SizeLimit[] = SIZE_LIMITS,
): void {
  const l = sizeLimitOf(path, limits);
  if (size <= l.bytes) return;
  throw new UserError(
    `${what} file "${path}" is ${mib(size)} (${size.toLocaleString('en-US')} bytes), more than the ${mib(l.bytes)} tilth reads from one ${l.kind} file (${l.typical}). ` +
      `Fix: check that it is the right file; give only this field's data (split a farm-wide file per field), or simplify it.`,
    { file: path, value: size },
  );
}
