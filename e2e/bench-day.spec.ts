import { expect, test, type Page } from '@playwright/test';
import { openWithDemo, trace } from './helpers.ts';

/** Issue 17, a day at the bench: roles, zoom, readout. Files are made here from seeded formulas (invented data). */

function csv(xName: string, yNames: string[], n: number, f: (x: number, j: number) => number, x0 = 0, dx = 0.1): Buffer {
  const lines = [[xName, ...yNames].join(',')];
  for (let i = 0; i < n; i++) {
    const x = x0 + i * dx;
    lines.push([x.toFixed(4), ...yNames.map((_, j) => f(x, j).toFixed(6))].join(','));
  }
  return Buffer.from(lines.join('\n') + '\n');
}
const gauss = (x: number, c: number, w: number, h: number) => h * Math.exp(-0.5 * ((x - c) / w) ** 2);

/** The demo's ten traces are listed (the page draws the sample before the scans have arrived). */
async function demoListed(page: Page): Promise<void> {
  await openWithDemo(page);
  await expect(page.locator('.notice').filter({ hasText: 'Demo loaded' })).toBeVisible({ timeout: 20_000 });
  await expect(page.locator('[data-testid="trace-list"] li.trace-item')).toHaveCount(10);
}

/** Role chosen for each listed trace, by the full name in the row's title. */
async function roles(page: Page): Promise<Record<string, string>> {
  return page.evaluate(() => {
    const out: Record<string, string> = {};
    for (const li of Array.from(document.querySelectorAll('[data-testid="trace-list"] li.trace-item'))) {
      const name = (li.querySelector('.trace-name') as HTMLElement).title.split('\n')[0];
      out[name] = (li.querySelector('select') as HTMLSelectElement).value;
    }
    return out;
  });
}

async function axisRange(page: Page, axis: 'xaxis' | 'yaxis'): Promise<[number, number]> {
  return page.evaluate((a) => {
    const gd = document.querySelector('[data-testid="figure"]') as unknown as { _fullLayout: Record<string, { range: [number, number] }> };
    return gd._fullLayout[a].range.slice() as [number, number];
  }, axis);
}

/** Drag across the middle of the upper plot from fraction a to fraction b of its width. */
async function dragZoom(page: Page, a: number, b: number): Promise<void> {
  const box = (await page.locator('[data-testid="figure"] .nsewdrag').first().boundingBox())!;
  const y = box.y + box.height * 0.5;
  await page.mouse.move(box.x + box.width * a, y);
  await page.mouse.down();
  await page.mouse.move(box.x + box.width * ((a + b) / 2), y + 3, { steps: 4 });
  await page.mouse.move(box.x + box.width * b, y + 6, { steps: 4 });
  await page.mouse.up();
}

const own = { name: 'my-run.csv', mimeType: 'text/csv', buffer: csv('Time (min)', ['Signal (mV)'], 400, (x) => gauss(x, 20, 1, 50) + 0.3 * Math.sin(7 * x)) };
const second = { name: 'second-run.csv', mimeType: 'text/csv', buffer: csv('Time (min)', ['Signal (mV)'], 300, (x) => gauss(x, 10, 1, 30) + 0.2 * Math.cos(5 * x)) };

test('own file after the demo: the whole demo is set aside in one change, said and undoable', async ({ page }) => {
  await demoListed(page);
  const before = await roles(page);
  expect(Object.values(before).filter((r) => r === 'scan')).toHaveLength(8);
  expect(Object.values(before).filter((r) => r === 'blank')).toHaveLength(1);
  await page.getByTestId('file-input').setInputFiles(own);
  await expect(page.getByRole('heading', { name: /my-run\.csv/ })).toBeVisible();
  const notice = page.locator('.notice').filter({ hasText: 'The demo is set aside' });
  await expect(notice).toContainText('10 traces');
  const after = await roles(page);
  for (const [name, role] of Object.entries(after)) expect(role, name).toBe(name.startsWith('my-run.csv') ? 'sample' : 'ignore');
  await notice.getByRole('button', { name: 'Undo: put the demo back' }).click();
  await expect(page.getByRole('heading', { name: /demo-sample\.csv/ })).toBeVisible();
  const back = await roles(page);
  for (const [name, role] of Object.entries(before)) expect(back[name], name).toBe(role);
  expect(back['my-run.csv: Signal']).toBe('ignore');
});

