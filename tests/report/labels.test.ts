/**
 * The label-box index the report's sample maps use: its overlap answer equals testing every placed box
 * (the brute-force oracle), for boxes anywhere, including negative and far-away pixel coordinates.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { BoxIndex } from '../../src/draw/layers.js';

type Box = [number, number, number, number];
const boxArb = fc
  .tuple(
    fc.double({ min: -300, max: 1200, noNaN: true }),
    fc.double({ min: -300, max: 1200, noNaN: true }),
    fc.double({ min: 0, max: 120, noNaN: true }),
    fc.double({ min: 0, max: 30, noNaN: true }),
  )
  .map(([x, y, w, h]): Box => [x, y, x + w, y + h]);

describe('BoxIndex (report label placement)', () => {
  it('overlaps() equals a scan of every placed box', () => {
    fc.assert(
      fc.property(
        fc.array(boxArb, { maxLength: 80 }),
        fc.array(boxArb, { minLength: 1, maxLength: 40 }),
        (placed, queries) => {
          const ix = new BoxIndex();
          for (const b of placed) ix.add(b);
          for (const q of queries) {
            const brute = placed.some((b) => q[0] < b[2] && b[0] < q[2] && q[1] < b[3] && b[1] < q[3]);
            expect(ix.overlaps(q)).toBe(brute);
          }
        },
      ),
      { numRuns: 200, seed: 31 },
    );
  });
});
