import { expect, type Download, type Page } from '@playwright/test';
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { makeRng } from '../src/core/numeric/random.ts';

export interface PlottedTrace { name: string; x: number[]; y: number[] }

/** The data Plotly actually drew (read from the graph div), not what we meant to draw. */
export async function plotted(page: Page): Promise<PlottedTrace[]> {
  return page.evaluate(() => {
    const gd = document.querySelector('[data-testid="figure"]') as unknown as { data?: { name: string; x: number[]; y: number[] }[] } | null;
    return (gd?.data ?? []).map((t) => ({ name: t.name, x: Array.from(t.x ?? []), y: Array.from(t.y ?? []) }));
  });
}

export async function trace(page: Page, name: string): Promise<PlottedTrace | undefined> {
  return (await plotted(page)).find((t) => t.name === name);
}

/** Open the page and wait until the demo sample is drawn. */
export async function openWithDemo(page: Page): Promise<void> {
  const errors: string[] = [];
  page.on('pageerror', (e) => errors.push(String(e)));
  // A passive trail of button presses and file offers, read only when an export press goes silent (exportFile).
  await page.addInitScript(() => {
    const trail: string[] = [];
    (window as unknown as { __exportTrail: string[] }).__exportTrail = trail;
    const offer = HTMLAnchorElement.prototype.click;
    HTMLAnchorElement.prototype.click = function (this: HTMLAnchorElement) {
      trail.push(`${performance.now().toFixed(0)} ms: file offered ${this.download || '(no name)'}`);
      return offer.call(this);
    };
    document.addEventListener('click', (e) => {
      const t = e.target as HTMLElement;
      if (t instanceof HTMLButtonElement) trail.push(`${performance.now().toFixed(0)} ms: press ${t.dataset.testid ?? t.textContent} (disabled ${t.disabled})`);
    }, true);
  });
  await page.goto('/');
  await expect.poll(async () => (await trace(page, 'processed'))?.x.length ?? 0, { timeout: 20_000 }).toBeGreaterThan(100);
  await expect(page.getByRole('heading', { name: /demo-sample\.csv/ })).toBeVisible();
  expect(errors).toEqual([]);
  // Issue 17: the first-use guide opens on a first visit above the page; put away, the page sits where specs expect it
  // (e2e/bench-page.spec.ts checks the guide itself).
  const guide = page.getByTestId('guide-close');
  if (await guide.isVisible()) await guide.click();
  // The demo's ten files (sample, blank, eight scans) enter in one change and start one analysis, during which the
  // export buttons are disabled. A spec starts once the whole demo is in and analysed.
  await expect(page.locator('.notice').filter({ hasText: 'Demo loaded' })).toBeVisible({ timeout: 30_000 });
  await expect(page.locator('[aria-label="computing"]')).toHaveCount(0, { timeout: 30_000 });
}

/** Everything loaded and edited so far is in the browser's database, not only in the journal (issue 13). */
export async function sessionSaved(page: Page): Promise<void> {
  const status = page.getByTestId('session-status');
  await expect(status).toContainText('kept in this browser', { timeout: 30_000 });
  await expect(status).toHaveAttribute('data-pending', 'false', { timeout: 30_000 });
}

/**
 * Click an export button and give the loss confirmation when the page asks for one.
 * The press is made inside the page only while the button is enabled, in one step: a press between Playwright's
 * "enabled" check and the click can otherwise land on a button that a new analysis has just disabled (exports wait
 * for the newest analysis), which does nothing, as it should. Then it waits for whichever comes first, the download
 * or the dialog, with no short timeout of its own: on a loaded machine the dialog can take longer than any fixed guess.
 */
export async function exportFile(page: Page, testId: string): Promise<{ d: Download; confirmed: boolean }> {
  const waiting = page.waitForEvent('download', { timeout: 60_000 });
  const button = page.getByTestId(testId);
  const dialog = page.getByTestId('loss-confirm');
  await expect.poll(() => button.evaluate((b: HTMLButtonElement) => {
    if (b.disabled) return false;
    b.click();
    return true;
  }), { timeout: 30_000, message: `${testId} stayed disabled` }).toBe(true);
  const first = await Promise.race([
    waiting.then(() => 'download' as const, () => 'nothing' as const),
    dialog.waitFor({ timeout: 60_000 }).then(() => 'dialog' as const, () => 'nothing' as const),
  ]);
  if (first === 'nothing') {
    // What the page saw (a passive log kept by openWithDemo's init script), for the failure message.
    const trail = await page.evaluate(() => (window as unknown as { __exportTrail?: string[] }).__exportTrail?.slice(-8) ?? []);
    throw new Error(`${testId}: no download and no loss dialog within 60 s of the press. Last events in the page:\n  ${trail.join('\n  ')}`);
  }
  if (first === 'dialog') await dialog.getByRole('button', { name: 'Export anyway' }).click();
  return { d: await waiting, confirmed: first === 'dialog' };
}

/** Click an export button, confirm the loss dialog when it asks, and read the downloaded file as text. */
export async function download(page: Page, testId: string): Promise<{ d: Download; text: string }> {
  const { d } = await exportFile(page, testId);
  return { d, text: readFileSync(await d.path(), 'utf8') };
}

