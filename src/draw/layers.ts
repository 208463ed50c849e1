/**
 * Building blocks of every map: classes of a raster and their labels, the raster as a clipped PNG image at
 * display resolution, the field boundary, sample dots (coloured, ringed when low) with labels placed clear of
 * each other, and a note in the middle of the field.
 */
import { esc, fmt, wrapWords } from './escape.js';
import { type Frame, geoGroup, type MapPart, partsPath, px, py } from './frame.js';
import { LOW_RED } from './colour.js';
import { pngDataUri } from './png.js';

/** A north-up grid: west edge, north edge, cell size (m), columns and rows (row-major from the north-west). */
export interface MapGrid {
  xmin: number;
  ymax: number;
  cell: number;
  cols: number;
  rows: number;
}

/**
 * Class index of every cell: 0 below breaks[0], i where breaks[i-1] <= v < breaks[i], 255 for NaN.
 * @example classify([1, 5, NaN, 12], [4, 10]) // Uint8Array [0, 1, 255, 2]
 */
export function classify(values: ArrayLike<number>, breaks: readonly number[]): Uint8Array {
  const out = new Uint8Array(values.length);
  for (let i = 0; i < values.length; i++) {
    const v = values[i]!;
    if (!Number.isFinite(v)) {
      out[i] = 255;
      continue;
    }
    let c = 0;
    while (c < breaks.length && v >= breaks[c]!) c++;
    out[i] = c;
  }
  return out;
}

/** Labels of the classes made by ascending breaks: "< 10", "10 – 20", "≥ 20". */
export function breakLabels(breaks: readonly number[], decimals = 0): string[] {
  if (breaks.length === 0) return ['all values'];
  const out = [`< ${fmt(breaks[0]!, decimals)}`];
  for (let i = 1; i < breaks.length; i++)
    out.push(`${fmt(breaks[i - 1]!, decimals)} – < ${fmt(breaks[i]!, decimals)}`);
  out.push(`≥ ${fmt(breaks[breaks.length - 1]!, decimals)}`);
  return out;
}

/**
 * Grows classes into empty cells next to them (8 neighbours, `passes` times), in place. A surface has values
 * only where the cell centre is in the field; without this the boundary cells whose centres fall outside
 * would show as white notches inside the drawn boundary. The image is clipped to the boundary afterwards.
 * @example dilateClasses(new Uint8Array([0, 255, 255]), 3, 1, 1) // [0, 0, 255]
 */
export function dilateClasses(index: Uint8Array, cols: number, rows: number, passes = 2): Uint8Array {
  for (let p = 0; p < passes; p++) {
    const src = index.slice();
    for (let r = 0; r < rows; r++)
      for (let c = 0; c < cols; c++) {
        if (src[r * cols + c] !== 255) continue;
        search: for (let dr = -1; dr <= 1; dr++)
          for (let dc = -1; dc <= 1; dc++) {
            const rr = r + dr,
              cc = c + dc;
            if (rr < 0 || cc < 0 || rr >= rows || cc >= cols) continue;
            const v = src[rr * cols + cc]!;
            if (v !== 255) {
              index[r * cols + c] = v;
              break search;
            }
          }
      }
  }
  return index;
}

/**
 * A class raster as one clipped, pixelated PNG image (classes grown two cells into empty cells first, see
 * `dilateClasses`). A grid finer than a pixel is shown coarser by a whole factor, each shown cell the class of
 * the fine cell at its centre (nearest); `factor` says by how much (1: full resolution).
 * @param index class of each cell (255: none), as `classify` makes
 * @param palette colour of each class
 * @example rasterImage(f, grid, classify(values, [10, 20]), classColours('viridis', 3), 'map-2-clip')
 */
