/**
 * Zip limits (src/io/zip.ts): checked from the central directory and again while unpacking, because headers
 * can lie. Numbers: docs/reliability.md. Zip structure per PKWARE APPNOTE 6.3.10 (sections 4.3.7, 4.3.12, 4.3.16).
 */
import { zipSync } from 'fflate';
import { describe, expect, it } from 'vitest';
import { readZip, TASKDATA_ZIP_LIMITS, zipFiles, ZIP_MAX_RATIO } from '../../src/io/zip.js';
import { layersFromTaskDataFiles } from '../../src/check/taskdata.js';
import { encodeInt32LE, taskDataFiles } from '../../src/io/isoxml/index.js';
import { sample } from '../helpers/taskdata.js';
import { shapefileInZip } from '../../src/io/inputs.js';
import { lyingSizes } from '../../scripts/fuzz/targets.js';

const zeros = (n: number) => new Uint8Array(n);

describe('readZip limits', () => {
  it('reads an ordinary archive', () => {
    const z = zipSync({
      'a.dbf': Uint8Array.from([4, 5, 6]),
      'dir/b.prj': new TextEncoder().encode('GEOGCS'),
    });
    const e = readZip(z, 'a.zip');
    expect([...e['a.dbf']!]).toEqual([4, 5, 6]);
    expect(new TextDecoder().decode(e['dir/b.prj'])).toBe('GEOGCS');
  });
  it('an honest bomb is refused from its headers, before unpacking', () => {
    const z = zipSync({ 'x.shp': zeros(20 * 1024 * 1024) }, { level: 9 });
    expect(() => readZip(z, 'bomb.zip')).toThrow(
      new RegExp(`more than ${ZIP_MAX_RATIO} times its packed size`),
    );
  });
  it('a bomb whose headers lie (100 bytes) is stopped while unpacking', () => {
    const z = lyingSizes(zipSync({ 'x.shp': zeros(20 * 1024 * 1024) }, { level: 9 }));
    expect(() => readZip(z, 'bomb.zip')).toThrow(/unpacks more than 200 times its size/);
  });
  it('a total above the limit is refused (limit lowered for the test)', () => {
    const z = zipSync({ 'a.bin': zeros(3000), 'b.bin': zeros(3000) }, { level: 0 });
    expect(() => readZip(z, 'big.zip', { maxTotalBytes: 4000 })).toThrow(
      /unpacks to 6000 bytes, more than the 4000 bytes/,
    );
    expect(() => readZip(lyingSizes(z), 'big.zip', { maxTotalBytes: 4000 })).toThrow(
      /unpacks to more than 4000 bytes/,
    );
  });
  it('too many entries, and an entry escaping the folder', () => {
    const many: Record<string, Uint8Array> = {};
    for (let i = 0; i < 30; i++) many[`f${i}`] = zeros(1);
    expect(() => readZip(zipSync(many), 'n.zip', { maxEntries: 20 })).toThrow(/30 entries, more than the 20/);
    expect(() => readZip(zipSync({ '../evil.shp': zeros(1) }), 'e.zip')).toThrow(/outside the folder/);
  });
  it('small files of repeated bytes below 1 MiB pass whatever their ratio', () => {
    expect(readZip(zipSync({ 'a.dbf': zeros(512 * 1024) }, { level: 9 }), 'a.zip')['a.dbf']!.length).toBe(
      512 * 1024,
    );
  });
  it('a truncated archive is a user error', () => {
    const z = zipSync({ 'a.dbf': zeros(100) });
    expect(() => readZip(z.subarray(0, z.length - 10), 't.zip')).toThrow(/not a readable zip/);
  });
  it('the shapefile input reader goes through the same limits', () => {
    const z = lyingSizes(zipSync({ 'samples.shp': zeros(20 * 1024 * 1024) }, { level: 9 }));
    expect(() => shapefileInZip(z, 'samples.zip')).toThrow(/zip bomb/);
  });
  it('task data: a grid of equal rates packs near the deflate limit and is read; the total still bounds it', () => {
    // one rate over 512 x 512 cells: 1 MiB of one repeated 4-byte value, which deflate packs about 1000 times
    const td = sample(true);
    Object.assign(td.tasks[0]!.grid!, {
      cols: 512,
      rows: 512,
      data: encodeInt32LE(new Int32Array(512 * 512).fill(100)),
    });
    const files = taskDataFiles(td);
    const z = zipFiles(Object.fromEntries(Object.entries(files).map(([k, v]) => [`TASKDATA/${k}`, v])));
    expect(() => readZip(z, 'taskdata.zip')).toThrow(/zip bomb/); // the default 200 would refuse tilth's own file
    expect(Object.keys(readZip(z, 'taskdata.zip', TASKDATA_ZIP_LIMITS))).toContain('TASKDATA/GRD00001.bin');
    expect(layersFromTaskDataFiles({ 'taskdata.zip': z }, 'taskdata.zip')).toHaveLength(1);
    // a bomb whose headers lie is stopped by the total while unpacking (limit lowered for the test)
    const bomb = lyingSizes(zipSync({ 'TASKDATA/TASKDATA.XML': zeros(20 * 1024 * 1024) }, { level: 9 }));
    expect(() => readZip(bomb, 't.zip', { ...TASKDATA_ZIP_LIMITS, maxTotalBytes: 4 * 1024 * 1024 })).toThrow(
      /unpacks to more than 4 MiB/,
    );
  });
});
