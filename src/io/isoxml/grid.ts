/**
 * Grid (GRD) binary files: type 1 holds one byte (a treatment zone code) per cell, type 2 one
 * little-endian int32 per cell and process data value. Cells run west to east, rows south to north.
 */
import type { IsoGrid } from './model.js';

/**
 * Packs type-2 cell values (row 0 = south, `perCell` values per cell) as little-endian int32.
 * @example encodeInt32LE(Int32Array.of(1, -2)).length // 8
 */
export function encodeInt32LE(values: Int32Array): Uint8Array {
  const out = new Uint8Array(values.length * 4);
  const dv = new DataView(out.buffer);
  for (let i = 0; i < values.length; i++) dv.setInt32(i * 4, values[i], true);
  return out;
}

/** Bytes a grid's file must have: cols x rows x (1 for type 1, 4 x values per cell for type 2). */
export function gridBytes(g: Pick<IsoGrid, 'type' | 'cols' | 'rows'>, perCell: number): number {
  return g.cols * g.rows * (g.type === 1 ? 1 : 4 * perCell);
}

/**
 * A type-2 grid's values as int32 (cell-major: cell i's values at i * perCell ...), read little-endian.
 * @example decodeInt32LE(encodeInt32LE(Int32Array.of(7)))[0] // 7
 */
export function decodeInt32LE(data: Uint8Array): Int32Array {
  const dv = new DataView(data.buffer, data.byteOffset, data.byteLength);
  const out = new Int32Array(data.byteLength >> 2);
  for (let i = 0; i < out.length; i++) out[i] = dv.getInt32(i * 4, true);
  return out;
}
