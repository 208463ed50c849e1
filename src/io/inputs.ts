/**
 * The one input entry of the io stage: picks the reader for each file by its name (GeoJSON, CSV, .xlsx,
 * shapefile, zip of a shapefile) and returns raw records, before any judgement (src/validate/inputs.ts judges them).
 * Takes bytes, never paths: src/cli/inputs.ts reads the files.
 */
import { UserError } from '../errors.js';
import { parseColumnMap } from './columns.js';
import { readCsvRecords } from './csv.js';
import { readXlsxRecords } from './xlsx.js';
import { readGeoJsonPoints, readGeoJsonPolygons } from './geojson.js';
import type { InputFile, RawPolygons, RawTable } from './records.js';
import { readShapefile, type ShapefileBytes } from './shapefile/read.js';
import {
  shapefileLonLat,
  shapefilePoints,
  shapefilePolygons,
  type LonLatShapefile,
} from './shapefile/lonlat.js';
import { readZip } from './zip.js';

/** The input files of a field: samples and boundary, and optionally the zones zone-composite samples refer to. */
export interface InputFiles {
  samples: InputFile;
  boundary: InputFile;
  zones?: InputFile;
}

/** The input files as raw records, not yet judged. */
export interface RawInputs {
  samples: RawTable;
  boundary: RawPolygons;
  zones?: RawPolygons;
}

export interface ReadOptions {
  /** CSV column map "id=Sample ID,lat=Latitude,..." (for finding the header row) */
  columns?: string;
  /** a shapefile without .prj: read its coordinates as WGS 84 degrees instead of refusing (default false) */
  assumeWgs84?: boolean;
  /** coordinate system of easting / northing columns in a samples table, e.g. "EPSG:26913" */
  crs?: string;
  /** sheet of an .xlsx samples file (default: the first) */
  sheet?: string;
}

const extOf = (name: string) => (/\.([^./\\]+)$/.exec(name)?.[1] ?? '').toLowerCase();
const SIDECAR = new Set(['dbf', 'shx', 'prj', 'cpg', 'qmd', 'sbn', 'sbx']);

function text(f: InputFile): string {
  if (SIDECAR.has(extOf(f.name))) {
    throw new UserError(
      `${f.name} is one of the files beside a shapefile. Fix: give the .shp file (the others are found beside it), or a .zip of them all.`,
      { file: f.name },
    );
  }
  return new TextDecoder('utf-8').decode(f.bytes);
}

/** The entry of `files` named `base.ext` in any letter case. */
function sibling(
  files: Readonly<Record<string, Uint8Array>>,
  base: string,
  ext: string,
): Uint8Array | undefined {
  const want = `${base}.${ext}`.toLowerCase();
  for (const [k, v] of Object.entries(files)) if (k.toLowerCase() === want) return v;
  return undefined;
}

/**
 * The files of the shapefile set whose .shp is `shp` among `files` (name -> bytes): .shx, .dbf, .prj and .cpg
 * with the same base name in any letter case.
 * @example shapefileSet({ 'a.shp': shp, 'A.DBF': dbf }, 'a.shp').dbf === dbf
 */
export function shapefileSet(files: Readonly<Record<string, Uint8Array>>, shp: string): ShapefileBytes {
  const base = shp.slice(0, -4);
  return {
    shp: files[shp],
    shx: sibling(files, base, 'shx'),
    dbf: sibling(files, base, 'dbf'),
    prj: sibling(files, base, 'prj'),
    cpg: sibling(files, base, 'cpg'),
  };
}

/**
 * The one shapefile in a zip archive (read in memory, with src/io/zip.ts's limits).
 * @example const { label, set } = shapefileInZip(bytes, 'boundary.zip')
 */
export function shapefileInZip(bytes: Uint8Array, name: string): { label: string; set: ShapefileBytes } {
  const files = readZip(bytes, name);
  const shps = Object.keys(files).filter(
    (f) => f.toLowerCase().endsWith('.shp') && !f.startsWith('__MACOSX'),
  );
  if (shps.length === 0)
    throw new UserError(
      `${name} holds no .shp file. Fix: zip the shapefile's files (.shp, .shx, .dbf, .prj) together.`,
      { file: name },
    );
  if (shps.length > 1)
    throw new UserError(
      `${name} holds several shapefiles (${shps.join(', ')}). Fix: zip one shapefile per file.`,
      { file: name },
    );
  return { label: `${name} (${shps[0]})`, set: shapefileSet(files, shps[0]) };
}

