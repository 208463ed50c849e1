/**
 * checkPrescription: will this prescription load and apply what the agronomist meant?
 * One line per check (pass / warn / fail / skip) with the zones involved. Pure: layers in, report out.
 * Each check is one file here with one entry function that reads the shared context (./context.ts) and returns
 * its lines; its passing and failing cases are tests/check/fixtures/<file>/ (README there).
 */
import type { CheckLayer } from './layer.js';
import { polysArea } from './shape.js';
import { usableFeatures } from './coords.js';
import {
  bbox,
  frameOf,
  significantWith,
  SLIVER_WIDTH_M,
  toMetres,
  workingFrame,
  zoneNames,
  type CheckContext,
} from './context.js';
import { checkCrs } from './crs.js';
import { checkGeometry } from './geometry.js';
import { checkOverlap } from './overlap.js';
import { checkBoundary } from './boundary.js';
import { checkRates, rateTotals } from './rates.js';
import { checkZoneSize } from './zoneSize.js';

export { readLayer, layerFromGeoJSON, type CheckLayer } from './layer.js';

export { DEFAULT_TRANSITION_S } from './context.js';

export type { CheckReport, CheckOptions } from './types.js';
import type { CheckLine, CheckOptions, CheckReport } from './types.js';

/**
 * Checks a prescription layer (zones with rates) as an applicator operator needs before going to the
 * field: coordinate system known, every zone a valid polygon, no overlaps, no parts outside and no gaps
 * inside the boundary (when given), rate column present and numeric, rates within the machine's range,
 * zones long enough to reach their rate at the travel speed, and total product per rate column.
 * Overlap, gap and outside pieces under {@link SLIVER_M2}, or thinner on average than {@link SLIVER_WIDTH_M}, are ignored.
 *
 * Throws UserError for what makes the file unusable: a rate column holding text, or no coordinate
 * system with `strict`.
 *
 * @example
 * const report = checkPrescription(await readLayer({ 'rx.zip': bytes }, 'rx.zip'), { min: 40, max: 250, speedKmh: 12 });
 * report.ok // false when any line failed
 */
export function checkPrescription(rawLayer: CheckLayer, opts: CheckOptions = {}): CheckReport {
  // unusable coordinates (NaN, null, out of range) fail the geometry check and are kept out of the others
  const { features: cleaned, problems } = usableFeatures(rawLayer.features);
  const layer: CheckLayer = { ...rawLayer, features: cleaned };
  const lines: CheckLine[] = [];
  const frame = frameOf(layer);
  const { work, scale, origin } = workingFrame(layer, frame);
  const metres = toMetres(layer.features, work ? frame : { kind: 'planar', utmProj: null }, work, origin);
  const ctx: CheckContext = {
    layer,
    opts,
    feats: layer.features,
    problems,
    names: zoneNames(layer),
    // a grid follows the boundary only to a cell: pieces thinner on average than a cell are its staircase
    significant: significantWith(Math.max(SLIVER_WIDTH_M, layer.resolutionM ?? 0)),
    frame,
    work,
    scale,
    origin,
    metres,
    groundAreas: metres.map((m) => (m ? polysArea(m) / scale : 0)),
    usable: [],
    boxes: [],
    covered: null,
  };
  lines.push(...checkCrs(ctx));
  const geometry = checkGeometry(ctx);
  lines.push(...geometry.lines);
  ctx.usable = metres.map((m, i) => (geometry.valid[i] && m ? m : null));
  ctx.boxes = ctx.usable.map((m) => (m ? bbox(m) : null));
  const overlap = checkOverlap(ctx);
  lines.push(...overlap.lines);
  ctx.covered = overlap.covered;
  lines.push(...checkBoundary(ctx));
  const { lines: rateLines, rateFields, rates } = checkRates(ctx);
  lines.push(...rateLines);
  lines.push(...checkZoneSize(ctx));
  const { lines: totalLines, totals } = rateTotals(ctx, rateFields, rates);
  lines.push(...totalLines);
  return { file: layer.label, ok: !lines.some((l) => l.status === 'fail'), lines, totals };
}