test('two files opened at once: the first is the sample, and the page says so', async ({ page }) => {
  await demoListed(page);
  await page.getByTestId('file-input').setInputFiles([own, second]);
  await expect(page.locator('.notice').filter({ hasText: 'Opened 2 files: my-run.csv is the sample' })).toBeVisible();
  await expect(page.getByRole('heading', { name: /my-run\.csv/ })).toBeVisible();
  const r = await roles(page);
  expect(r['my-run.csv: Signal']).toBe('sample');
  expect(r['second-run.csv: Signal']).toBe('ignore');
});

test('a 60-column file: traces listed by their own names, a filter, all shown made scans, one notice', async ({ page }) => {
  await demoListed(page);
  const names = Array.from({ length: 60 }, (_, j) => `gasoline-nir-${String(j + 1).padStart(2, '0')}`);
  await page.getByTestId('file-input').setInputFiles({ name: 'nir-set.csv', mimeType: 'text/csv', buffer: csv('Wavelength (nm)', names, 200, (x, j) => 0.1 + gauss(x, 1210, 8, 0.5 + 0.01 * j), 1100, 2) });
  const notice = page.locator('.notice').filter({ hasText: 'Loaded nir-set.csv: 60 traces' });
  await expect(notice).toBeVisible();
  expect(await notice.locator('strong').first().textContent()).toBe('Loaded nir-set.csv: 60 traces');
  await page.getByTestId('trace-filter').fill('nir-0');
  await expect(page.getByTestId('trace-filter-count')).toHaveText('9 of 70 shown');
  const shown = await page.locator('[data-testid="trace-list"] .trace-name').allTextContents();
  expect(shown).toEqual(names.slice(0, 9));
  await page.getByTestId('trace-filter').fill('gasoline');
  await page.getByRole('button', { name: 'all shown are repeated scans' }).click();
  // The list draws only the rows in view above 40 traces: read the roles through two short filters.
  await page.getByTestId('trace-filter').fill('nir-0');
  let r = await roles(page);
  expect(r['nir-set.csv: gasoline-nir-01']).toBe('sample');
  for (const n of names.slice(1, 9)) expect(r[`nir-set.csv: ${n}`], n).toBe('scan');
  await page.getByTestId('trace-filter').fill('demo');
  r = await roles(page);
  expect(Object.keys(r)).toHaveLength(10);
  expect(new Set(Object.values(r))).toEqual(new Set(['ignore']));
});

test('each trace keeps its own zoom; a new trace opens at full range; zoom in x rescales y', async ({ page }) => {
  await demoListed(page);
  const fullY = await axisRange(page, 'yaxis');
  await dragZoom(page, 0.05, 0.2);
  await expect.poll(async () => (await axisRange(page, 'xaxis'))[1]).toBeLessThan(10);
  const zoomX = await axisRange(page, 'xaxis');
  // y follows the data in view: its top is the largest drawn y inside the x-range, plus the 6 % margin.
  const raw = (await trace(page, 'raw'))!;
  const proc = (await trace(page, 'processed'))!;
  let hi = -Infinity, lo = Infinity;
  for (const t of [raw, proc]) t.x.forEach((x, i) => { if (x >= zoomX[0] && x <= zoomX[1]) { hi = Math.max(hi, t.y[i]); lo = Math.min(lo, t.y[i]); } });
  const zy = await axisRange(page, 'yaxis');
  expect(zy[1]).toBeLessThan(fullY[1]);
  expect(zy[1]).toBeGreaterThanOrEqual(hi);
  expect(zy[0]).toBeLessThanOrEqual(lo);
  // Keep y fixed: the switch gives y back to the whole trace's range.
  await page.getByTestId('y-fits').uncheck();
  await expect.poll(async () => (await axisRange(page, 'yaxis'))[1]).toBeGreaterThan(zy[1] + 0.8 * (fullY[1] - zy[1]));
  await page.getByTestId('y-fits').check();
  // Another file opens at its full range.
  await page.getByTestId('file-input').setInputFiles(own);
  await expect(page.getByRole('heading', { name: /my-run\.csv/ })).toBeVisible();
  await expect.poll(async () => (await axisRange(page, 'xaxis'))[1]).toBeGreaterThan(39);
  expect((await axisRange(page, 'xaxis'))[0]).toBeLessThan(0.5);
  // Back to the demo sample: its zoom comes back.
  await page.locator('.notice').filter({ hasText: 'The demo is set aside' }).getByRole('button', { name: 'Undo: put the demo back' }).click();
  await expect(page.getByRole('heading', { name: /demo-sample\.csv/ })).toBeVisible();
  await expect.poll(async () => (await axisRange(page, 'xaxis'))[1]).toBeCloseTo(zoomX[1], 6);
});

