import { describe, expect, test } from 'vitest';
import { strFromU8, strToU8, unzipSync } from 'fflate';
import { runBatch, zipBaseName, type BatchProgress } from '../../../src/core/export/batch.ts';
import { STEP_REGISTRY } from '../../../src/core/steps/registry.ts';
import { inventedTrace, readCsv, recipeOf } from './helpers.ts';

const NOW = new Date(Date.UTC(2024, 2, 3, 4, 5, 6));

function csvBytes(seed: number): Uint8Array {
  const t = inventedTrace({ seed });
  const lines = ['Time (min),Signal (mAU)'];
  for (let i = 0; i < t.x.length; i++) lines.push(`${t.x[i]},${t.y[i]}`);
  return strToU8(`${lines.join('\n')}\n`);
}

describe('batch', () => {
  test('one good and one bad file: one error, the rest exported, the ZIP unzips to the expected names', async () => {
    const good = csvBytes(11);
    const goodCopy = good.slice();
    const bad = strToU8('this is not a table of numbers\nnor is this\n');
    const progress: BatchProgress[] = [];
    const recipe = recipeOf('savitzky-golay');
    const out = await runBatch(
      [{ name: 'run 1.csv', bytes: good }, { name: 'broken.csv', bytes: bad }],
      recipe, STEP_REGISTRY, { now: NOW }, (p) => { progress.push(p); },
    );
    expect(out.errors).toHaveLength(1);
    expect(out.errors[0].file).toBe('broken.csv');
    expect(out.errors[0].message.length).toBeGreaterThan(20);
    const files = unzipSync(out.zip);
    expect(Object.keys(files).sort()).toEqual(['peaks-all-files.csv', 'peaks-combined.csv', 'problems.txt', 'recipe.json', 'run 1-cleaned.csv', 'run 1-report.html'].sort());
    expect(strFromU8(files['peaks-all-files.csv'])).toBe(out.combinedCsv);
    expect(strFromU8(files['run 1-report.html'])).toContain('not a validated system');
    expect(JSON.parse(strFromU8(files['recipe.json'])).steps[0].step).toBe('savitzky-golay');
    expect(progress.map((p) => p.done)).toEqual([0, 1, 2]);
    expect(good).toEqual(goodCopy);
    // Combined table: one row per peak, tagged with the file.
    const { header, body } = readCsv(out.combinedCsv, ',', '.');
    expect(header.slice(0, 5)).toEqual(['file', 'input SHA-256', 'x unit', 'y unit', 'peak #']);
    expect(body.length).toBeGreaterThanOrEqual(2); // the invented run has two peaks far above the noise
    expect(body.every((r) => r[0] === 'run 1.csv' && r[2] === 'min' && r[3] === 'mAU')).toBe(true);
    const cleaned = readCsv(strFromU8(files['run 1-cleaned.csv']), ',', '.');
    expect(cleaned.body.length).toBe(600);
  });

  test('combined table (issue 18): the two invented peaks matched across three files, mean and %RSD as computed by hand from the per-file rows', async () => {
    const out = await runBatch([11, 12, 13].map((seed) => ({ name: `run ${seed}.csv`, bytes: csvBytes(seed) })), recipeOf(), STEP_REGISTRY, { now: NOW });
    const combined = readCsv(strFromU8(unzipSync(out.zip)['peaks-combined.csv']), ',', '.');
    expect(combined.comments.some((c) => c.includes('Matching window: ±'))).toBe(true);
    const all = readCsv(out.combinedCsv, ',', '.');
    const col = (name: string) => all.header.indexOf(name);
    for (const centre of [2, 4]) {
      const row = combined.body.find((r) => Math.abs(Number(r[3]) - centre) < 0.02)!;
      expect(Number(row[1])).toBe(3);
      // Independent arithmetic on the per-file table: sample SD (n − 1) and %RSD = 100 SD / mean.
      const areas = all.body.filter((r) => Math.abs(Number(r[col('apex (x unit)')]) - centre) < 0.02).map((r) => Number(r[col('area (y unit × x unit)')]));
      expect(areas).toHaveLength(3);
      const mean = areas.reduce((a, b) => a + b, 0) / 3;
      const sd = Math.sqrt(areas.reduce((a, b) => a + (b - mean) ** 2, 0) / 2);
      expect(Number(row[6])).toBeCloseTo(mean, 12);
      expect(Number(row[8])).toBeCloseTo((100 * sd) / mean, 9);
    }
  });

  test('same names are kept apart, hostile names are made safe, and a hostile name cannot become a formula', async () => {
    const out = await runBatch(
      [{ name: '=cmd|calc.csv', bytes: csvBytes(1) }, { name: 'a/b/../=cmd|calc.csv', bytes: csvBytes(2) }, { name: 'empty.csv', bytes: new Uint8Array(0) }],
      recipeOf(), STEP_REGISTRY, { now: NOW, csv: { delimiter: ';', decimal: ',' } },
    );
    expect(out.errors.map((e) => e.file)).toEqual(['empty.csv']);
    expect(out.entries).toContain('_cmd_calc-cleaned.csv');
    expect(out.entries).toContain('_cmd_calc-2-cleaned.csv');
    const rows = readCsv(out.combinedCsv, ';', ',').body;
    expect(rows.filter((r) => r[0] === "'=cmd|calc.csv").length).toBeGreaterThan(0);
    expect(rows.filter((r) => r[0] === 'a/b/../=cmd|calc.csv').length).toBeGreaterThan(0);
    expect(rows.some((r) => r[0].startsWith('='))).toBe(false);
    expect(zipBaseName('..\\..\\x.csv')).toBe('x');
    expect(zipBaseName('.hidden')).toBe('file');
  });
});
