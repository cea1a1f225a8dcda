/**
 * A CPU profile of the peak detector with every measure on the bench trace
 * (test/bench/bench-trace.ts), for finding where its time goes:
 *
 *   npx vite build --ssr test/bench/profile-peaks.ts --outDir node_modules/.cache/profile-peaks --emptyOutDir --logLevel warn
 *   node --cpu-prof --cpu-prof-dir=/tmp/peaks-prof node_modules/.cache/profile-peaks/profile-peaks.js [points] [calls] [parts]
 *
 * then sum self time per function from the .cpuprofile (Chrome's DevTools
 * open it too). Defaults: 10⁶ points, 5 calls after one warm-up call. Prints
 * each call's wall and CPU time, then the minimum and median CPU time. With
 * `parts`, also the CPU time of the local measures of the candidates that
 * pass the height and own-width tests alone and of those that do not.
 * Asserts nothing (timings are for the bench).
 */
import { blankMeasure, locatingCopy, measureLocalInto, xAt } from '../../src/core/measure/peak-bounds.ts';
import { prominentMaxima } from '../../src/core/measure/peak-detection.ts';
import { noiseModel } from '../../src/core/measure/peak-snr.ts';
import { defaultPeakOptions, detectPeaks } from '../../src/core/measure/peak-table.ts';
import { makeBenchTrace } from './bench-trace.ts';

const n = Number(process.argv[2] ?? 1_000_000);
const calls = Number(process.argv[3] ?? 5);
const parts = process.argv[4] === 'parts';
const t = makeBenchTrace(n);
const o = defaultPeakOptions(t.sigma, 0.001);
detectPeaks(t.x, t.y, o);

/** CPU ms of fn (user + system): on a busy machine the process's own CPU time moves less than the clock. */
function cpuMs(fn: () => unknown): number {
  const c0 = process.cpuUsage();
  fn();
  const c1 = process.cpuUsage(c0);
  return (c1.user + c1.system) / 1000;
}
const stat = (a: number[]) => { const b = [...a].sort((p, q) => p - q); return `min ${b[0].toFixed(1)}, median ${b[b.length >> 1].toFixed(1)}`; };

const cpu: number[] = [];
for (let k = 0; k < calls; k++) {
  const t0 = performance.now();
  let rows = 0;
  cpu.push(cpuMs(() => { rows = detectPeaks(t.x, t.y, o).length; }));
  console.log(`call ${k + 1}: ${(performance.now() - t0).toFixed(1)} ms wall, ${cpu[k].toFixed(1)} ms CPU, ${rows} rows`);
}
if (parts) {
  const cand = prominentMaxima(t.y, o.minProminence);
  const c = { x: t.x, s: t.y, noise: noiseModel(t.y, o), loc: locatingCopy(t.y) };
  const m = blankMeasure();
  const pass: number[] = [], fail: number[] = [];
  for (let k = 0; k < cand.count; k++) {
    const ok = measureLocalInto(c, cand.index[k], cand.halfWidth[k], m, o.minWidth) && m.height > 0 && xAt(t.x, m.rightIp) - xAt(t.x, m.leftIp) >= o.minWidth;
    (ok ? pass : fail).push(k);
  }
  const tp: number[] = [], tf: number[] = [];
  for (let r = 0; r < calls; r++) {
    tp.push(cpuMs(() => { for (const k of pass) measureLocalInto(c, cand.index[k], cand.halfWidth[k], m, o.minWidth); }));
    tf.push(cpuMs(() => { for (const k of fail) measureLocalInto(c, cand.index[k], cand.halfWidth[k], m, o.minWidth); }));
  }
  console.log(`local measures, ${pass.length} candidates that pass: CPU ms ${stat(tp)}; ${fail.length} that do not: ${stat(tf)}`);
}
console.log(`CPU ms per call: ${stat(cpu)}`);
