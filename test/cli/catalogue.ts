/**
 * The hostile-input catalogue (test/hostile-catalogue.md) read as data, so
 * the command-line checks cover every row, including rows added later:
 * a data file whose "must produce" starts with "error" must be refused, one
 * that starts with "load" must load; a recipe must be refused unless it
 * "parses". Rows generated at run time (*run time*) have no file and are
 * left to the catalogue's own test.
 */
import { existsSync, readFileSync } from 'node:fs';

export interface CatalogueRow {
  id: string;
  /** Path from the project folder. */
  path: string;
  refuse: boolean;
}

function rows(section: string): string[][] {
  const md = readFileSync('test/hostile-catalogue.md', 'utf8');
  const start = md.indexOf(`## ${section}`);
  if (start < 0) throw new Error(`test/hostile-catalogue.md has no section "${section}"`);
  const end = md.indexOf('\n## ', start + 3);
  const text = md.slice(start, end < 0 ? undefined : end);
  // Cells are split at "|" but not at an escaped "\|" inside a cell.
  return text.split('\n').filter((l) => /^\| *\d+ *\|/.test(l)).map((l) => l.split(/(?<!\\)\|/).slice(1, -1).map((c) => c.trim()));
}

function fromCells(cells: string[], refuse: (produce: string) => boolean): CatalogueRow | null {
  const [, idCell, input, , produce] = cells;
  const id = idCell.replace(/`/g, '');
  if (/run time/i.test(input)) return null;
  const path = `test/fixtures/${input.replace(/`/g, '').trim()}`;
  if (!existsSync(path)) throw new Error(`catalogue row ${id}: ${path} does not exist`);
  return { id, path, refuse: refuse(produce) };
}

/** Data files: refused when "must produce" starts with "error". */
export function dataRows(): CatalogueRow[] {
  return rows('Data files').map((c) => fromCells(c, (p) => /^error\b/i.test(p))).filter((r): r is CatalogueRow => r !== null);
}

/** Recipes: refused unless "must produce" starts with "parses". */
export function recipeRows(): CatalogueRow[] {
  return rows('Recipes').map((c) => fromCells(c, (p) => !/^parses\b/i.test(p))).filter((r): r is CatalogueRow => r !== null);
}
