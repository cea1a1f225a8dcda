/**
 * A CPU profile of the peak detector with every measure on the bench trace
 * (test/bench/bench-trace.ts), for finding where its time goes:
 *
 *   npx vite build --ssr test/bench/profile-peaks.ts --outDir node_modules/.cache/profile-peaks --emptyOutDir --logLevel warn
 *   node --cpu-prof --cpu-prof-dir=/tmp/peaks-prof node_modules/.cache/profile-peaks/profile-peaks.js [points] [calls]
 *
 * then sum self time per function from the .cpuprofile (Chrome's DevTools
 * open it too). Defaults: 10⁶ points, 5 calls after one warm-up call. Prints
 * each call's wall and CPU time, then the minimum and median CPU time; asserts nothing (timings are for the bench).
 */
import { defaultPeakOptions, detectPeaks } from '../../src/core/measure/peak-table.ts';
import { makeBenchTrace } from './bench-trace.ts';

const n = Number(process.argv[2] ?? 1_000_000);
const calls = Number(process.argv[3] ?? 5);
const t = makeBenchTrace(n);
const o = defaultPeakOptions(t.sigma, 0.001);
detectPeaks(t.x, t.y, o);
// CPU time beside wall time: on a busy machine the process's own CPU time moves less than the clock.
const cpu: number[] = [];
for (let k = 0; k < calls; k++) {
  const t0 = performance.now(), c0 = process.cpuUsage();
  const rows = detectPeaks(t.x, t.y, o).length;
  const c1 = process.cpuUsage(c0);
  cpu.push((c1.user + c1.system) / 1000);
  console.log(`call ${k + 1}: ${(performance.now() - t0).toFixed(1)} ms wall, ${cpu[k].toFixed(1)} ms CPU, ${rows} rows`);
}
cpu.sort((a, b) => a - b);
console.log(`CPU ms per call: min ${cpu[0].toFixed(1)}, median ${cpu[cpu.length >> 1].toFixed(1)}`);
