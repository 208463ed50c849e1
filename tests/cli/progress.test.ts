import { describe, expect, it } from 'vitest';
import { createTerminal, type TermStream } from '../../src/cli/progress.js';

function fake(isTTY: boolean): TermStream & { text: string } {
  const s = {
    text: '',
    isTTY,
    columns: 100,
    write(t: string) {
      s.text += t;
      return true;
    },
  };
  return s;
}
// a clock that moves 100 ms per reading, so every update redraws
function clock(): () => number {
  let t = 0;
  return () => (t += 100);
}
const ESC = '\x1b[';

describe('terminal progress', () => {
  it('on a TTY draws a redrawn bar (carriage return) and a coloured tick when done', () => {
    const s = fake(true);
    const term = createTerminal({ stream: s, env: {}, now: clock() });
    const t = term.task('interpolation', 4);
    t.onProgress(2, 4);
    expect(s.text).toContain('\r');
    expect(s.text).toContain('[############------------]  50%');
    t.done('6 nutrients');
    expect(s.text).toMatch(/\x1b\[32m✓\x1b\[39m interpolation .*6 nutrients\n$/);
    expect(term.color).toBe(true);
  });

  it('honours NO_COLOR (no-color.org: set and not empty disables colour) but keeps the bar', () => {
    const s = fake(true);
    const term = createTerminal({ stream: s, env: { NO_COLOR: '1' }, now: clock() });
    const t = term.task('polygon tracing', 10);
    t.update(10);
    t.done();
    term.summary('Prescription', [['zones', '14']]);
    term.warn('low S');
    expect(s.text).not.toContain(ESC + '3');
    expect(s.text).not.toContain(ESC + '1m');
    expect(s.text).toContain('100%');
    expect(s.text).toContain('zones  14');
    expect(createTerminal({ stream: fake(true), env: { NO_COLOR: '' } }).color).toBe(true);
    expect(createTerminal({ stream: fake(true), env: { TERM: 'dumb' } }).color).toBe(false);
  });

  it('when not a TTY prints plain lines only: no carriage returns, no escape codes', () => {
    const s = fake(false);
    const term = createTerminal({ stream: s, env: {}, now: clock() });
    const t = term.task('cross-validation', 3);
    t.update(1);
    t.update(2);
    t.done();
    term.line('wrote out/prescription.geojson');
    term.summary('Totals', [['MAP', '3 120 lb']]);
    expect(s.text).not.toContain('\r');
    expect(s.text).not.toContain('\x1b');
    expect(s.text.split('\n')[0]).toMatch(/^cross-validation: done in \d+ ms$/);
    expect(s.text).toContain('wrote out/prescription.geojson\n');
    expect(s.text).toContain('Totals\n  MAP  3 120 lb\n');
  });

  it('--quiet prints nothing but warnings', () => {
    for (const tty of [true, false]) {
      const s = fake(tty);
      const term = createTerminal({ stream: s, env: {}, quiet: true, now: clock() });
      const t = term.task('interpolation', 2);
      t.update(1);
      t.fail('bad');
      term.line('hello');
      term.summary('x', [['a', 'b']]);
      expect(s.text).toBe('');
      term.warn('sulphate-S is low in 4 samples');
      expect(s.text).toMatch(/warning:.* sulphate-S is low in 4 samples\n$/);
    }
  });

  it('a message during a bar clears the bar first, so lines never mix', () => {
    const s = fake(true);
    const term = createTerminal({ stream: s, env: { NO_COLOR: '1' }, now: clock() });
    term.task('interpolation', 2).update(1);
    term.warn('x');
    expect(s.text).toMatch(/\r\x1b\[2Kwarning: x\n$/);
  });
});