export function rasterImage(
  f: Frame,
  g: MapGrid,
  index: Uint8Array,
  palette: readonly string[],
  clipId: string,
  opacity = 1,
): { svg: string; factor: number } {
  const k = Math.max(1, Math.ceil(1 / (g.cell * f.k)));
  let shown = index;
  let cols = g.cols,
    rows = g.rows;
  if (k > 1) {
    cols = Math.ceil(g.cols / k);
    rows = Math.ceil(g.rows / k);
    shown = new Uint8Array(cols * rows);
    for (let r = 0; r < rows; r++)
      for (let c = 0; c < cols; c++)
        shown[r * cols + c] =
          index[Math.min(g.rows - 1, r * k + (k >> 1)) * g.cols + Math.min(g.cols - 1, c * k + (k >> 1))]!;
  } else shown = index.slice();
  const uri = pngDataUri(dilateClasses(shown, cols, rows), cols, rows, palette);
  const op = opacity < 1 ? ` opacity="${opacity}"` : '';
  return {
    svg:
      `<image class="raster" x="${(g.xmin - f.x0).toFixed(2)}" y="${(f.y0 - g.ymax).toFixed(2)}" width="${g.cols * g.cell}" height="${g.rows * g.cell}"${op} ` +
      `preserveAspectRatio="none" style="image-rendering:pixelated" clip-path="url(#${clipId})" href="${uri}"/>`,
    factor: k,
  };
}

/**
 * A raster layer clipped to the field: the clip path and the image in the metre group.
 * @example rasterLayer(f, parts, grid, classify(values, breaks), colours, 'map-2').svg
 */
export function rasterLayer(
  f: Frame,
  parts: readonly MapPart[],
  g: MapGrid,
  index: Uint8Array,
  palette: readonly string[],
  id: string,
  opacity = 1,
): { svg: string; factor: number } {
  const r = rasterImage(f, g, index, palette, `${id}-clip`, opacity);
  return { svg: geoGroup(f) + clipDef(f, parts, `${id}-clip`) + r.svg + '</g>', factor: r.factor };
}

/** The field as a clip path (even-odd, so holes are cut out). */
export function clipDef(f: Frame, parts: readonly MapPart[], id: string): string {
  return `<defs><clipPath id="${id}" clipPathUnits="userSpaceOnUse"><path clip-rule="evenodd" d="${partsPath(f, parts)}"/></clipPath></defs>`;
}

/** The field boundary (holes even-odd), filled pale with `filled` when nothing is drawn beneath it. */
export function boundary(f: Frame, parts: readonly MapPart[], filled = false): string {
  return `${geoGroup(f, 'boundary')}<path d="${partsPath(f, parts)}" fill="${filled ? '#f4f1e8' : 'none'}" fill-rule="evenodd" stroke="#000" stroke-width="2.2" vector-effect="non-scaling-stroke"/></g>`;
}

/** A sample on a map: where (m), its dot's fill (default white), whether it is ringed red (low), its label. */
export interface MapSample {
  x: number;
  y: number;
  fill?: string;
  low?: boolean;
  label?: string | null;
}

type Box = [number, number, number, number];

/** Places of a label around its dot (px offsets and anchor): NE, SE, NW, SW, then E, W, N, S. */
const SPOTS: [number, number, 'start' | 'end' | 'middle'][] = [
  [6, -5, 'start'],
  [6, 15, 'start'],
  [-6, -5, 'end'],
  [-6, 15, 'end'],
  [10, 4, 'start'],
  [-10, 4, 'end'],
  [0, -9, 'middle'],
  [0, 19, 'middle'],
];

/**
 * The first place of a label (`w` px wide) around (X, Y) inside `bounds` that overlaps no placed box; when none
 * is free, the first inside `bounds`; else NE.
 */