test('cursor readout gives the nearest data point of each line, and two clicks measure Δx, Δy and slope with units', async ({ page }) => {
  await demoListed(page);
  const { readFileSync } = await import('node:fs');
  const rows = readFileSync('public/demo/demo-sample.csv', 'utf8').split(/\r?\n/).filter((l) => /^-?\d/.test(l)).map((l) => l.split(',').map(Number));
  const box = (await page.locator('[data-testid="figure"] .nsewdrag').first().boundingBox())!;
  await page.mouse.move(box.x + box.width * 0.37, box.y + box.height * 0.5);
  const text = await page.getByTestId('cursor-readout').textContent();
  // "x 4.123 min · raw 1.234 mAU at 4.125 min · processed …"
  const m = /raw (-?[\d.e+-]+) mAU at (-?[\d.e+-]+) min/.exec(text ?? '');
  expect(m, text ?? '').not.toBeNull();
  const cx = Number(/^x (-?[\d.e+-]+) min/.exec(text!)![1]);
  const px = Number(m![2]), py = Number(m![1]);
  // The point shown is the file's row nearest to the cursor's x, its y to the 6 digits shown.
  const nearest = rows.reduce((best, r) => (Math.abs(r[0] - cx) < Math.abs(best[0] - cx) ? r : best), rows[0]);
  expect(px).toBeCloseTo(nearest[0], 5);
  expect(Math.abs(py - nearest[1])).toBeLessThanOrEqual(Math.abs(nearest[1]) * 1e-5);
  // Two points.
  await page.getByTestId('measure-toggle').click();
  await page.mouse.click(box.x + box.width * 0.2, box.y + box.height * 0.5);
  await page.mouse.click(box.x + box.width * 0.6, box.y + box.height * 0.5);
  const res = await page.getByTestId('measure-result').textContent();
  const mm = /Δx = (-?[\d.e+-]+) min · Δy = (-?[\d.e+-]+) mAU · slope = (-?[\d.e+-]+) mAU\/min \(from (-?[\d.e+-]+) to (-?[\d.e+-]+) min/.exec(res ?? '');
  expect(mm, res ?? '').not.toBeNull();
  const [dx, dy, slope, x1, x2] = mm!.slice(1).map(Number);
  const r1 = rows.find((r) => Math.abs(r[0] - x1) < 1e-6)!, r2 = rows.find((r) => Math.abs(r[0] - x2) < 1e-6)!;
  expect(r1 && r2).toBeTruthy();
  expect(dx).toBeCloseTo(r2[0] - r1[0], 5);
  expect(Math.abs(dy - (r2[1] - r1[1]))).toBeLessThan(1e-5 * Math.max(1, Math.abs(dy)));
  expect(slope).toBeCloseTo((r2[1] - r1[1]) / (r2[0] - r1[0]), 3);
});

test('units: name_unit headers, names and units set in the page, every width and step figure with its unit or in words', async ({ page }) => {
  await demoListed(page);
  await page.getByTestId('file-input').setInputFiles({ name: 'logger.csv', mimeType: 'text/csv', buffer: csv('time_s', ['voltage_mV'], 400, (x) => gauss(x, 20, 1, 50) + 0.3 * Math.sin(7 * x)) });
  await expect(page.getByRole('heading', { name: /logger\.csv/ })).toBeVisible();
  await expect(page.locator('.xtitle')).toHaveText('time (s)');
  await expect(page.locator('.ytitle').first()).toHaveText('voltage (mV)');
  // Set in the page: the plot, the peak table and the readout follow.
  await page.getByRole('button', { name: 'Axis names and units…' }).click();
  await page.getByTestId('axis-xName').fill('Time');
  await page.getByTestId('axis-xUnit').fill('min');
  await page.getByTestId('axis-yName').fill('Detector signal');
  await page.getByRole('button', { name: 'Apply' }).click();
  await expect(page.locator('.xtitle')).toHaveText('Time (min)');
  await expect(page.locator('.ytitle').first()).toHaveText('Detector signal (mV)');
  await expect(page.getByTestId('peak-table').locator('th').nth(1)).toHaveText('Apex (min)');
  // A step's window in x says its unit; its figures are in words, not code names.
  await page.selectOption('#add-step-choice', 'savitzky-golay');
  await page.getByRole('button', { name: 'Add step' }).click();
  const card = page.getByTestId('step-savitzky-golay');
  await expect(card.locator('.hint').first()).toHaveText(/^= [\d.]+ min$/);
  await expect(card.locator('.figures')).toContainText('white noise kept (SD out ÷ SD in)');
  await expect(card).not.toContainText('noiseGain');
});

test('a peak added by hand snaps to the nearest top or is refused on the page with the reason; area % sums to 100', async ({ page }) => {
  await demoListed(page);
  // A smooth file: one Gaussian on a steady slope, no noise (so the slope has no tops).
  await page.getByTestId('file-input').setInputFiles({ name: 'slope.csv', mimeType: 'text/csv', buffer: csv('Time (min)', ['Signal (mV)'], 400, (x) => gauss(x, 10, 0.5, 20) + 0.5 * x) });
  await expect(page.getByRole('heading', { name: /slope\.csv/ })).toBeVisible();
  await expect(page.getByTestId('peak-table').locator('tbody tr')).toHaveCount(1);
  await page.getByRole('button', { name: 'Add a peak by clicking' }).click();
  // The button sits below the plot: bring the plot back into view before clicking on it.
  await page.locator('[data-testid="figure"]').scrollIntoViewIfNeeded();
  const box = (await page.locator('[data-testid="figure"] .nsewdrag').first().boundingBox())!;
  const xRange = await axisRange(page, 'xaxis');
  const px = (x: number) => box.x + ((x - xRange[0]) / (xRange[1] - xRange[0])) * box.width;
  const yRange = await axisRange(page, 'yaxis');
  const py = (y: number) => box.y + box.height - ((y - yRange[0]) / (yRange[1] - yRange[0])) * box.height;
  // On the slope at x = 30: refused, the reason under the plot, the table unchanged.
  await page.mouse.click(px(30), py(15));
  await expect(page.getByTestId('hand-note')).toContainText('Peak not added: No top within 10 points of x = 30');
  await expect(page.getByTestId('hand-note')).toContainText('min');
  await expect(page.getByTestId('peak-table').locator('tbody tr')).toHaveCount(1);
  // Near the top (0.3 min = 3 samples off): that top is already in the table, which is said too.
  await page.mouse.click(px(10.3), py(gauss(10.3, 10, 0.5, 20) + 5.15));
  await expect(page.getByTestId('hand-note')).toContainText('already in the peak table');
  // The demo's raw trace near the shoulder at 6.35 min: moved to a top of the trace and added.
  await page.locator('.notice').filter({ hasText: 'The demo is set aside' }).getByRole('button', { name: 'Undo: put the demo back' }).click();
  await expect(page.getByRole('heading', { name: /demo-sample\.csv/ })).toBeVisible();
  await expect.poll(async () => (await axisRange(page, 'xaxis'))[1]).toBeGreaterThan(11);
  const rowsBefore = await page.getByTestId('peak-table').locator('tbody tr').count();
  await page.locator('[data-testid="figure"]').scrollIntoViewIfNeeded();
  const box2 = (await page.locator('[data-testid="figure"] .nsewdrag').first().boundingBox())!;
  const xr = await axisRange(page, 'xaxis'), yr = await axisRange(page, 'yaxis');
  const qx = (x: number) => box2.x + ((x - xr[0]) / (xr[1] - xr[0])) * box2.width;
  const qy = (y: number) => box2.y + box2.height - ((y - yr[0]) / (yr[1] - yr[0])) * box2.height;
  const raw = (await trace(page, 'raw'))!;
  const k = raw.x.findIndex((v) => v >= 7.3);
  await page.mouse.click(qx(raw.x[k]), qy(raw.y[k]));
  await expect(page.getByTestId('hand-note')).toContainText(/Peak added at the top x = [\d.]+ min/);
  await expect(page.getByTestId('peak-table').locator('tbody tr')).toHaveCount(rowsBefore + 1);
  const added = page.getByTestId('peak-table').locator('tbody tr').filter({ hasText: 'added by hand' });
  await expect(added).toHaveCount(1);
  // Area %: the column adds up to 100 over the kept rows (rounded to 3 digits each).
  const col = await page.getByTestId('peak-table').locator('th').allTextContents();
  const ai = col.indexOf('Area %');
  expect(ai).toBeGreaterThan(0);
  const shares = await page.getByTestId('peak-table').locator('tbody tr').evaluateAll((rows, i) => rows.map((r) => Number((r.children[i] as HTMLElement).textContent)), ai);
  expect(shares.reduce((a, b) => a + b, 0)).toBeCloseTo(100, 0);
});

test('dragging a selected peak’s end changes its area and is kept as a decision', async ({ page }) => {
  await demoListed(page);
  // The large isolated peak at 4.3 min: select it by its row.
  const row = page.getByTestId('peak-table').locator('tbody tr').filter({ hasText: '4.29' }).first();
  await row.click();
  const cols = await page.getByTestId('peak-table').locator('th').allTextContents();
  const ai = cols.findIndex((c) => c.startsWith('Area ('));
  const areaBefore = Number(await row.locator('td').nth(ai).textContent());
  // Wait for the zoom to the peak and its start and end lines.
  await expect.poll(async () => (await axisRange(page, 'xaxis'))[1]).toBeLessThan(6);
  await expect.poll(() => page.evaluate(() => (document.querySelector('[data-testid="figure"]') as unknown as { _fullLayout: { shapes: unknown[] } })._fullLayout.shapes.length)).toBeGreaterThanOrEqual(4);
  await page.waitForTimeout(300);
  await page.locator('[data-testid="figure"]').scrollIntoViewIfNeeded();
  // The end line is the last shape drawn; drag it left by a fifth of the plot.
  const line = page.locator('[data-testid="figure"] .shapelayer path').last();
  const lb = (await line.boundingBox())!;
  const plotBox = (await page.locator('[data-testid="figure"] .nsewdrag').first().boundingBox())!;
  const px = lb.x + lb.width / 2, y = lb.y + lb.height * 0.5;
  await page.mouse.move(px + 10, y);
  await page.mouse.move(px, y, { steps: 3 });
  await page.mouse.down();
  await page.mouse.move(px - plotBox.width * 0.1, y, { steps: 5 });
  await page.mouse.move(px - plotBox.width * 0.2, y, { steps: 5 });
  await page.mouse.up();
  const marked = page.getByTestId('peak-table').locator('tbody tr').filter({ hasText: 'start and end set by hand' });
  await expect(marked).toHaveCount(1);
  const areaAfter = Number(await marked.locator('td').nth(ai).textContent());
  expect(areaAfter).toBeLessThan(areaBefore);
});

test('the trim step keeps the marked x-range only', async ({ page }) => {
  await demoListed(page);
  await page.selectOption('#add-step-choice', 'trim');
  await page.getByRole('button', { name: 'Add step' }).click();
  const card = page.getByTestId('step-trim');
  await expect(card).toContainText('No x-range chosen yet');
  await page.getByRole('button', { name: 'Mark a range' }).click();
  await page.locator('[data-testid="figure"]').scrollIntoViewIfNeeded();
  await dragZoom(page, 0.3, 0.6);
  await card.getByRole('button', { name: 'Add the marked x-range' }).click();
  await expect(card).toContainText(/Kept \d+ of 1201 points/);
  const marked = await page.evaluate(() => (document.querySelector('[data-testid="figure"]') as unknown as { _fullLayout: { shapes: { x0: number; x1: number }[] } })._fullLayout.shapes[0]);
  await expect.poll(async () => { const p = await trace(page, 'processed'); return p ? [Math.min(...p.x) >= Math.min(marked.x0, marked.x1) - 1e-9, Math.max(...p.x) <= Math.max(marked.x0, marked.x1) + 1e-9] : null; }).toEqual([true, true]);
});
