/** A small hand-made ISO 11783-10 task data set for tests (not part of the library). */
import { encodeInt32LE, type TaskData } from '../../src/io/isoxml/index.js';

/** A closed square ring of side d degrees from (x, y). */
export const sq = (x: number, y: number, d: number) =>
  Float64Array.of(x, y, x + d, y, x + d, y + d, x, y + d, x, y);
/** A small hand-made task data set: two zones of one granular product, or a 2 x 2 type-2 grid. */
export function sample(grid = false): TaskData {
  const z = (code: number, value: number, x: number) => ({
    code,
    name: `zone ${code}`,
    polygons: grid || code === 0 ? [] : [{ type: 2, exterior: sq(x, 52, 0.001), holes: [] }],
    values: [{ ddi: 6, value, productId: 'PDT1', valuePresentationId: null }],
  });
  return {
    versionMajor: 4,
    versionMinor: 3,
    software: { manufacturer: 'test', version: '1' },
    customers: [{ id: 'CTR1', name: 'c' }],
    farms: [{ id: 'FRM1', name: 'f', customerId: 'CTR1' }],
    partfields: [],
    products: [{ id: 'PDT1', name: 'urea', type: 1 }],
    valuePresentations: [],
    tasks: [
      {
        id: 'TSK1',
        name: 't',
        status: 1,
        defaultZone: 0,
        positionLostZone: 0,
        outOfFieldZone: 0,
        zones: grid ? [z(0, 0, 0), z(1, 0, 0)] : [z(0, 0, 0), z(1, 11209, -106), z(2, 5604, -105.999)],
        grid: grid
          ? {
              type: 2,
              south: 52,
              west: -106,
              cellNorth: 0.001,
              cellEast: 0.001,
              cols: 2,
              rows: 2,
              fileName: 'GRD00001',
              zoneCode: 1,
              data: encodeInt32LE(Int32Array.of(100, 200, 300, 0)),
            }
          : null,
      },
    ],
  };
}
