/** Mutators of bytes, text and JSON: the careless and the hostile edits a user's files go through. */
import type { Rng } from './rng.js';
import { concatBytes } from '../../src/io/zip.js';

/** Values that break naive number handling. */
export const NASTY_NUMBERS = [
  'NaN',
  '-0',
  '1e308',
  '1e999',
  '-1e999',
  '1e-320',
  '-1',
  '0',
  '999999999',
  '1e300',
  '4294967296',
  '-180.0000001',
  '90.5',
  '0x10',
  '1,5',
  ' ',
  '',
];
/** Strings that break naive text handling: formulas, control characters, escapes, long and odd names. */
export const NASTY_STRINGS = [
  '=HYPERLINK("http://x")',
  '+1',
  '-1+2',
  '@SUM(A1)',
  '\t=1',
  '\r=1',
  '\u001b[31mred\u001b[0m',
  '\u0000',
  '"',
  '""',
  "'",
  '<script>',
  '../../etc/passwd',
  'x'.repeat(300),
  '\uFEFF',
  '\uD800',
  'é',
  '\n',
  ',',
  ';',
  'null',
  'true',
  '<2',
  '>60',
  'n/a',
];

/** One random byte-level edit: flip, set, delete, duplicate, insert, truncate. */
export function mutateBytes(r: Rng, b: Uint8Array): Uint8Array {
  if (b.length === 0) return Uint8Array.from([r.int(256)]);
  const i = r.int(b.length),
    n = 1 + r.int(Math.min(64, b.length - i));
  switch (r.int(7)) {
    case 0: {
      const c = b.slice();
      c[i] = c[i]! ^ (1 << r.int(8));
      return c;
    }
    case 1: {
      const c = b.slice();
      c[i] = r.pick([0, 0xff, 0x7f, 0x80, 0x20, 0x0a]);
      return c;
    }
    case 2:
      return concat(b.subarray(0, i), b.subarray(i + n));
    case 3:
      return concat(b.subarray(0, i + n), b.subarray(i));
    case 4:
      return concat(
        b.subarray(0, i),
        Uint8Array.from({ length: 1 + r.int(16) }, () => r.int(256)),
        b.subarray(i),
      );
    case 5:
      return b.slice(0, i);
    default: {
      const c = b.slice();
      const v = new DataView(c.buffer);
      if (i + 4 <= c.length)
        v.setInt32(i, r.pick([0, -1, 0x7fffffff, -0x80000000, 1 << 20, r.int(1000)]), r.chance(0.5));
      return c;
    }
  }
}

const concat = (...parts: Uint8Array[]): Uint8Array => concatBytes(parts);

/** One random text edit: a line dropped, duplicated or swapped, a cell or number replaced, a byte edit. */
export function mutateText(r: Rng, text: string): string {
  const lines = text.split('\n');
  const li = r.int(lines.length);
  switch (r.int(6)) {
    case 0:
      lines.splice(li, 1);
      return lines.join('\n');
    case 1:
      lines.splice(li, 0, lines[li]!);
      return lines.join('\n');
    case 2: {
      const j = r.int(lines.length);
      [lines[li], lines[j]] = [lines[j]!, lines[li]!];
      return lines.join('\n');
    }
    case 3: {
      const nums = [...text.matchAll(/-?\d+(\.\d+)?(e[+-]?\d+)?/gi)];
      if (!nums.length) return text + r.pick(NASTY_STRINGS);
      const m = r.pick(nums);
      return text.slice(0, m.index) + r.pick(NASTY_NUMBERS) + text.slice(m.index! + m[0].length);
    }
    case 4: {
      const cells = lines[li]!.split(',');
      cells[r.int(cells.length)] = r.chance(0.5) ? r.pick(NASTY_STRINGS) : r.pick(NASTY_NUMBERS);
      lines[li] = cells.join(',');
      return lines.join('\n');
    }
    default:
      return new TextDecoder().decode(mutateBytes(r, new TextEncoder().encode(text)));
  }
}

/** Interesting JSON values to put anywhere in a document. */
const NASTY_JSON: unknown[] = [
  null,
  NaN,
  Infinity,
  -Infinity,
  1e308,
  -1e308,
  0,
  -1,
  '',
  'x',
  [],
  {},
  [[]],
  [null, null],
  [1e999, 0],
  'NaN',
  true,
  [0, 0, 0],
  { type: 'Polygon', coordinates: null },
];

/** Every [path] of a JSON value's inner nodes (objects' keys and arrays' indices). */
function nodes(
  v: unknown,
  path: (string | number)[] = [],
  out: (string | number)[][] = [],
  limit = 5000,
): (string | number)[][] {
  if (out.length >= limit || v === null || typeof v !== 'object') return out;
  for (const [k, c] of Object.entries(v as Record<string, unknown>)) {
    const p = [...path, Array.isArray(v) ? Number(k) : k];
    out.push(p);
    nodes(c, p, out, limit);
  }
  return out;
}

/** One structural JSON edit: a node replaced by a nasty value, deleted, or duplicated. Falls back to text. */
export function mutateJson(r: Rng, text: string): string {
  let doc: unknown;
  try {
    doc = JSON.parse(text);
  } catch {
    return mutateText(r, text);
  }
  const all = nodes(doc);
  if (!all.length || r.chance(0.15)) return mutateText(r, text);
  const path = r.pick(all);
  let parent = doc as Record<string | number, unknown>;
  for (const k of path.slice(0, -1)) parent = parent[k] as Record<string | number, unknown>;
  const key = path[path.length - 1]!;
  const op = r.int(3);
  if (op === 0) parent[key] = r.pick(NASTY_JSON);
  else if (op === 1) {
    if (Array.isArray(parent)) parent.splice(key as number, 1);
    else delete parent[key];
  } else if (Array.isArray(parent)) parent.splice(key as number, 0, structuredClone(parent[key as number]));
  else parent[key] = typeof parent[key] === 'number' ? Number(r.pick(NASTY_NUMBERS)) : r.pick(NASTY_STRINGS);
  // JSON.stringify writes NaN/Infinity as null; write them as tokens some exporters emit
  return JSON.stringify(doc).replace(/null/g, () =>
    r.chance(0.1) ? r.pick(['NaN', 'Infinity', 'null']) : 'null',
  );
}

/** Applies 1 to 4 edits. */
export function many<T>(r: Rng, v: T, f: (r: Rng, v: T) => T): T {
  const n = 1 + r.int(r.chance(0.7) ? 1 : 4);
  for (let i = 0; i < n; i++) v = f(r, v);
  return v;
}
