/**
 * Issue 21: edits of the standards table made in the page (pure helpers;
 * each returns a new table).
 */
import { STANDARDS_FORMAT, STANDARDS_VERSION, type StandardsTable } from '../../core/calibration/standards.ts';

export function emptyStandards(names: readonly string[]): StandardsTable {
  return { format: STANDARDS_FORMAT, version: STANDARDS_VERSION, names: [...names], units: names.map(() => ''), rows: [] };
}

/** The table with one amount set (null clears it); the row and the column are added when missing. */
export function withAmount(table: StandardsTable, standard: string, name: string, amount: number | null): StandardsTable {
  let names = table.names, units = table.units, rows = table.rows;
  let col = names.indexOf(name);
  if (col < 0) {
    names = [...names, name];
    units = [...units, units[0] ?? ''];
    rows = rows.map((r) => ({ ...r, amounts: [...r.amounts, null] }));
    col = names.length - 1;
  }
  if (!rows.some((r) => r.standard === standard)) rows = [...rows, { standard, line: null, amounts: names.map(() => null) }];
  rows = rows.map((r) => (r.standard === standard ? { ...r, amounts: r.amounts.map((a, k) => (k === col ? amount : a)) } : r));
  return { ...table, names, units, rows };
}

/** The table with one named peak's amount unit set (the column is added when missing). */
export function withUnit(table: StandardsTable, name: string, unit: string): StandardsTable {
  const t = table.names.includes(name) ? table : { ...table, names: [...table.names, name], units: [...table.units, ''], rows: table.rows.map((r) => ({ ...r, amounts: [...r.amounts, null] })) };
  return { ...t, units: t.units.map((u, k) => (t.names[k] === name ? unit.trim() : u)) };
}
