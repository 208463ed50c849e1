/**
 * What the readers return: tables of records with a position and raw properties, and polygon
 * features, before any judgement (src/validate turns them into Samples, Field and SampleZones).
 */

/** A raw property value as read: numbers stay numbers, everything else is text; empty is null. */
export type RawValue = string | number | boolean | null;

/** One input record: a GeoJSON point feature or one CSV row. */
export interface RawRecord {
  /** for messages: "feature 3" or "row 17" (1-based, as a person counts) */
  where: string;
  /** longitude, latitude as read (not yet checked); NaN when missing */
  lon: number;
  lat: number;
  props: Record<string, RawValue>;
}

/** Point records from one file. */
export interface RawTable {
  /** file name for messages */
  file: string;
  /** property / column names in file order */
  columns: string[];
  records: RawRecord[];
  /** tables: per column, the text of a second header row (units, methods, depths), else null */
  headerNotes?: (string | null)[];
  /** tables: the header's row number as a person counts it */
  headerRow?: number;
  /** tables: rows read past and why (repeated header, notes below the table) */
  skipped?: { where: string; why: string }[];
  /** tables: how positions were read, for people */
  position?: string;
  /** a CRS stated by the file (.prj WKT), if any */
  crs?: string;
  /**
   * When the samples are zone polygons (composite samples drawn as their zones): per record its MultiPolygon
   * coordinates; the record's lon/lat is then a point inside it.
   */
  polygons?: number[][][][][];
}

/** One polygon feature as read: MultiPolygon coordinates (lon/lat as read, not yet checked). */
export interface RawPolygon {
  where: string;
  props: Record<string, RawValue>;
  coordinates: number[][][][];
}

/** Polygon features from one file. */
export interface RawPolygons {
  file: string;
  features: RawPolygon[];
}

/** A file handed to the library: its name (for messages and for its kind) and its bytes. */
export interface InputFile {
  name: string;
  bytes: Uint8Array;
  /** for a .shp: the files beside it by name (.shx, .dbf, .prj, .cpg; any letter case) */
  beside?: Readonly<Record<string, Uint8Array>>;
}
