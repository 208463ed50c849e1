/**
 * Worksheet extent before the spreadsheet library reads a sheet (src/io/xlsx.ts checkSheetExtent): the library
 * fills every gap up to the last row and column, so a damaged row number (found by the fuzzer: `<row r="1e999">`
 * ran a worker out of memory) must be refused first. Limits: Excel's 1 048 576 rows and 16 384 columns
 * ([published] Microsoft, Excel specifications and limits) and tilth's 5 000 000-cell span.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { unzipSync, zipSync } from 'fflate';
import { describe, expect, it } from 'vitest';
import { readXlsxRecords, XLSX_MAX_SPAN } from '../../src/io/xlsx.js';
import { ROOT } from '../helpers/cli.js';

const FIXTURE = join(ROOT, 'tests/fixtures/labs/29-xlsx-typed-cells.xlsx');

/** The fixture with its first sheet's XML edited. */
function edited(edit: (xml: string) => string): Uint8Array {
  const parts = unzipSync(new Uint8Array(readFileSync(FIXTURE)));
  const k = Object.keys(parts).find((n) => /worksheets\/sheet1\.xml$/.test(n))!;
  const before = new TextDecoder().decode(parts[k]);
  const after = edit(before);
  expect(after).not.toBe(before);
  parts[k] = new TextEncoder().encode(after);
  return zipSync(parts);
}

const read = (b: Uint8Array) => readXlsxRecords(b, 'lab.xlsx', []);

describe('worksheet extent', () => {
  it('the fixture reads as before', async () => {
    expect((await read(new Uint8Array(readFileSync(FIXTURE)))).records.length).toBe(12);
  });

  const cases: [string, (x: string) => string, RegExp][] = [
    [
      'row numbered 1e999',
      (x) => x.replace('<row r="12"', '<row r="1e999"'),
      /row numbered "1e999" \(not a whole number\)/,
    ],
    [
      'row numbered by an entity',
      (x) => x.replace('<row r="12"', '<row r="1&#50;"'),
      /row numbered "1&#50;"/,
    ],
    ['row beyond 1 048 576', (x) => x.replace(/<row r="16"/, '<row r="9999999"'), /more than 1,048,576 rows/],
    [
      'cell beyond column XFD',
      (x) => x.replace('r="I16"', 'r="XFE16"'),
      /cell at "XFE16", outside any spreadsheet/,
    ],
    ['cell reference that is no reference', (x) => x.replace('r="I16"', 'r="I1e9"'), /cell at "I1e9"/],
    [
      'a last row and column spanning more than 5 million cells',
      (x) => x.replace('<row r="16"', '<row r="1000000"').replace(/r="([A-L])16"/g, 'r="$11000000"'),
      new RegExp(
        `spans 1,000,000 rows x 12 columns, more than the ${XLSX_MAX_SPAN.toLocaleString('en-US')} cells`,
      ),
    ],
  ];
  for (const [what, edit, re] of cases)
    it(`${what}: a user error naming the part and the fix, before the library reads it`, async () => {
      await expect(read(edited(edit))).rejects.toThrow(re);
      await expect(read(edited(edit))).rejects.toThrow(
        /lab\.xlsx: part xl\/worksheets\/sheet1\.xml .*Fix: open the workbook/,
      );
    });
});