function placeLabel(
  X: number,
  Y: number,
  w: number,
  placed: BoxIndex,
  ring: number,
  bounds: Box,
): [number, number, string] {
  const H = 11;
  const box = (o: [number, number, string]): Box => {
    const x0 = o[2] === 'start' ? o[0] : o[2] === 'end' ? o[0] - w : o[0] - w / 2;
    return [x0, o[1] - H, x0 + w, o[1]];
  };
  const at = SPOTS.map(([dx, dy, a]): [number, number, string] => [
    X + dx + Math.sign(dx) * ring,
    Y + dy + Math.sign(dy) * ring,
    a,
  ]);
  const inside = (b: Box): boolean =>
    b[0] >= bounds[0] && b[1] >= bounds[1] && b[2] <= bounds[2] && b[3] <= bounds[3];
  const pick =
    at.find((o) => inside(box(o)) && !placed.overlaps(box(o))) ?? at.find((o) => inside(box(o))) ?? at[0]!;
  placed.add(box(pick));
  return pick;
}

/** A number for an SVG attribute: at most 2 decimals, no trailing zeros (1.5, 0.77). */
const attrNumber = (v: number): string => String(Number(v.toFixed(2)));

/**
 * Labels are drawn only when the labelled samples lie at least this far apart on average on the map (px; the
 * square root of the map area per labelled sample). A value label is about 25 px wide and 12 px high: closer than
 * this, labels cover one another and the surface under them, and a reader gets nothing from them. The demo
 * quarter's 62 samples are about 90 px apart; one sample an acre on a section about 27 px (labelled); the
 * benchmark section's 5000 samples about 10 px (dots only).
 */
export const MIN_LABEL_SPACING_PX = 24;

/**
 * Whether `n` labels fit the map area of `f` (see {@link MIN_LABEL_SPACING_PX}).
 * @example labelsFit(f, 62) // true for a quarter-section map 700 px wide
 */
export function labelsFit(f: Frame, n: number): boolean {
  return n === 0 || Math.sqrt((f.w * f.h) / n) >= MIN_LABEL_SPACING_PX;
}

/**
 * Sample dots (in metres, radius 4.5 px, less where samples lie closer than 18 px apart on average; low ones
 * ringed red) and their labels (in pixels, with a halo so they
 * read on any fill). Low samples are drawn last, on top. Each label takes the first of eight places around its
 * dot (NE, SE, NW, SW, E, W, N, S) that stays in the drawing and overlaps neither a label already placed, a
 * dot nor the north arrow, so dense grids (1 sample per acre) stay readable; where none is free it takes the
 * first place inside the drawing. `low` styles the labels red and bold. When the labelled samples are too dense
 * to read ({@link labelsFit} false) only the dots are drawn: callers say so in the legend.
 * @example samplePoints(f, ids.map((id, i) => ({ x: xy[2 * i], y: xy[2 * i + 1], label: id })))
 */
export function samplePoints(
  f: Frame,
  samples: readonly MapSample[],
  opts: { lowLabels?: boolean } = {},
): string {
  // dots shrink where samples crowd (to a quarter of their mean spacing, 1.5 px at least) so the map stays visible
  const rPx = Math.min(4.5, Math.max(1.5, Math.sqrt((f.w * f.h) / Math.max(1, samples.length)) / 4));
  const r = rPx / f.k;
  const order = samples
    .map((_, i) => i)
    .sort((a, b) => Number(!!samples[a]!.low) - Number(!!samples[b]!.low));
  let dots = '';
  let rings = '';
  let texts = '';
  const labelled = samples.reduce((n, s) => n + (s.label === null || s.label === undefined ? 0 : 1), 0);
  const drawLabels = labelsFit(f, labelled);
  const placed = new BoxIndex();
  if (drawLabels)
    for (const s of samples) placed.add([px(f, s.x) - 4, py(f, s.y) - 4, px(f, s.x) + 4, py(f, s.y) + 4]);
  placed.add([f.left + f.w - 52, f.top, f.left + f.w, f.top + 74]); // the north arrow
  const bounds: Box = [2, f.top - 12, f.left + f.w + 14, f.top + f.h + 8];
  const CH = opts.lowLabels ? 7.2 : 6.3; // approximate glyph width at the labels' size
  for (const i of order) {
    const s = samples[i]!;
    const cx = (s.x - f.x0).toFixed(1),
      cy = (f.y0 - s.y).toFixed(1);
    dots += `<circle cx="${cx}" cy="${cy}" r="${r.toPrecision(3)}"${s.fill ? ` fill="${esc(s.fill)}"` : ''}/>`;
    if (s.low) rings += `<circle cx="${cx}" cy="${cy}" r="${((2 * rPx) / f.k).toPrecision(3)}"/>`;
    if (s.label === null || s.label === undefined || !drawLabels) continue;
    const p = placeLabel(px(f, s.x), py(f, s.y), s.label.length * CH, placed, s.low ? 4 : 0, bounds);
    texts += `<text x="${p[0].toFixed(1)}" y="${p[1].toFixed(1)}"${p[2] !== 'start' ? ` text-anchor="${p[2]}"` : ''}>${esc(s.label)}</text>`;
  }
  return (
    `${geoGroup(f, 'samples')}<g fill="#fff" stroke="#000" stroke-width="${attrNumber(rPx / 3)}" class="sample-dots">${dots}</g>` +
    (rings
      ? `<g fill="none" stroke="${LOW_RED}" stroke-width="${attrNumber((2.5 * rPx) / 4.5)}" class="low-rings">${rings}</g>`
      : '') +
    `</g><g class="sample-labels${opts.lowLabels ? ' low' : ''}">${texts}</g>`
  );
}