/** Add a step by its id from the step menu. */
export async function addStep(page: Page, id: string): Promise<void> {
  await page.selectOption('#add-step-choice', id);
  await page.getByRole('button', { name: 'Add step' }).click();
}

/** Wait until no analysis is running (the busy mark is gone and stays gone). */
export async function settled(page: Page): Promise<void> {
  for (let i = 0; i < 2; i++) {
    await expect(page.locator('[aria-label="computing"]')).toHaveCount(0, { timeout: 30_000 });
    await page.waitForTimeout(300);
  }
}

const ISO = /\d{4}-\d\d-\d\dT\d\d:\d\d:\d\d\.\d{3}Z/g;
/** A CSV without its byte-order mark and its "Written at" comment line. */
export const csvBody = (text: string): string => text.replace(/^\uFEFF/, '').split('\r\n').filter((l) => !l.startsWith('# Written at:')).join('\r\n');
/** A report without its time stamps and without the user's confirmation block. */
export const reportBody = (html: string): string => html.replace(/\n<div class="confirm" data-role="confirmation">[\s\S]*?<\/ul><\/div>/, '')
  .replace(/\n<p data-role="confirmation-note">[\s\S]*?<\/p>/, '').replace(ISO, 'TIME');

/**
 * Two texts that must say the same thing with the same numbers, where the numbers may come from two JavaScript
 * engines: the page's (Chromium) and the command line's (Node). Their Math.sin, cos, log and exp are not required
 * to round alike, and do not: Chromium 156 gives Math.sin(2.5) = 0.5984721441039565, Node 20 0.5984721441039564
 * (measured on this machine). Anything drawn through them (the seeded noise of a simulation) can then differ in
 * its last bits. Every number (as written: digits, sign, point, exponent) is compared within 1e-12 relative, and
 * the text between numbers exactly; the first difference is named.
 */
export function expectSameWithinRounding(actual: string, expected: string): void {
  const NUM = /-?\d+(?:\.\d+)?(?:e[-+]?\d+)?/gi;
  const words = (t: string) => t.split(NUM);
  const nums = (t: string) => (t.match(NUM) ?? []).map(Number);
  expect(words(actual)).toEqual(words(expected));
  const a = nums(actual), b = nums(expected);
  expect(a.length).toBe(b.length);
  const off = a.findIndex((v, i) => !(v === b[i] || Math.abs(v - b[i]) <= 1e-12 * Math.max(Math.abs(v), Math.abs(b[i]))));
  expect(off < 0 ? null : `number ${off}: ${a[off]} against ${b[off]}`).toBeNull();
}

/** Drag across the main plot from x = a to x = b (data units) with "Mark a range" on. */
export async function markRange(page: Page, a: number, b: number): Promise<void> {
  await page.getByRole('button', { name: 'Mark a range' }).click();
  const fig = page.getByTestId('figure');
  const box = (await fig.boundingBox())!;
  const px = await page.evaluate(([from, to]) => {
    const gd = document.querySelector('[data-testid="figure"]') as unknown as { _fullLayout: { xaxis: { l2p: (v: number) => number; _offset: number }; yaxis: { _offset: number } } };
    const xa = gd._fullLayout.xaxis;
    return { a: xa.l2p(from) + xa._offset, b: xa.l2p(to) + xa._offset, y: gd._fullLayout.yaxis._offset + 80 };
  }, [a, b]);
  await page.mouse.move(box.x + px.a, box.y + px.y);
  await page.mouse.down();
  await page.mouse.move(box.x + (px.a + px.b) / 2, box.y + px.y + 5, { steps: 4 });
  await page.mouse.move(box.x + px.b, box.y + px.y + 5, { steps: 4 });
  await page.mouse.up();
}

/** What {@link writeNoisyCsv} writes: Gaussian peaks [centre, height, σ] in samples on seeded white noise of SD 1. */
export interface NoisyCsv {
  name: string;
  points: number;
  seed: number;
  peaks: readonly (readonly [number, number, number])[];
  /** Header line; default 'time (s),signal (mV)'. */
  header?: string;
  /** x step and its decimals; default 0.001 and 3. */
  dx?: number;
  xDigits?: number;
  /** Added to sample i (one-point spikes, say). */
  extra?: (i: number) => number;
}

/**
 * An invented long trace in a temporary CSV (the project's seeded generator, so every run writes the same
 * file): noise, then each peak within 10 σ of its centre, then `extra`, y to 3 decimals. Returns the file and
 * its folder (remove the folder when done).
 */
export function writeNoisyCsv(o: NoisyCsv): { file: string; dir: string } {
  const rng = makeRng(o.seed);
  const dx = o.dx ?? 0.001, xDigits = o.xDigits ?? 3;
  const lines = [o.header ?? 'time (s),signal (mV)'];
  for (let i = 0; i < o.points; i++) {
    let v = rng.normal();
    for (const [c, h, s] of o.peaks) { const d = (i - c) / s; if (d * d < 100) v += h * Math.exp(-0.5 * d * d); }
    if (o.extra) v += o.extra(i);
    lines.push(`${(i * dx).toFixed(xDigits)},${v.toFixed(3)}`);
  }
  const dir = mkdtempSync(join(tmpdir(), 'tracewright-e2e-'));
  const file = join(dir, o.name);
  writeFileSync(file, `${lines.join('\n')}\n`);
  return { file, dir };
}
