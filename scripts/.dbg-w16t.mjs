import { chromium } from '@playwright/test';
import { writeFileSync, existsSync } from 'node:fs';
const file = '/tmp/w16t-long-table.csv';
if (!existsSync(file)) {
  let seed = 1616; const rnd = () => { seed = (seed * 1103515245 + 12345) % 2147483648; return seed / 2147483648; };
  const normal = () => Math.sqrt(-2 * Math.log(rnd() + 1e-12)) * Math.cos(2 * Math.PI * rnd());
  const lines = ['time (min),signal (mAU)'];
  for (let i = 0; i < 100000; i++) { let v = normal(); for (let k = 0; k < 8; k++) { const d = (i - 10000 - 11000 * k) / (20 + 5 * k); if (d * d < 100) v += (8 + 6 * k) * Math.exp(-0.5 * d * d); } lines.push(`${(i * 0.0001).toFixed(4)},${v.toFixed(3)}`); }
  writeFileSync(file, lines.join('\n') + '\n');
}
const b = await chromium.launch({ executablePath: '/usr/bin/chromium', args: ['--no-sandbox'] });
const page = await b.newPage({ viewport: { width: 1280, height: 900 } });
page.on('console', (m) => console.log('PAGE', m.text()));
await page.goto('http://127.0.0.1:4271/');
await page.waitForTimeout(4000);
const g = page.getByTestId('guide-close'); if (await g.isVisible()) await g.click();
await page.getByTestId('file-input').setInputFiles(file);
await page.waitForSelector('[data-testid="peak-table"][data-windowed="true"]', { timeout: 60000 });
await page.waitForTimeout(3000);
const t = page.getByTestId('peak-table');
await t.scrollIntoViewIfNeeded();
await t.evaluate((t) => { const w = t.parentElement; w.scrollTop = 0.5 * (w.scrollHeight - w.clientHeight); });
await page.waitForTimeout(500);
for (let s = 0; s < 4; s++) {
  const r = await t.evaluate(async (t) => {
    const wrap = t.parentElement; const box = () => wrap.getBoundingClientRect().top;
    const row = Array.from(t.querySelectorAll('tbody tr[aria-rowindex]')).find((r) => r.getBoundingClientRect().top > box() + 60);
    const key = row.dataset.rowKey; const log = [];
    const pos = () => { const r = t.querySelector(`tbody tr[data-row-key="${key}"]`); return r ? (r.getBoundingClientRect().top - box()).toFixed(1) : 'gone'; };
    log.push(`start ${pos()} st=${wrap.scrollTop.toFixed(1)} sh=${wrap.scrollHeight}`);
    wrap.scrollTop -= 150;
    log.push(`set ${pos()} st=${wrap.scrollTop.toFixed(1)}`);
    for (let f = 0; f < 6; f++) { await new Promise((r) => requestAnimationFrame(r)); log.push(`f${f} ${pos()} st=${wrap.scrollTop.toFixed(1)} sh=${wrap.scrollHeight} first=${t.querySelector('tbody tr[aria-rowindex]').getAttribute('aria-rowindex')}`); }
    return log.join('\n');
  });
  console.log(r, '\n---');
}
await b.close();
