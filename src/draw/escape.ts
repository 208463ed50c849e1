/**
 * Escaping for HTML text, attribute values and SVG text (SVG inline in HTML is parsed by the HTML parser,
 * so the same five characters cover both). Every string that comes from the inputs goes through `esc`.
 */
const MAP: Record<string, string> = { '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' };

/**
 * Escapes text for HTML/SVG content and double- or single-quoted attributes.
 * Control characters other than tab and newline are dropped (they are not allowed in HTML text).
 * @example esc('<script>alert(1)</script>') // '&lt;script&gt;alert(1)&lt;/script&gt;'
 */
export function esc(value: unknown): string {
  return String(value ?? '')
    .replace(/[&<>"']/g, (c) => MAP[c]!)
    .replace(/[\u0000-\u0008\u000b\u000c\u000e-\u001f\u007f]/g, '');
}

/**
 * Formats a number for people: fixed decimals, thousands separated by a thin space, "–" for NaN/undefined.
 * @example fmt(12345.678, 1) // '12 345.7'
 */
export function fmt(v: number | null | undefined, decimals = 0): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return '–';
  const s = Math.abs(v).toFixed(decimals);
  const [int, frac] = s.split('.');
  const grouped = int!.length > 4 ? int!.replace(/\B(?=(\d{3})+(?!\d))/g, '\u2009') : int!;
  const neg = v < 0 && Number(s) !== 0 ? '−' : '';
  return neg + grouped + (frac ? '.' + frac : '');
}

/**
 * Words wrapped into lines of at most `width` characters, broken on spaces (a longer word is cut).
 * @example wrapWords('a b c', 3) // ['a b', 'c']
 */
export function wrapWords(text: string, width: number): string[] {
  const out: string[] = [];
  let cur = '';
  for (let w of text.split(/\s+/).filter(Boolean)) {
    while (w.length > width) {
      if (cur) out.push(cur);
      cur = '';
      out.push(w.slice(0, width));
      w = w.slice(width);
    }
    if (cur && (cur + ' ' + w).length > width) {
      out.push(cur);
      cur = w;
    } else cur = cur ? cur + ' ' + w : w;
  }
  if (cur) out.push(cur);
  return out;
}