/** A .shp (with the files beside it) or a .zip of one, in lon/lat; null for any other kind of file. */
async function shapefileInput(f: InputFile, opts: ReadOptions): Promise<LonLatShapefile | null> {
  const ext = extOf(f.name);
  if (ext !== 'shp' && ext !== 'zip') return null;
  const { label, set } =
    ext === 'zip'
      ? shapefileInZip(f.bytes, f.name)
      : { label: f.name, set: shapefileSet({ ...f.beside, [f.name]: f.bytes }, f.name) };
  return shapefileLonLat(await readShapefile(set, label), { assumeWgs84: opts.assumeWgs84 });
}

/** Sample records from a GeoJSON or CSV file (by extension; content sniffed when unclear). */
function readSamplesText(f: InputFile, opts: ReadOptions): RawTable {
  const t = text(f);
  const ext = extOf(f.name);
  if (ext === 'geojson' || ext === 'json' || (ext !== 'csv' && ext !== 'txt' && /^\s*\{/.test(t)))
    return readGeoJsonPoints(t, f.name);
  if (ext === 'xls')
    throw new UserError(
      `${f.name} is an old-style .xls workbook. Fix: save it from the spreadsheet as .xlsx (Excel Workbook) or as CSV.`,
      { file: f.name },
    );
  if (ext === 'csv' || ext === 'txt' || ext === 'tsv')
    return readCsvRecords(t, f.name, parseColumnMap(opts.columns), { crs: opts.crs });
  throw new UserError(
    `${f.name}: tilth reads samples from .geojson, .json, .csv, .xlsx, .shp or .zip (shapefile) files. Fix: export the samples in one of these formats.`,
    { file: f.name },
  );
}

/** Polygons (boundary or zones) from a GeoJSON file. */
function readPolygonsText(f: InputFile, what: string): RawPolygons {
  const ext = extOf(f.name);
  if (ext === 'csv' || ext === 'txt')
    throw new UserError(
      `${f.name}: a ${what} must be polygons (.geojson, .json, .shp or .zip), not a table. Fix: export the ${what} as GeoJSON or a shapefile.`,
      { file: f.name },
    );
  return readGeoJsonPolygons(text(f), f.name, what);
}

/**
 * Sample records from any samples file: GeoJSON, CSV (lab style), .xlsx, a shapefile (.shp with `beside`) or a
 * .zip of one.
 * @example (await readSamples({ name: 'samples.zip', bytes })).records.length
 */
export async function readSamples(f: InputFile, opts: ReadOptions = {}): Promise<RawTable> {
  if (extOf(f.name) === 'xlsx')
    return readXlsxRecords(f.bytes, f.name, parseColumnMap(opts.columns), {
      sheet: opts.sheet,
      crs: opts.crs,
    });
  const shp = await shapefileInput(f, opts);
  return shp ? shapefilePoints(shp) : readSamplesText(f, opts);
}

/**
 * Polygons (boundary or zones) from any polygon file: GeoJSON, a shapefile or a .zip of one.
 * @example (await readPolygons({ name: 'field.shp', bytes, beside: { 'field.dbf': dbf, 'field.prj': prj } }, 'boundary')).features
 */
export async function readPolygons(f: InputFile, what: string, opts: ReadOptions = {}): Promise<RawPolygons> {
  const shp = await shapefileInput(f, opts);
  return shp ? shapefilePolygons(shp, what) : readPolygonsText(f, what);
}

/**
 * Reads a field's input files into raw records, each with the reader its name asks for (GeoJSON, CSV,
 * shapefile, zip of a shapefile). No judgement beyond "can this be read": src/validate judges.
 * @throws UserError naming the file and the fix when a file cannot be read
 * @example
 * const raw = await readInputs({ samples: { name: 'samples.csv', bytes }, boundary: { name: 'b.geojson', bytes: b } });
 * const inputs = prepareInputs(raw);
 */
export async function readInputs(files: InputFiles, opts: ReadOptions = {}): Promise<RawInputs> {
  const boundary = await readPolygons(files.boundary, 'boundary', opts);
  const samples = await readSamples(files.samples, opts);
  const zones = files.zones ? await readPolygons(files.zones, 'zones', opts) : undefined;
  return zones ? { samples, boundary, zones } : { samples, boundary };
}
