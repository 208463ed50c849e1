/**
 * Escaping: CSV cells a spreadsheet would run as formulas (OWASP "CSV Injection": cells starting = + - @ tab CR),
 * RFC 4180 quoting, and terminal control sequences (ECMA-48 CSI / OSC) kept out of what is printed.
 */
import { describe, expect, it } from 'vitest';
import { csvCell } from '../../../src/io/csv-escape.js';
import { terminalSafe } from '../../../src/cli/safety/stdio.js';

describe('csvCell (OWASP CSV Injection; RFC 4180 quoting)', () => {
  it.each([
    ['=HYPERLINK("http://x")', `"'=HYPERLINK(""http://x"")"`],
    ['+1+cmd', "'+1+cmd"],
    ['-2+3', "'-2+3"],
    ['@SUM(A1)', "'@SUM(A1)"],
    ['\t=1', "'\t=1"],
    ['\r=1', `"'\r=1"`],
  ])('neutralises %j', (input, expected) => expect(csvCell(input)).toBe(expected));
  it('leaves numbers and number text alone, quotes commas and quotes', () => {
    expect(csvCell(-3.5)).toBe('-3.5');
    expect(csvCell('-3.5')).toBe('-3.5');
    expect(csvCell('+12')).toBe('+12');
    expect(csvCell('-1e-3')).toBe('-1e-3');
    expect(csvCell('a,b')).toBe('"a,b"');
    expect(csvCell('say "hi"')).toBe('"say ""hi"""');
    expect(csvCell(null)).toBe('');
    expect(csvCell('zone A')).toBe('zone A');
  });
});

describe('terminalSafe (ECMA-48 control functions removed)', () => {
  it('removes CSI and OSC sequences, C0/C1 controls and CR; keeps tab, newline and text', () => {
    expect(terminalSafe('zone \u001b[31mA\u001b[0m')).toBe('zone A');
    expect(terminalSafe('x\u001b[2Jy')).toBe('xy');
    expect(terminalSafe('a\u001b]0;title\u0007b')).toBe('ab');
    expect(terminalSafe('ok\rFAKE')).toBe('okFAKE');
    expect(terminalSafe('a\u0000b\u0085c\u007f')).toBe('abc');
    expect(terminalSafe('l1\n\tl2 é')).toBe('l1\n\tl2 é');
  });
});

describe('DBF text cells (dBASE: 0x1A ends the file; NUL and line breaks split text in readers)', () => {
  it('control characters in a text cell are written as spaces', async () => {
    const { encodeDbf } = await import('../../../src/io/shapefile/dbf.js');
    const dbf = encodeDbf(
      [{ name: 'zone', type: 'C', width: 20, decimals: 0 }],
      [['A\u001aB\u0000C\nD\u001b[2J']],
    );
    const headerLen = new DataView(dbf.buffer, dbf.byteOffset).getUint16(8, true);
    const cell = dbf.subarray(headerLen + 1, headerLen + 21);
    expect([...cell].some((b) => b < 0x20 || b === 0x7f)).toBe(false);
    expect(new TextDecoder().decode(cell)).toBe('A B C D [2J'.padEnd(20, ' '));
  });
});
