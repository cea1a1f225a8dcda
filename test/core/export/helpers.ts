/** Shared invented data and a small CSV reader for the export tests. */
import { expect } from 'vitest';
import { analyse, type AnalyseResult } from '../../../src/core/analysis/index.ts';
import { makeRng } from '../../../src/core/numeric/random.ts';
import { emptyRecipe, makeRecipeStep, type Recipe } from '../../../src/core/method.ts';
import { STEP_REGISTRY } from '../../../src/core/steps/registry.ts';
import { createTrace, type Trace } from '../../../src/core/trace.ts';

export const HOSTILE_NAME = '<img src=x onerror=alert(1)>.csv';

/** Seeded invented run: two Gaussian peaks on a slope, normal noise σ = 0.01. */
export function inventedTrace(opts: { n?: number; fileName?: string; metadata?: Record<string, string>; seed?: number } = {}): Trace {
  const n = opts.n ?? 600;
  const rng = makeRng(opts.seed ?? 7);
  const x = new Float64Array(n), y = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    x[i] = i * 0.01;
    y[i] = 0.02 * x[i] + Math.exp(-0.5 * ((x[i] - 2) / 0.05) ** 2) + 0.3 * Math.exp(-0.5 * ((x[i] - 4) / 0.08) ** 2) + 0.01 * rng.normal();
  }
  return createTrace({
    name: `${opts.fileName ?? 'run.csv'}: Signal`, x, y, xName: 'Time', xUnit: 'min', yName: 'Signal', yUnit: 'mAU',
    source: { fileName: opts.fileName ?? 'run.csv', sha256: 'ab'.repeat(32), rowsRead: n, rowsSkipped: 0 },
    metadata: opts.metadata,
  });
}

export function stepById(id: string) {
  const def = STEP_REGISTRY.find((d) => d.id === id);
  if (!def) throw new Error(`no step ${id}`);
  return def;
}

/** A recipe of the given step ids with default parameters. */
export function recipeOf(...ids: string[]): Recipe {
  const r = emptyRecipe();
  for (const id of ids) r.steps.push(makeRecipeStep(stepById(id)));
  return r;
}

export function analysed(trace: Trace, recipe: Recipe): AnalyseResult {
  return analyse({ sampleId: trace.id, scanIds: [], recipe }, new Map([[trace.id, trace]]), STEP_REGISTRY);
}

/** RFC 4180 fields of one line (quotes honoured; lines here never hold line breaks inside quotes). */
export function splitCsvLine(line: string, delimiter: string): string[] {
  const out: string[] = [];
  let cur = '', quoted = false;
  for (let i = 0; i < line.length; i++) {
    const c = line[i];
    if (quoted) {
      if (c === '"' && line[i + 1] === '"') { cur += '"'; i++; } else if (c === '"') quoted = false; else cur += c;
    } else if (c === '"' && cur === '') quoted = true;
    else if (c === delimiter) { out.push(cur); cur = ''; } else cur += c;
  }
  out.push(cur);
  return out;
}

/** Comment lines, header and numeric body of a CSV we wrote. */
export function readCsv(text: string, delimiter: string, decimal: string) {
  const lines = text.split('\r\n');
  expect(lines.pop()).toBe('');
  const comments = lines.filter((l) => l.startsWith('#'));
  const rest = lines.filter((l) => !l.startsWith('#'));
  const header = splitCsvLine(rest[0], delimiter);
  const body = rest.slice(1).map((l) => splitCsvLine(l, delimiter));
  const num = (cell: string) => (cell === '' ? NaN : Number(decimal === ',' ? cell.replace(',', '.') : cell));
  return { comments, header, body, num };
}

/** True when a spreadsheet would take this cell as a formula (OWASP CSV injection: =, +, -, @, tab, CR), numbers aside. */
export function looksLikeFormula(cell: string): boolean {
  return /^[=+\-@\t\r]/.test(cell) && !/^[+-]?(\d+([.,]\d*)?|[.,]\d+)([eE][+-]?\d+)?$/.test(cell.trim());
}
