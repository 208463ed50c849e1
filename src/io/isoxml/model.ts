/**
 * ISO 11783-10 task data as plain data: the part of the standard a prescription uses (customer, farm,
 * partfield, products, value presentations, tasks with treatment zones or a grid). Format only: no
 * rates knowledge. Coordinates are WGS 84 longitude/latitude pairs (x y, as everywhere in tilth); the
 * XML writes them as PNT C = north (latitude), D = east (longitude).
 */
import type { LonLatFrame } from '../../geo/rasterize.js';

/** A polygon (PLN): exterior and interior rings as flat lon/lat pairs, each ring closed. */
export interface IsoPolygon {
  /** PLN A: 1 partfield boundary, 2 treatment zone, ... */
  type: number;
  exterior: Float64Array;
  holes: Float64Array[];
  /** element path for messages (reading only) */
  where?: string;
}

/** A process data value (PDV). */
export interface IsoValue {
  /** data dictionary identifier, e.g. 6 = setpoint mass per area application rate */
  ddi: number;
  /** integer value in the DDI's unit and resolution */
  value: number;
  productId: string | null;
  valuePresentationId: string | null;
}

/** A treatment zone (TZN). */
export interface IsoZone {
  /** 0..254, unique within its task */
  code: number;
  name: string;
  values: IsoValue[];
  polygons: IsoPolygon[];
}

/**
 * A grid (GRD). Cells run west to east within a row and rows south to north. Type 1: one byte per
 * cell, a treatment zone code. Type 2: per cell one little-endian int32 per PDV of the zone `zoneCode`.
 */
export interface IsoGrid extends LonLatFrame {
  type: 1 | 2;
  /** file name without extension, `GRD` + 5 digits */
  fileName: string;
  /** type 2: the treatment zone whose PDVs give the values' meaning */
  zoneCode: number | null;
  data: Uint8Array;
}

/** A task (TSK). */
export interface IsoTask {
  id: string;
  name: string;
  customerId?: string;
  farmId?: string;
  partfieldId?: string;
  /** 1 planned, 2 running, 3 paused, 4 completed, 5 template, 6 cancelled */
  status: number;
  defaultZone?: number;
  positionLostZone?: number;
  outOfFieldZone?: number;
  zones: IsoZone[];
  grid: IsoGrid | null;
}

export interface IsoProduct {
  id: string;
  name: string;
  /** PDT F: 1 single product */
  type?: number;
  /** PDT H: density, mg/L */
  densityMgPerL?: number;
}

/** A value presentation (VPN): shown value = (value + offset) x scale, with `decimals` digits, in `unit`. */
export interface IsoValuePresentation {
  id: string;
  offset: number;
  scale: number;
  decimals: number;
  unit: string;
}

export interface IsoPartfield {
  id: string;
  name: string;
  areaM2: number;
  customerId?: string;
  farmId?: string;
  polygons: IsoPolygon[];
}

/** One TASKDATA.XML with the files it names. */
export interface TaskData {
  versionMajor: number;
  versionMinor: number;
  /** ManagementSoftwareManufacturer / ManagementSoftwareVersion */
  software: { manufacturer: string; version: string };
  customers: { id: string; name: string }[];
  farms: { id: string; name: string; customerId?: string }[];
  partfields: IsoPartfield[];
  products: IsoProduct[];
  valuePresentations: IsoValuePresentation[];
  tasks: IsoTask[];
}

/** DDIs of setpoint application rates [published] ISO 11783-11 data dictionary. */
export const RATE_DDIS: Readonly<Record<number, { name: string; unit: string; kind: 'volume' | 'mass' }>> = {
  1: { name: 'Setpoint Volume Per Area Application Rate', unit: 'mm3/m2', kind: 'volume' },
  6: { name: 'Setpoint Mass Per Area Application Rate', unit: 'mg/m2', kind: 'mass' },
};

/** DDI as ISO 11783-10 writes it: 4 upper-case hex digits. @example ddiHex(6) // '0006' */
export const ddiHex = (ddi: number): string => ddi.toString(16).toUpperCase().padStart(4, '0');
