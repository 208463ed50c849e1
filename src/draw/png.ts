/**
 * A minimal indexed-colour PNG encoder (ISO/IEC 15948, PNG 2nd edition) for class rasters.
 *
 * Why hand-written: the report embeds rasters of up to ~10^6 cells as data-URI images so the HTML stays
 * small and self-contained; a palette PNG of class indices compresses a 160 ac field at 2 m cells
 * (~160 000 cells) to a few kilobytes, where one SVG rect per cell would be megabytes. The only hard part,
 * DEFLATE, comes from fflate; the container is five chunks and a CRC.
 */
import { zlibSync } from 'fflate';

let CRC_TABLE: Uint32Array | null = null;

/** CRC-32 (ISO 3309 / ITU-T V.42 polynomial 0xEDB88320), as PNG chunks use. */
export function crc32(bytes: Uint8Array, start = 0, end = bytes.length): number {
  if (!CRC_TABLE) {
    CRC_TABLE = new Uint32Array(256);
    for (let n = 0; n < 256; n++) {
      let c = n;
      for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
      CRC_TABLE[n] = c >>> 0;
    }
  }
  let c = 0xffffffff;
  for (let i = start; i < end; i++) c = CRC_TABLE[(c ^ bytes[i]!) & 0xff]! ^ (c >>> 8);
  return (c ^ 0xffffffff) >>> 0;
}

function chunk(type: string, data: Uint8Array): Uint8Array {
  const out = new Uint8Array(12 + data.length);
  const dv = new DataView(out.buffer);
  dv.setUint32(0, data.length);
  for (let i = 0; i < 4; i++) out[4 + i] = type.charCodeAt(i);
  out.set(data, 8);
  dv.setUint32(8 + data.length, crc32(out, 4, 8 + data.length));
  return out;
}

/**
 * Encodes a raster of palette indices as an 8-bit indexed PNG.
 * `index` is row-major, top row first; an index >= palette.length (e.g. 255) is fully transparent.
 * @param palette colours as "#rrggbb", at most 255
 * @example encodeIndexedPng(new Uint8Array([0, 1, 255, 0]), 2, 2, ['#440154', '#fde725'])
 */
export function encodeIndexedPng(
  index: Uint8Array,
  width: number,
  height: number,
  palette: readonly string[],
): Uint8Array {
  if (palette.length > 255) throw new Error(`encodeIndexedPng: ${palette.length} colours, at most 255`);
  if (index.length !== width * height)
    throw new Error(`encodeIndexedPng: ${index.length} cells for ${width} x ${height}`);
  const ihdr = new Uint8Array(13);
  const dv = new DataView(ihdr.buffer);
  dv.setUint32(0, width);
  dv.setUint32(4, height);
  ihdr[8] = 8; // bit depth
  ihdr[9] = 3; // colour type: indexed
  // compression 0, filter 0, interlace 0
  const n = palette.length + 1; // + one transparent entry
  const plte = new Uint8Array(3 * n);
  palette.forEach((h, i) => {
    const v = parseInt(h.slice(1), 16);
    plte[3 * i] = (v >> 16) & 255;
    plte[3 * i + 1] = (v >> 8) & 255;
    plte[3 * i + 2] = v & 255;
  });
  const trns = new Uint8Array(n).fill(255);
  trns[n - 1] = 0;
  const transparent = n - 1;
  const raw = new Uint8Array(height * (width + 1));
  for (let r = 0; r < height; r++) {
    const o = r * (width + 1);
    raw[o] = 0; // filter: none (the rows are runs of equal classes; DEFLATE handles them well)
    for (let c = 0; c < width; c++) {
      const v = index[r * width + c]!;
      raw[o + 1 + c] = v < palette.length ? v : transparent;
    }
  }
  const parts = [
    new Uint8Array([137, 80, 78, 71, 13, 10, 26, 10]),
    chunk('IHDR', ihdr),
    chunk('PLTE', plte),
    chunk('tRNS', trns),
    chunk('IDAT', zlibSync(raw, { level: 6 })),
    chunk('IEND', new Uint8Array(0)),
  ];
  const out = new Uint8Array(parts.reduce((s, p) => s + p.length, 0));
  let o = 0;
  for (const p of parts) {
    out.set(p, o);
    o += p.length;
  }
  return out;
}

/** Base64 of bytes (RFC 4648), without Node's Buffer so the library runs anywhere. */
export function base64(bytes: Uint8Array): string {
  // Node's encoder (RFC 4648) when present: about 40 times faster than btoa over a binary string
  const B = (
    globalThis as {
      Buffer?: {
        from(b: ArrayBufferView['buffer'], o: number, l: number): { toString(enc: string): string };
      };
    }
  ).Buffer;
  if (B) return B.from(bytes.buffer, bytes.byteOffset, bytes.byteLength).toString('base64');
  let s = '';
  for (let i = 0; i < bytes.length; i += 0x8000) s += String.fromCharCode(...bytes.subarray(i, i + 0x8000));
  return btoa(s);
}

/** Bytes of a base64 string (RFC 4648). */
export function fromBase64(text: string): Uint8Array {
  const B = (globalThis as { Buffer?: { from(t: string, enc: string): Uint8Array } }).Buffer;
  if (B) return new Uint8Array(B.from(text, 'base64'));
  const s = atob(text);
  const out = new Uint8Array(s.length);
  for (let i = 0; i < s.length; i++) out[i] = s.charCodeAt(i);
  return out;
}

/** A `data:image/png;base64,` URI of an indexed PNG (see `encodeIndexedPng`). */
export function pngDataUri(
  index: Uint8Array,
  width: number,
  height: number,
  palette: readonly string[],
): string {
  return 'data:image/png;base64,' + base64(encodeIndexedPng(index, width, height, palette));
}