/**
 * A note in a box in the middle of the map area (in pixels), e.g. why a map could not be made.
 * @example noteBox(f, 'No chance map', 'ordinary kriging is refused: only 20 samples')
 */
export function noteBox(f: Frame, title: string, text: string): string {
  const cx = f.left + f.w / 2,
    cy = f.top + f.h / 2;
  const lines = wrapWords(`${text.charAt(0).toUpperCase()}${text.slice(1)}.`, 60);
  const w = 460,
    h = 38 + 17 * lines.length;
  return (
    `<g class="note"><rect x="${(cx - w / 2).toFixed(1)}" y="${(cy - h / 2).toFixed(1)}" width="${w}" height="${h}" rx="6" fill="#fff" fill-opacity="0.94" stroke="#b10026" stroke-width="2"/>` +
    `<text x="${cx.toFixed(1)}" y="${(cy - h / 2 + 24).toFixed(1)}" text-anchor="middle" font-size="16" font-weight="700" fill="#b10026">${esc(title)}</text>` +
    lines
      .map(
        (l, i) =>
          `<text x="${cx.toFixed(1)}" y="${(cy - h / 2 + 44 + 17 * i).toFixed(1)}" text-anchor="middle" font-size="13">${esc(l)}</text>`,
      )
      .join('') +
    '</g>'
  );
}

/**
 * Placed label boxes [x0, y0, x1, y1] (px) in a uniform hash of 64 px cells, so that asking whether a new box
 * overlaps any placed one looks only at boxes nearby (thousands of samples: linear instead of quadratic).
 * The answer is the same as testing every placed box.
 */
export class BoxIndex {
  private cells = new Map<number, [number, number, number, number][]>();
  private static readonly S = 64;
  private keys(b: readonly number[], fn: (key: number) => boolean | void): boolean {
    const S = BoxIndex.S;
    for (let gy = Math.floor(b[1]! / S); gy <= Math.floor(b[3]! / S); gy++) {
      for (let gx = Math.floor(b[0]! / S); gx <= Math.floor(b[2]! / S); gx++)
        if (fn((gy + 4096) * 8192 + gx + 4096)) return true;
    }
    return false;
  }
  add(b: [number, number, number, number]): void {
    this.keys(b, (k) => {
      const l = this.cells.get(k);
      if (l) l.push(b);
      else this.cells.set(k, [b]);
    });
  }
  overlaps(box: readonly [number, number, number, number]): boolean {
    return this.keys(box, (k) =>
      (this.cells.get(k) ?? []).some((b) => box[0] < b[2] && b[0] < box[2] && box[1] < b[3] && b[1] < box[3]),
    );
  }
}
