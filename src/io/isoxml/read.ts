/**
 * TASKDATA.XML (and the files it names) -> TaskData, with the references checked: every zone code a
 * task names is defined, every product a value names exists, every grid file is there with the right
 * size. Problems are UserErrors naming the element and the fix. Format only: which DDIs mean what is
 * the caller's business.
 */
import { UserError } from '../../errors.js';
import { parseXml, type XmlElement } from './xml.js';
import { gridBytes } from './grid.js';
import type { IsoGrid, IsoPolygon, IsoTask, IsoValue, IsoZone, TaskData } from './model.js';

type Ctx = { label: string; files: Record<string, Uint8Array> };

const fail = (ctx: Ctx, where: string, msg: string, fix: string): never => {
  throw new UserError(`${ctx.label}: ${where}: ${msg}. Fix: ${fix}`, { file: ctx.label, where });
};

/** The entry of `files` named `name` in any letter case (terminals and sticks differ). */
function fileNamed(files: Record<string, Uint8Array>, name: string): Uint8Array | undefined {
  const want = name.toLowerCase();
  for (const [k, v] of Object.entries(files)) if (k.toLowerCase() === want) return v;
  return undefined;
}

function num(
  ctx: Ctx,
  e: XmlElement,
  where: string,
  a: string,
  opts: { optional?: boolean; int?: boolean; min?: number; max?: number } = {},
): number | undefined {
  const raw = e.attrs[a];
  if (raw === undefined || raw === '') {
    if (opts.optional) return undefined;
    return fail(
      ctx,
      where,
      `attribute ${a} is missing`,
      'export the task data again; the standard requires it.',
    );
  }
  const v = Number(raw);
  const bad =
    !/^\s*[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?\s*$/.test(raw) ||
    !Number.isFinite(v) ||
    (opts.int && !Number.isInteger(v)) ||
    (opts.min !== undefined && v < opts.min) ||
    (opts.max !== undefined && v > opts.max);
  if (bad)
    fail(
      ctx,
      where,
      `attribute ${a} is "${raw}", not ${opts.int ? 'a whole number' : 'a number'}${opts.min !== undefined ? ` in ${opts.min}..${opts.max}` : ''}`,
      'correct the value or export the task data again.',
    );
  return v;
}

function ring(ctx: Ctx, lsg: XmlElement, where: string): Float64Array {
  const pts = lsg.children.filter((c) => c.tag === 'PNT');
  const out = new Float64Array(pts.length * 2);
  pts.forEach((p, i) => {
    const w = `${where} > PNT ${i + 1}`;
    out[2 * i] = num(ctx, p, w, 'D', { min: -180, max: 180 })!;
    out[2 * i + 1] = num(ctx, p, w, 'C', { min: -90, max: 90 })!;
  });
  if (pts.length < 3)
    fail(
      ctx,
      where,
      `a polygon ring has ${pts.length} points`,
      'a ring needs at least 3 points; export the zones again.',
    );
  const n = out.length;
  if (out[0] !== out[n - 2] || out[1] !== out[n - 1]) {
    const closed = new Float64Array(n + 2);
    closed.set(out);
    closed[n] = out[0];
    closed[n + 1] = out[1];
    return closed;
  }
  return out;
}

function polygon(ctx: Ctx, pln: XmlElement, where: string): IsoPolygon {
  const type = num(ctx, pln, where, 'A', { int: true, min: 1, max: 255 })!;
  let exterior: Float64Array | null = null;
  const holes: Float64Array[] = [];
  pln.children
    .filter((c) => c.tag === 'LSG')
    .forEach((lsg, i) => {
      const w = `${where} > LSG ${i + 1}`;
      const t = num(ctx, lsg, w, 'A', { int: true, min: 1, max: 255 });
      if (t === 1) {
        if (exterior) fail(ctx, w, 'a polygon has two exterior rings (LSG A="1")', 'write one PLN per part.');
        exterior = ring(ctx, lsg, w);
      } else if (t === 2) holes.push(ring(ctx, lsg, w));
    });
  if (!exterior)
    return fail(ctx, where, 'polygon has no exterior ring (LSG A="1")', 'export the zones again.');
  return { type, exterior, holes, where };
}

function value(ctx: Ctx, pdv: XmlElement, where: string, products: Set<string>): IsoValue {
  const hex = pdv.attrs.A ?? '';
  if (!/^[0-9A-Fa-f]{1,4}$/.test(hex))
    fail(ctx, where, `DDI (attribute A) is "${hex}", not 4 hex digits`, 'export the task data again.');
  const productId = pdv.attrs.C ?? null;
  if (productId !== null && !products.has(productId))
    fail(
      ctx,
      where,
      `names product ${productId}, which no PDT defines`,
      `add the PDT ${productId} or correct attribute C.`,
    );
  return {
    ddi: parseInt(hex, 16),
    value: num(ctx, pdv, where, 'B', { int: true, min: -2147483648, max: 2147483647 })!,
    productId,
    valuePresentationId: pdv.attrs.E ?? null,
  };
}

function zone(ctx: Ctx, tzn: XmlElement, where: string, products: Set<string>): IsoZone {
  const code = num(ctx, tzn, where, 'A', { int: true, min: 0, max: 254 })!;
  const w = `${where} (code ${code})`;
  return {
    code,
    name: tzn.attrs.B ?? '',
    polygons: tzn.children
      .filter((c) => c.tag === 'PLN')
      .map((p, i) => polygon(ctx, p, `${w} > PLN ${i + 1}`)),
    values: tzn.children
      .filter((c) => c.tag === 'PDV')
      .map((p, i) => value(ctx, p, `${w} > PDV ${i + 1}`, products)),
  };
}

function grid(ctx: Ctx, grd: XmlElement, where: string, zones: IsoZone[]): IsoGrid {
  const n = (a: string, o: { int?: boolean; min?: number; max?: number; optional?: boolean } = {}) =>
    num(ctx, grd, where, a, o);
  const type = n('I', { int: true, min: 1, max: 2 }) as 1 | 2;
  const g = {
    type,
    south: n('A', { min: -90, max: 90 })!,
    west: n('B', { min: -180, max: 180 })!,
    cellNorth: n('C', { min: 0, max: 1 })!,
    cellEast: n('D', { min: 0, max: 1 })!,
    cols: n('E', { int: true, min: 1, max: 1e7 })!,
    rows: n('F', { int: true, min: 1, max: 1e7 })!,
    fileName: grd.attrs.G ?? '',
    zoneCode: type === 2 ? n('J', { int: true, min: 0, max: 254 })! : null,
  };
  if (!(g.cellNorth > 0 && g.cellEast > 0))
    fail(ctx, where, 'cell size (C, D) is 0', 'export the grid again.');
  if (!/^GRD\d{5}$/i.test(g.fileName))
    fail(ctx, where, `file name (G) is "${g.fileName}", not GRD + 5 digits`, 'export the grid again.');
  const data = fileNamed(ctx.files, `${g.fileName}.bin`);
  if (!data)
    fail(
      ctx,
      where,
      `its binary file ${g.fileName}.BIN is missing beside TASKDATA.XML`,
      `copy ${g.fileName}.BIN into the TASKDATA folder (or zip), next to TASKDATA.XML.`,
    );
  let perCell = 1;
  if (type === 2) {
    const z = zones.find((t) => t.code === g.zoneCode);
    if (!z)
      fail(
        ctx,
        where,
        `names treatment zone code ${g.zoneCode} (attribute J), which no TZN of the task defines`,
        'add that TZN with one PDV per grid value, or correct J.',
      );
    perCell = z!.values.length;
    if (perCell === 0)
      fail(
        ctx,
        where,
        `its treatment zone ${g.zoneCode} has no PDV, so the grid's values mean nothing`,
        'add one PDV per value of a cell.',
      );
  }
  const want = gridBytes(g, perCell);
  if (data!.length !== want)
    fail(
      ctx,
      where,
      `${g.fileName}.BIN has ${data!.length} bytes; ${g.cols} x ${g.rows} cells of type ${type}${type === 2 ? ` with ${perCell} value(s)` : ''} need ${want}`,
      'copy the file again (it may be cut short) or export the grid again.',
    );
  if (type === 1) {
    const codes = new Set(zones.map((z) => z.code));
    for (let i = 0; i < data!.length; i++)
      if (!codes.has(data![i]))
        fail(
          ctx,
          where,
          `cell ${i} (row ${Math.floor(i / g.cols) + 1} from the south) holds zone code ${data![i]}, which no TZN of the task defines`,
          'add that TZN or export the grid again.',
        );
  }
  return { ...g, data: data! };
}

function task(ctx: Ctx, tsk: XmlElement, products: Set<string>): IsoTask {
  const id = tsk.attrs.A ?? '?';
  const where = `TSK ${id}${tsk.attrs.B ? ` ("${tsk.attrs.B}")` : ''}`;
  const zones = tsk.children
    .filter((c) => c.tag === 'TZN')
    .map((z, i) => zone(ctx, z, `${where} > TZN ${i + 1}`, products));
  const seen = new Set<number>();
  for (const z of zones) {
    if (seen.has(z.code))
      fail(ctx, where, `two treatment zones have code ${z.code}`, 'give each TZN of a task its own code.');
    seen.add(z.code);
  }
  const zc = (a: string, what: string): number | undefined => {
    const v = num(ctx, tsk, where, a, { optional: true, int: true, min: 0, max: 254 });
    if (v !== undefined && !seen.has(v))
      fail(
        ctx,
        where,
        `its ${what} zone code (attribute ${a}) is ${v}, which no TZN of the task defines`,
        `add a TZN with code ${v} (for example a zero rate), or correct ${a}.`,
      );
    return v;
  };
  const grids = tsk.children.filter((c) => c.tag === 'GRD');
  if (grids.length > 1) fail(ctx, where, `has ${grids.length} grids`, 'a task holds at most one GRD.');
  return {
    id,
    name: tsk.attrs.B ?? '',
    customerId: tsk.attrs.C,
    farmId: tsk.attrs.D,
    partfieldId: tsk.attrs.E,
    status: num(ctx, tsk, where, 'G', { int: true, min: 1, max: 6 })!,
    defaultZone: zc('H', 'default'),
    positionLostZone: zc('I', 'position-lost'),
    outOfFieldZone: zc('J', 'out-of-field'),
    zones,
    grid: grids[0] ? grid(ctx, grids[0], `${where} > GRD`, zones) : null,
  };
}

/** Root children, with those of external files (XFR -> `<name>.XML` holding an XFC root) merged in. */
function rootChildren(ctx: Ctx, root: XmlElement): XmlElement[] {
  const out: XmlElement[] = [];
  for (const c of root.children) {
    if (c.tag !== 'XFR') {
      out.push(c);
      continue;
    }
    const name = `${c.attrs.A ?? ''}.XML`;
    const bytes = fileNamed(ctx.files, name);
    if (!bytes)
      fail(
        ctx,
        `XFR ${c.attrs.A}`,
        `the external file ${name} is missing`,
        `copy ${name} beside TASKDATA.XML.`,
      );
    const ext = parseXml(new TextDecoder().decode(bytes), name);
    out.push(...ext.children);
  }
  return out;
}

/**
 * Reads a task data set.
 * @param files the TASKDATA folder's files by name (any letter case): TASKDATA.XML, GRD*.BIN, external XML files
 * @param label name for messages, e.g. "taskdata.zip:TASKDATA/TASKDATA.XML"
 * @example const td = readTaskData({ 'TASKDATA.XML': bytes }, 'TASKDATA.XML'); td.tasks.length
 */
export function readTaskData(files: Record<string, Uint8Array>, label = 'TASKDATA.XML'): TaskData {
  const ctx: Ctx = { label, files };
  const main = fileNamed(files, 'TASKDATA.XML');
  if (!main)
    return fail(
      ctx,
      'TASKDATA.XML',
      'not found',
      'give the TASKDATA folder, its TASKDATA.XML, or a zip holding them.',
    );
  const root = parseXml(new TextDecoder().decode(main!), label);
  if (root.tag !== 'ISO11783_TaskData')
    fail(
      ctx,
      root.tag,
      `the root element is ${root.tag}, not ISO11783_TaskData`,
      'give an ISO 11783-10 TASKDATA.XML.',
    );
  const kids = rootChildren(ctx, root);
  const of = (tag: string) => kids.filter((c) => c.tag === tag);
  const products = of('PDT').map((p) => ({
    id: p.attrs.A ?? '',
    name: p.attrs.B ?? '',
    type: p.attrs.F ? Number(p.attrs.F) : undefined,
    densityMgPerL: p.attrs.H ? Number(p.attrs.H) : undefined,
  }));
  const ids = new Set(products.map((p) => p.id));
  return {
    versionMajor: num(ctx, root, 'ISO11783_TaskData', 'VersionMajor', { int: true, min: 1, max: 9 })!,
    versionMinor: num(ctx, root, 'ISO11783_TaskData', 'VersionMinor', { int: true, min: 0, max: 99 })!,
    software: {
      manufacturer: root.attrs.ManagementSoftwareManufacturer ?? '',
      version: root.attrs.ManagementSoftwareVersion ?? '',
    },
    customers: of('CTR').map((c) => ({ id: c.attrs.A ?? '', name: c.attrs.B ?? '' })),
    farms: of('FRM').map((f) => ({ id: f.attrs.A ?? '', name: f.attrs.B ?? '', customerId: f.attrs.I })),
    partfields: of('PFD').map((p) => ({
      id: p.attrs.A ?? '',
      name: p.attrs.C ?? '',
      areaM2: Number(p.attrs.D ?? 0),
      customerId: p.attrs.E,
      farmId: p.attrs.F,
      polygons: p.children
        .filter((c) => c.tag === 'PLN')
        .map((pl, i) => polygon(ctx, pl, `PFD ${p.attrs.A} > PLN ${i + 1}`)),
    })),
    products,
    valuePresentations: of('VPN').map((v) => ({
      id: v.attrs.A ?? '',
      offset: Number(v.attrs.B ?? 0),
      scale: Number(v.attrs.C ?? 1),
      decimals: Number(v.attrs.D ?? 0),
      unit: v.attrs.E ?? '',
    })),
    tasks: of('TSK').map((t) => task(ctx, t, ids)),
  };
}
