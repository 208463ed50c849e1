/**
 * Short names for shapefiles: dBASE column names (at most 10 characters) and 8.3 file names
 * for older terminals, kept unique.
 */

function clean(s: string): string {
  let t = s
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .replace(/[^A-Za-z0-9_]+/g, '_')
    .replace(/_+/g, '_')
    .replace(/^_+|_+$/g, '');
  if (!/^[A-Za-z]/.test(t)) t = 'f' + t;
  return t;
}

function uniqueShort(names: readonly string[], max: number, upper: boolean): string[] {
  const used = new Set<string>();
  return names.map((n) => {
    let base = clean(n);
    if (upper) base = base.toUpperCase();
    let cand = base.slice(0, max).replace(/_+$/, '');
    for (let k = 2; used.has(cand.toUpperCase()); k++) {
      const suffix = (upper ? '' : '_') + String(k);
      cand = base.slice(0, max - suffix.length).replace(/_+$/, '') + suffix;
    }
    used.add(cand.toUpperCase());
    return cand;
  });
}

/**
 * dBASE column names for the given property names: ASCII letters, digits and _, starting with a
 * letter, at most 10 characters, unique ignoring case (dBASE readers compare names that way).
 * A clash after cutting gets _2, _3 ... in place of its last characters.
 *
 * @example shortFieldNames(['urea_lb_per_ac', 'urea_lb_per_ac_seed']) // ['urea_lb_pe', 'urea_lb__2']
 */
export function shortFieldNames(names: readonly string[]): string[] {
  return uniqueShort(names, 10, false);
}

/**
 * 8.3 base names (at most 8 characters, upper case, unique) for file sets; the extension is added by the writer.
 *
 * @example shortFileNames(['rx_seed_row', 'rx_side_band']) // ['RX_SEED', 'RX_SIDE']
 */
export function shortFileNames(names: readonly string[]): string[] {
  return uniqueShort(names, 8, true);
}
