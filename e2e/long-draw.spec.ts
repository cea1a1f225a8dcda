import { expect, test } from '@playwright/test';
import { rmSync } from 'node:fs';
import { addStep, download, openWithDemo, plotted, settled, trace, writeNoisyCsv } from './helpers.ts';

// Issue 16, "the page takes in little": a 10⁶-point trace is drawn from the worker's min/max drawing (about four
// points per pixel column), one-point spikes stay visible, a zoom draws the stretch in view anew at full detail,
// and the cleaned CSV still holds every processed point (fetched from the worker).
test('10⁶ points: drawn at about four points per pixel column, spikes kept, zoom redraws, export whole', async ({ page }) => {
  test.setTimeout(300_000);
  const n = 1_000_000;
  const spikes = new Map([[123_457, 60], [654_321, -45], [900_001, 80]]);
  const { file, dir } = writeNoisyCsv({ name: 'long-spikes.csv', points: n, seed: 7, peaks: [[500_000, 25, 300]], extra: (i) => spikes.get(i) ?? 0 });
  const shots = process.env.TRACEWRIGHT_SHOTS;
  try {
    await page.setViewportSize({ width: 1280, height: 900 });
    await openWithDemo(page);
    await page.getByTestId('file-input').setInputFiles(file);
    await expect(page.getByRole('heading', { name: /long-spikes\.csv/ })).toBeVisible({ timeout: 90_000 });
    await addStep(page, 'moving-average');
    await expect.poll(async () => (await trace(page, 'processed'))?.x.length ?? 0, { timeout: 120_000 }).toBeGreaterThan(100);
    await settled(page);
    const width = await page.getByTestId('figure').evaluate((el) => el.clientWidth);
    const whole = await plotted(page);
    const raw = whole.find((t) => t.name === 'raw')!;
    const processed = whole.find((t) => t.name === 'processed')!;
    // About four points per pixel column (min and max of each half column), never the 10⁶.
    for (const t of [raw, processed]) expect(t.x.length).toBeLessThanOrEqual(4 * width + 4);
    expect(processed.x.length).toBeGreaterThan(width);
    // Each one-point spike is drawn at its full height on the raw line.
    for (const [i, h] of spikes) {
      const at = raw.x.findIndex((x) => Math.abs(x - i * 0.001) < 5e-4);
      expect(at, `spike at ${i}`).toBeGreaterThanOrEqual(0);
      expect(Math.abs(raw.y[at])).toBeGreaterThan(Math.abs(h) - 6);
    }
    // The processed line runs from the first x to the last without a gap wider than a pixel column.
    const gaps = processed.x.slice(1).map((x, k) => x - processed.x[k]);
    expect(Math.max(...gaps)).toBeLessThan((n * 0.001) / (width / 2));
    if (shots) await page.getByTestId('figure').screenshot({ path: `${shots}/long-whole.png` });

    // Zoom three times to the middle tenth (to 1 s of the 1000 s) by dragging across the plot: the worker draws the stretch in view anew each time.
    const box = (await page.getByTestId('figure').locator('.nsewdrag').first().boundingBox())!;
    let spanBefore = Infinity;
    for (let k = 0; k < 3; k++) {
      const y = box.y + box.height * 0.5;
      await page.mouse.move(box.x + box.width * 0.45, y);
      await page.mouse.down();
      await page.mouse.move(box.x + box.width * 0.5, y + 3, { steps: 4 });
      await page.mouse.move(box.x + box.width * 0.55, y + 6, { steps: 4 });
      await page.mouse.up();
      const limit = spanBefore === Infinity ? 200 : spanBefore / 5;
      await expect.poll(async () => {
        const p = await trace(page, 'processed');
        return p ? p.x[p.x.length - 1] - p.x[0] : Infinity;
      }, { timeout: 60_000 }).toBeLessThan(limit);
      const p = (await trace(page, 'processed'))!;
      spanBefore = p.x[p.x.length - 1] - p.x[0];
      expect(p.x.length).toBeGreaterThan(width); // drawn anew for the view, not the whole-trace drawing cut down
    }
    const zoomed = (await trace(page, 'processed'))!;
    const span = zoomed.x[zoomed.x.length - 1] - zoomed.x[0];
    // Every sample in view is drawn (a few thousand here): the zoom did not stretch the whole-trace drawing.
    const step = Math.min(...zoomed.x.slice(1).map((x, k) => x - zoomed.x[k]));
    expect(step).toBeCloseTo(0.001, 6);
    expect(zoomed.x.length).toBeGreaterThan(span / 0.001 / 2);
    if (shots) await page.getByTestId('figure').screenshot({ path: `${shots}/long-zoomed.png` });

    // The cursor readout reads the exact nearest sample of the processed line from the worker: x on the 1 ms grid.
    await page.mouse.move(box.x + box.width * 0.5, box.y + box.height * 0.4);
    const read = page.getByTestId('cursor-readout').locator('[data-series="processed"]');
    await expect(read).toBeVisible({ timeout: 30_000 });
    const at = Number(/at (-?[\d.]+)/.exec((await read.textContent()) ?? '')?.[1]);
    expect(Math.abs(at * 1000 - Math.round(at * 1000))).toBeLessThan(1e-6);
    expect(at).toBeGreaterThanOrEqual(zoomed.x[0]);
    expect(at).toBeLessThanOrEqual(zoomed.x[zoomed.x.length - 1]);

    // The cleaned CSV holds all 10⁶ processed points, fetched whole from the worker.
    await page.getByRole('button', { name: 'Whole trace' }).click();
    await settled(page);
    const { text } = await download(page, 'export-cleaned-csv');
    const rows = text.split('\n').filter((l) => l && !l.startsWith('#') && /^[-\d]/.test(l));
    expect(rows.length).toBe(n); // the moving average's default end handling ('shrink') keeps every point
    expect(Number(rows[0].split(',')[0])).toBe(0);
    expect(Number(rows[n - 1].split(',')[0])).toBeCloseTo(999.999, 9);
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
});
