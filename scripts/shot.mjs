// Screenshot of the built page for a human to look at: node scripts/shot.mjs [out.png] [actions]
import { chromium } from '@playwright/test';
const out = process.argv[2] ?? 'shots/page.png';
const browser = await chromium.launch({
  executablePath: process.env.TRACEWRIGHT_CHROMIUM ?? '/usr/bin/chromium',
  args: ['--no-sandbox', '--disable-gpu', '--disable-background-networking', '--no-first-run', '--disable-component-update', '--disable-sync'],
});
const page = await browser.newPage({ viewport: { width: 1500, height: 1000 } });
page.on('console', (m) => { if (m.type() === 'error' || m.type() === 'warning') console.log('console:', m.text()); });
page.on('pageerror', (e) => console.log('pageerror:', e.message));
await page.goto(process.env.URL ?? 'http://127.0.0.1:4173/');
await page.waitForTimeout(2500);
const steps = (process.argv[3] ?? '').split(',').filter(Boolean);
for (const s of steps) {
  await page.selectOption('#add-step-choice', s);
  await page.getByRole('button', { name: 'Add step' }).click();
  await page.waitForTimeout(800);
}
await page.screenshot({ path: out, fullPage: true });
await browser.close();
console.log('wrote', out);
