/** A synthetic sulphate-S field for the variability tests (invented: plumbing, not agronomy). */
import type { Analyte, Field, Samples } from '../../src/types.js';

/** A synthetic field: 800 m square, 7 x 7 samples, sulphate high on the west, low patch in the south-east. */
export function syntheticField(): { samples: Samples; field: Field } {
  const ids: string[] = [];
  const xy: number[] = [];
  const s: number[] = [];
  for (let i = 0; i < 7; i++)
    for (let j = 0; j < 7; j++) {
      const x = 500000 + 57 + i * 114,
        y = 5700000 + 57 + j * 114;
      ids.push(`S${i * 7 + j + 1}`);
      xy.push(x, y);
      s.push(i >= 5 && j <= 1 ? 8 + i + j : 45 - 3 * i + 2 * Math.sin(i * 7.3 + j * 3.1));
    }
  const n = ids.length;
  const nan = () => new Float64Array(n).fill(NaN);
  const zero = () => new Int8Array(n);
  const values = {
    no3_n: nan(),
    p: nan(),
    k: nan(),
    so4_s: new Float64Array(s),
    om: nan(),
    ph: nan(),
  } as Record<Analyte, Float64Array>;
  const censored = { no3_n: zero(), p: zero(), k: zero(), so4_s: zero(), om: zero(), ph: zero() } as Record<
    Analyte,
    Int8Array
  >;
  const samples: Samples = {
    ids,
    lonlat: new Float64Array(2 * n),
    xy: new Float64Array(xy),
    values,
    censored,
    texture: ids.map(() => null),
    zone: ids.map(() => null),
    pMethod: 'olsen',
    origin: ids.map((_, i) => `synthetic row ${i + 1}`),
  };
  const ring = new Float64Array([
    500000, 5700000, 500800, 5700000, 500800, 5700800, 500000, 5700800, 500000, 5700000,
  ]);
  const field: Field = {
    name: 'synthetic',
    lonlat: [],
    parts: [{ exterior: ring, holes: [] }],
    utm: { zone: 13, south: false, epsg: 32613, proj4: '+proj=utm +zone=13 +datum=WGS84 +units=m +no_defs' },
    areaM2: 640000,
    bbox: [500000, 5700000, 500800, 5700800],
  };
  return { samples, field };
}
