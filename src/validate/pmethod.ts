/**
 * The P test method of a samples file: from P column headers, a method column and the --p-method option; never
 * mixed, never guessed. Olsen and modified Kelowna are the methods tilth's P tables know.
 */
import { UserError } from '../errors.js';
import type { PMethod } from '../types.js';
import type { ColumnInfo } from '../io/columns.js';
import type { RawTable } from '../io/records.js';

/**
 * Decides the file's P method.
 * @param used the column plan's used entries
 * @param option --p-method, if given
 * @throws UserError when methods are mixed, disagree with the option, or P has no method at all
 * @example decidePMethod(table, plan, undefined, 'olsen') // 'olsen'
 */
export function decidePMethod(
  table: RawTable,
  used: ColumnInfo[],
  pmCol: ColumnInfo | undefined,
  option: PMethod | undefined,
): PMethod {
  const file = table.file;
  const methods = new Map<PMethod, string>();
  for (const c of used) if (c.role === 'p' && c.pMethod) methods.set(c.pMethod, `column "${c.name}"`);
  if (pmCol) {
    for (const r of table.records) {
      const raw = r.props[pmCol.name];
      if (raw === null) continue;
      const s = String(raw).toLowerCase();
      const m: PMethod | null = /olsen|bicarb|nahco3/.test(s)
        ? 'olsen'
        : /kelowna/.test(s)
          ? 'kelowna'
          : null;
      if (!m)
        throw new UserError(
          `${file} ${r.where}, column "${pmCol.name}": "${raw}" is not a P method tilth knows. Fix: write Olsen or modified Kelowna.`,
          { file, where: r.where, field: pmCol.name, value: raw },
        );
      if (!methods.has(m)) methods.set(m, `${r.where}`);
    }
  }
  if (methods.size > 1) {
    const [a, b] = [...methods.entries()];
    throw new UserError(
      `${file}: P was tested by two methods in one file (${a[0]} in ${a[1]}, ${b[0]} in ${b[1]}). Olsen and modified Kelowna results are not interchangeable (Kelowna reads about 10-50 % higher). ` +
        'Fix: split the file by method and run each field with its own method, or convert with a local calibration before loading.',
      { file, field: 'P method' },
    );
  }
  const pCols = used.filter((c) => c.role === 'p');
  const fileMethod = [...methods.keys()][0];
  if (fileMethod && option && fileMethod !== option) {
    throw new UserError(
      `${file}: the file says P is by the ${fileMethod} method (${methods.get(fileMethod)}), but the option says ${option}. Fix: drop the option or correct it.`,
      { file, field: 'P method' },
    );
  }
  if (fileMethod) return fileMethod;
  if (option) return option;
  if (pCols.length > 0) {
    const other = pCols.find((c) => c.method && !c.how?.startsWith('column map'));
    if (other) {
      throw new UserError(
        `${file}: column "${other.name}" holds P by the ${other.method} method; tilth's P tables are for Olsen or modified Kelowna, and the methods read differently. ` +
          'Fix: give Olsen or modified Kelowna P results. If the column is in fact Olsen P, say so: --p-method olsen.',
        { file, field: other.name },
      );
    }
    throw new UserError(
      `${file}: column "${pCols[0].name}" holds P but does not say the test method. Fix: add --p-method olsen or --p-method kelowna (or name the method in the header, e.g. "P Olsen (ppm)").`,
      { file, field: pCols[0].name },
    );
  }
  return 'olsen'; // no P column: no P values, the method is moot
}
