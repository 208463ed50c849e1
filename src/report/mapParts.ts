/**
 * Building blocks of the report's maps: classes of a raster and their labels, the raster as a clipped PNG
 * image, the field boundary, sample dots with labels placed clear of each other.
 */
import { esc, fmt } from '../draw/escape.js';
import { type Frame, geoGroup, partsPath, px, py } from './frame.js';
import { pngDataUri } from '../draw/png.js';
import type { ReportInput, ReportNutrient, ReportPart, ReportRaster } from './types.js';

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

export function rasterImage(
  f: Frame,
  r: ReportRaster,
  index: Uint8Array,
  palette: readonly string[],
  clipId: string,
): string {
  const g = r.grid;
  const uri = pngDataUri(dilateClasses(index, g.cols, g.rows), g.cols, g.rows, palette);
  return (
    `<image class="raster" x="${(g.xmin - f.x0).toFixed(2)}" y="${(f.y0 - g.ymax).toFixed(2)}" width="${g.cols * g.cell}" height="${g.rows * g.cell}" ` +
    `preserveAspectRatio="none" style="image-rendering:pixelated" clip-path="url(#${clipId})" href="${uri}"/>`
  );
}

export function clipDef(f: Frame, parts: readonly ReportPart[], id: string): string {
  return `<defs><clipPath id="${id}" clipPathUnits="userSpaceOnUse"><path clip-rule="evenodd" d="${partsPath(f, parts)}"/></clipPath></defs>`;
}

export function boundary(f: Frame, parts: readonly ReportPart[]): string {
  return `${geoGroup(f, ' class="boundary"')}<path d="${partsPath(f, parts)}" fill="none" fill-rule="evenodd" stroke="#000" stroke-width="2.2" vector-effect="non-scaling-stroke"/></g>`;
}

/**
 * Sample dots (in metres) and their labels (in pixels, with a halo so they read on any fill). Each label takes
 * the first of four places around its dot (NE, SE, NW, SW) that does not overlap a label already placed, so
 * dense grids (1 sample per acre) stay readable; where none is free it goes NE.
 */
export function samplePoints(f: Frame, input: ReportInput, label: (i: number) => string | null): string {
  const { xy, ids } = input.samples;
  const r = 4.5 / f.k;
  let dots = '';
  let texts = '';
  const placed = new BoxIndex();
  const CH = 6.3,
    H = 11; // approximate glyph width and height at 11 px
  for (let i = 0; i < ids.length; i++) {
    const x = xy[2 * i]!;
    const y = xy[2 * i + 1]!;
    dots += `<circle cx="${(x - f.x0).toFixed(1)}" cy="${(f.y0 - y).toFixed(1)}" r="${r.toPrecision(3)}"/>`;
    const t = label(i);
    if (t === null) continue;
    const X = px(f, x),
      Y = py(f, y),
      w = t.length * CH;
    const options: [number, number, string][] = [
      [X + 6, Y - 5, 'start'],
      [X + 6, Y + 14, 'start'],
      [X - 6, Y - 5, 'end'],
      [X - 6, Y + 14, 'end'],
    ];
    let pick = options[0]!;
    for (const o of options) {
      const box: [number, number, number, number] =
        o[2] === 'start' ? [o[0], o[1] - H, o[0] + w, o[1]] : [o[0] - w, o[1] - H, o[0], o[1]];
      if (!placed.overlaps(box)) {
        pick = o;
        break;
      }
    }
    placed.add(
      pick[2] === 'start'
        ? [pick[0], pick[1] - H, pick[0] + w, pick[1]]
        : [pick[0] - w, pick[1] - H, pick[0], pick[1]],
    );
    texts += `<text x="${pick[0].toFixed(1)}" y="${pick[1].toFixed(1)}"${pick[2] === 'end' ? ' text-anchor="end"' : ''}>${esc(t)}</text>`;
  }
  return (
    `${geoGroup(f, ' class="samples"')}<g fill="#fff" stroke="#000" stroke-width="1.5" class="sample-dots">${dots}</g></g>` +
    `<g class="sample-labels">${texts}</g>`
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

export function valueLabel(n: ReportNutrient, v: number, cens: number): string | null {
  if (!Number.isFinite(v)) return null;
  return (cens < 0 ? '<' : cens > 0 ? '>' : '') + fmt(v, n.decimals ?? 0);
}
