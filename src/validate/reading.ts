/**
 * The column reading for people: per column of the samples file, its role, unit, depth, method, how that was
 * decided and which cells were refused; as rows for `--json` and as a plain-text table.
 */
import type { ColumnReading } from '../types.js';
import { UNIT_LABEL, type ColumnInfo } from '../io/columns.js';
import type { RawTable } from '../io/records.js';

const fmtDepth = (d: [number, number]) => `${+d[0].toFixed(2)}-${+d[1].toFixed(2)} in`;

/**
 * One reading row per column of the table (columns tilth does not read included, as not read).
 * @example columnReading(table, planColumns(table.columns, [], table.file), new Map(), undefined)[0].role
 */
export function columnReading(
  table: RawTable,
  plan: ColumnInfo[],
  refused: Map<string, { where: string; value: string }[]>,
  depthCol: ColumnInfo | undefined,
): ColumnReading[] {
  return table.columns.map((name) => {
    const c = plan.find((p) => p.name === name);
    if (!c)
      return {
        column: name,
        role: null,
        unit: null,
        depth: null,
        method: null,
        how: 'not recognised (not read)',
        used: false,
        refused: [],
      };
    const used = !/; not used: /.test(c.how ?? '');
    const soil = ['no3_n', 'p', 'k', 'so4_s', 'om', 'ph', 'ec', 'carbonate'].includes(c.role);
    let depth: string | null = null;
    if (soil) {
      depth = depthCol
        ? `from "${depthCol.name}"${c.depth ? ` (header depth ${fmtDepth(c.depth)} only where a row has none)` : ''}`
        : c.depth
          ? fmtDepth(c.depth)
          : c.role === 'no3_n' || c.role === 'so4_s'
            ? null
            : '0-6 in (usual)';
    }
    if (c.role === 'depth') depth = c.depthUnit ? `values in ${c.depthUnit}` : 'values: unit from the layers';
    const unit = c.unit
      ? UNIT_LABEL[c.unit]
      : soil && ['p', 'k'].includes(c.role)
        ? 'ppm (assumed)'
        : c.role === 'ec'
          ? 'dS/m (assumed)'
          : c.role === 'om'
            ? '%'
            : null;
    return {
      column: name,
      role: c.role,
      unit,
      depth,
      method: c.method ?? (c.pMethod ? c.pMethod : null),
      how: c.how ?? 'header',
      used,
      refused: refused.get(name) ?? [],
    };
  });
}

/**
 * Plain-text table of a column reading, as `tilth inspect` and `--verbose` print it.
 * @example console.log(formatReading(inputs.reading!, 'samples.csv'))
 */
export function formatReading(rows: ColumnReading[], title = 'columns'): string {
  const w = (s: string, n: number) => (s.length > n ? `${s.slice(0, n - 1)}…` : s.padEnd(n));
  const lines = [
    `${title}:`,
    `  ${w('column', 26)} ${w('read as', 10)} ${w('unit', 14)} ${w('depth', 22)} ${w('method', 18)} how decided`,
  ];
  for (const r of rows) {
    lines.push(
      `  ${w(r.column, 26)} ${w(r.role ?? '-', 10)} ${w(r.unit ?? '-', 14)} ${w(r.depth ?? '-', 22)} ${w(r.method ?? '-', 18)} ${r.how}`,
    );
    if (r.refused.length) {
      const shown = r.refused
        .slice(0, 6)
        .map((x) => `${x.where} "${x.value}"`)
        .join(', ');
      lines.push(
        `  ${' '.repeat(26)} refused (read as not tested): ${shown}${r.refused.length > 6 ? ` and ${r.refused.length - 6} more` : ''}`,
      );
    }
  }
  return lines.join('\n');
}
