/**
 * TaskData -> TASKDATA.XML and its grid files. Element and attribute order follows the standard's
 * schema (ISO11783_TaskFile V4): CTR, FRM, PFD, PDT, TSK, VPN under the root; TZN before GRD in a task;
 * PLN before PDV in a zone.
 */
import { el, writeXml, type XmlElement } from './xml.js';
import { ddiHex, type IsoGrid, type IsoPolygon, type IsoTask, type TaskData } from './model.js';

/** A decimal without exponent or trailing zeros, 9 significant digits. */
function decimal(v: number): string {
  const s = v.toPrecision(9);
  return s.includes('.') && !s.includes('e') ? s.replace(/\.?0+$/, '') : s;
}

/** Degrees with 9 decimals (about 0.1 mm), the most the standard allows. */
const deg = (v: number) => v.toFixed(9);

function ringXml(ring: Float64Array, type: 1 | 2): XmlElement {
  const pts: XmlElement[] = [];
  for (let i = 0; i + 1 < ring.length; i += 2)
    pts.push(el('PNT', { A: 2, C: deg(ring[i + 1]), D: deg(ring[i]) }));
  return el('LSG', { A: type }, pts);
}

function polygonXml(p: IsoPolygon): XmlElement {
  return el('PLN', { A: p.type }, [ringXml(p.exterior, 1), ...p.holes.map((h) => ringXml(h, 2))]);
}

function gridXml(g: IsoGrid): XmlElement {
  return el('GRD', {
    A: deg(g.south),
    B: deg(g.west),
    C: g.cellNorth.toPrecision(12),
    D: g.cellEast.toPrecision(12),
    E: g.cols,
    F: g.rows,
    G: g.fileName,
    H: g.data.length,
    I: g.type,
    J: g.type === 2 ? (g.zoneCode ?? undefined) : undefined,
  });
}

function taskXml(t: IsoTask): XmlElement {
  const zones = t.zones.map((z) =>
    el('TZN', { A: z.code, B: z.name }, [
      ...z.polygons.map(polygonXml),
      ...z.values.map((v) =>
        el('PDV', {
          A: ddiHex(v.ddi),
          B: Math.round(v.value),
          C: v.productId ?? undefined,
          E: v.valuePresentationId ?? undefined,
        }),
      ),
    ]),
  );
  return el(
    'TSK',
    {
      A: t.id,
      B: t.name,
      C: t.customerId,
      D: t.farmId,
      E: t.partfieldId,
      G: t.status,
      H: t.defaultZone,
      I: t.positionLostZone,
      J: t.outOfFieldZone,
    },
    [...zones, ...(t.grid ? [gridXml(t.grid)] : [])],
  );
}

/**
 * The XML document of a task data set.
 * @example taskDataXml(td).startsWith('<?xml') // true
 */
export function taskDataXml(td: TaskData): string {
  const root = el(
    'ISO11783_TaskData',
    {
      VersionMajor: td.versionMajor,
      VersionMinor: td.versionMinor,
      ManagementSoftwareManufacturer: td.software.manufacturer,
      ManagementSoftwareVersion: td.software.version,
      DataTransferOrigin: 1,
    },
    [
      ...td.customers.map((c) => el('CTR', { A: c.id, B: c.name })),
      ...td.farms.map((f) => el('FRM', { A: f.id, B: f.name, I: f.customerId })),
      ...td.partfields.map((p) =>
        el(
          'PFD',
          { A: p.id, C: p.name, D: Math.round(p.areaM2), E: p.customerId, F: p.farmId },
          p.polygons.map(polygonXml),
        ),
      ),
      ...td.products.map((p) =>
        el('PDT', {
          A: p.id,
          B: p.name,
          F: p.type,
          H: p.densityMgPerL === undefined ? undefined : Math.round(p.densityMgPerL),
        }),
      ),
      ...td.tasks.map(taskXml),
      ...td.valuePresentations.map((v) =>
        el('VPN', { A: v.id, B: v.offset, C: decimal(v.scale), D: v.decimals, E: v.unit }),
      ),
    ],
  );
  return writeXml(root);
}

/**
 * The files of a TASKDATA folder: `TASKDATA.XML` and one `GRDnnnnn.bin` per grid (the extension in
 * lower case, as the isoxml reader looks it up; terminals' FAT-formatted sticks ignore letter case).
 * @example Object.keys(taskDataFiles(td)) // ['TASKDATA.XML', 'GRD00001.bin']
 */
export function taskDataFiles(td: TaskData): Record<string, Uint8Array> {
  const files: Record<string, Uint8Array> = { 'TASKDATA.XML': new TextEncoder().encode(taskDataXml(td)) };
  for (const t of td.tasks) if (t.grid) files[`${t.grid.fileName}.bin`] = t.grid.data;
  return files;
}
