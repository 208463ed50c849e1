/**
 * Esri ASCII grid (.asc) text and its .prj, as GDAL's AAIGrid driver reads and writes them.
 * Header: ncols, nrows, xllcorner, yllcorner (lower-left corner of the lower-left cell), cellsize,
 * NODATA_value; then rows north to south, values separated by spaces.
 */
import type { GridShape } from './idw.js';

/** NODATA value written for cells without a value. */
export const ASC_NODATA = -9999;

/** Options for {@link formatAsc}. */
export interface AscOptions {
  /** decimals kept (rounded half away from zero; trailing zeros dropped; default 3) */
  decimals?: number;
  /** value written for NaN (default -9999) */
  nodata?: number;
}

/**
 * An Esri ASCII grid as bytes (US-ASCII). Numbers are written digit by digit into one buffer
 * (no per-value string), which is what keeps a 2.6 million cell grid fast to write.
 * @param grid grid geometry (xmin, ymax, cell, cols, rows)
 * @param values row-major north-up values, NaN = no value
 * @param opts decimals 3, nodata -9999
 * @example writeFileAtomic('p.asc', formatAsc(grid, values, { decimals: 2 }))
 */
export function formatAsc(grid: GridShape, values: ArrayLike<number>, opts: AscOptions = {}): Uint8Array {
  const decimals = Math.max(0, Math.min(12, Math.floor(opts.decimals ?? 3)));
  const nodata = opts.nodata ?? ASC_NODATA;
  const { cols, rows, cell, xmin, ymax } = grid;
  const header = `ncols ${cols}\nnrows ${rows}\nxllcorner ${num(xmin)}\nyllcorner ${num(ymax - rows * cell)}\ncellsize ${num(cell)}\nNODATA_value ${num(nodata)}\n`;
  const scale = 10 ** decimals;
  let maxAbs = Math.abs(nodata);
  for (let i = 0; i < values.length; i++) {
    const a = Math.abs(values[i]);
    if (a > maxAbs) maxAbs = a;
  }
  const intDigits = Math.max(1, Math.ceil(Math.log10(maxAbs + 1)) + 1);
  const per = 2 + intDigits + 1 + decimals + 1; // space, sign, digits, point, decimals, spare
  const out = new Uint8Array(header.length + cols * rows * per + rows + 16);
  let p = 0;
  for (let i = 0; i < header.length; i++) out[p++] = header.charCodeAt(i);
  const tmp = new Uint8Array(24);
  const safe = maxAbs * scale < 2 ** 52;
  for (let r = 0; r < rows; r++) {
    for (let c = 0; c < cols; c++) {
      if (c > 0) out[p++] = 32;
      let v = values[r * cols + c];
      if (Number.isNaN(v)) v = nodata;
      if (!safe || !Number.isFinite(v)) {
        const s = Number.isFinite(v) ? Number(v.toFixed(decimals)).toString() : String(nodata);
        for (let k = 0; k < s.length; k++) out[p++] = s.charCodeAt(k);
        continue;
      }
      let m = Math.round(Math.abs(v) * scale);
      if (m === 0) {
        out[p++] = 48;
        continue;
      }
      if (v < 0) out[p++] = 45;
      // digits of m, least significant first, dropping trailing fraction zeros
      let t = 0,
        d = 0,
        frac = decimals;
      while (frac > 0 && m % 10 === 0) {
        m = m / 10;
        frac--;
        d++;
      }
      const fracDigits = decimals - d;
      let written = 0;
      while (m > 0 || written <= fracDigits) {
        if (written === fracDigits && fracDigits > 0) tmp[t++] = 46;
        const q = Math.floor(m / 10);
        tmp[t++] = 48 + (m - q * 10);
        m = q;
        written++;
      }
      while (t > 0) out[p++] = tmp[--t];
    }
    out[p++] = 10;
  }
  return out.subarray(0, p);
}

function num(x: number): string {
  return Number.isInteger(x) ? x.toFixed(1) : String(x);
}

/**
 * Parses Esri ASCII grid text (for tests and for reading reference grids); NODATA cells become NaN.
 * Handles xllcenter/yllcenter headers too.
 * @example const { grid, values } = readAsc(text)
 */
export function readAsc(text: string): { grid: GridShape; values: Float64Array; nodata: number | null } {
  const tokens = text.split(/\s+/).filter(Boolean);
  const h: Record<string, number> = {};
  let i = 0;
  while (i < tokens.length && /^[a-z_]/i.test(tokens[i])) {
    h[tokens[i].toLowerCase()] = Number(tokens[i + 1]);
    i += 2;
  }
  const cols = h.ncols,
    rows = h.nrows,
    cell = h.cellsize;
  const xmin = h.xllcorner ?? h.xllcenter - cell / 2;
  const ymin = h.yllcorner ?? h.yllcenter - cell / 2;
  const nodata = h.nodata_value ?? null;
  const values = new Float64Array(cols * rows);
  for (let k = 0; k < cols * rows; k++) {
    const v = Number(tokens[i + k]);
    values[k] = nodata !== null && v === nodata ? NaN : v;
  }
  return { grid: { xmin, ymax: ymin + rows * cell, cell, cols, rows }, values, nodata };
}
