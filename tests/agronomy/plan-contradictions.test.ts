/** Plans that contradict themselves are refused (common practice: a product listed twice, min_rate above max_rate). */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { defaultTables, parsePlan } from '../../src/agronomy/index.js';
import { ROOT } from '../helpers/cli.js';

const text = readFileSync(join(ROOT, 'sample-fields', 'quarter', 'plan.yaml'), 'utf8');

describe('plan contradictions', () => {
  it('a product listed twice is refused, naming it', () => {
    const i = text.indexOf('  - product: urea'),
      j = text.indexOf('  - product: ammonium_sulphate');
    const dup = text.slice(0, j) + text.slice(i, j) + text.slice(j);
    expect(() => parsePlan(dup, 'plan.yaml', defaultTables())).toThrow(/product "urea" is listed twice/);
  });
  it('min_rate above max_rate is refused', () => {
    const i = text.indexOf('  - product: urea');
    const body = text
      .slice(i)
      .replace(/min_rate: *[\d.]+/, 'min_rate: 500')
      .replace(/max_rate: *[\d.]+/, 'max_rate: 100');
    expect(() => parsePlan(text.slice(0, i) + body, 'plan.yaml', defaultTables())).toThrow(
      /min_rate 500 is above max_rate 100/,
    );
  });
  it('the demo plan stays valid', () =>
    expect(() => parsePlan(text, 'plan.yaml', defaultTables())).not.toThrow());
});
