/**
 * Speed of region fitting against SciPy's optimize.curve_fit on the same data.
 *
 *   npm run bench:fit                 5 rounds of 20 calls per side per case
 *   npm run bench:fit -- --rounds 3 --calls 10 --no-scipy
 *
 * Cases: 500-point regions (the interactive size the worker must handle),
 * seeded noise, starts 10–20 % off the truth as peak detection would give.
 * Sides alternate by rounds (ours, then SciPy in one Python process, then
 * ours again …) so both see the same machine load; each call is timed
 * separately and minimum and median per call are printed with the load
 * average. Prints, never asserts.
 * SciPy side: test/bench/scipy_fit_bench.py (curve_fit, method 'lm', its
 * default tolerances; ours stop at tighter ones).
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { cpus, loadavg, tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { comparePeakCounts } from '../../src/core/measure/fit/count.ts';
import { fitRegion } from '../../src/core/measure/fit/region.ts';
import type { PeakStart } from '../../src/core/measure/fit/region.ts';
import { SHAPES } from '../../src/core/measure/fit/shapes.ts';
import type { ShapeKind } from '../../src/core/measure/fit/shapes.ts';
import { makeRng } from '../../src/core/numeric/random.ts';

interface Case {
  name: string;
  shapes: ShapeKind[];
  truth: number[]; // shape parameters left to right, then baseline b0, b1 (t = (x − centre)/halfSpan)
  noise: number;
}

const N = 500;
const x = Float64Array.from({ length: N }, (_, i) => 3 + i * 0.01);
const CASES: Case[] = [
  { name: '2 Gaussians, shoulder at Rs 0.8', shapes: ['gaussian', 'gaussian'], truth: [5.2, 1, 0.2355, 5.52, 0.3, 0.2355, 0.3, 0.12], noise: 0.03 },
  { name: '3 Gaussians', shapes: ['gaussian', 'gaussian', 'gaussian'], truth: [4.6, 0.8, 0.3, 5.2, 1, 0.25, 5.7, 0.5, 0.3, 0.3, 0.12], noise: 0.02 },
  { name: 'EMG + Gaussian', shapes: ['emg', 'gaussian'], truth: [5.0, 0.4, 0.1, 0.15, 6.0, 0.6, 0.3, 0.3, 0.12], noise: 0.02 },
];

function parseArgs(argv: string[]) {
  const o = { rounds: 5, calls: 20, scipy: true };
  for (let i = 0; i < argv.length; i++) {
    if (argv[i] === '--rounds') o.rounds = Number(argv[++i]);
    else if (argv[i] === '--calls') o.calls = Number(argv[++i]);
    else if (argv[i] === '--no-scipy') o.scipy = false;
    else throw new RangeError(`Unknown option ${argv[i]}; see the head of test/bench/fit.ts.`);
  }
  return o;
}

function makeData(c: Case) {
  const rng = makeRng(2026);
  const y = new Float64Array(N);
  let o = 0;
  const starts: PeakStart[] = [];
  const p0: number[] = [];
  for (const s of c.shapes) {
    const m = SHAPES[s];
    const q = c.truth.slice(o, o + m.paramNames.length);
    m.evaluate(x, q, 0, y, null, 0);
    const f = m.figures(q, 0);
    const start = { position: f.position + 0.1 * f.fwhm, height: 0.85 * f.height, fwhm: 1.2 * f.fwhm };
    starts.push(start);
    p0.push(...m.start(start.position, start.height, start.fwhm));
    o += m.paramNames.length;
  }
  const centre = 0.5 * (x[0] + x[N - 1]);
  const half = 0.5 * (x[N - 1] - x[0]);
  for (let i = 0; i < N; i++) y[i] += c.truth[o] + c.truth[o + 1] * ((x[i] - centre) / half) + c.noise * rng.normal();
  p0.push(c.truth[o] * 0.9, c.truth[o + 1] * 0.9);
  return { y, starts, p0 };
}

const stats = (t: number[]) => {
  const s = t.slice().sort((a, b) => a - b);
  return { min: s[0], median: s[s.length >> 1] };
};

function main() {
  const o = parseArgs(process.argv.slice(2));
  const data = CASES.map(makeData);
  const dir = mkdtempSync(join(tmpdir(), 'tw-fit-bench-'));
  const job = join(dir, 'job.json');
  writeFileSync(job, JSON.stringify({ x: Array.from(x), calls: o.calls, cases: CASES.map((c, i) => ({ name: c.name, shapes: c.shapes, y: Array.from(data[i].y), p0: data[i].p0 })) }));
  const ours: number[][] = CASES.map(() => []);
  const counts: number[][] = CASES.map(() => []);
  const theirs: number[][] = CASES.map(() => []);
  let scipyVersion = '';
  const loads: number[] = [];
  for (let r = 0; r < o.rounds; r++) {
    loads.push(loadavg()[0]);
    CASES.forEach((c, i) => {
      for (let k = 0; k < o.calls; k++) {
        const t0 = performance.now();
        const out = fitRegion(x, data[i].y, { from: 3, to: x[N - 1], shape: c.shapes, starts: data[i].starts });
        ours[i].push(performance.now() - t0);
        if (!out.ok || !out.fit.converged) throw new Error(`${c.name}: fit failed`);
        const t1 = performance.now();
        comparePeakCounts(x, data[i].y, { from: 3, to: x[N - 1], shape: c.shapes[0], peaks: c.shapes.length - 1 });
        counts[i].push(performance.now() - t1);
      }
    });
    if (o.scipy) {
      const p = spawnSync('python3', [resolve(process.cwd(), 'test/bench/scipy_fit_bench.py'), job], { encoding: 'utf8', stdio: ['ignore', 'pipe', 'inherit'] });
      if (p.status === 0) {
        const res = JSON.parse(p.stdout) as { scipy: string; cases: { times: number[] }[] };
        scipyVersion = res.scipy;
        res.cases.forEach((cs, i) => theirs[i].push(...cs.times));
      } else {
        console.log('python3 with SciPy not available: SciPy column left empty.');
        o.scipy = false;
      }
    }
  }
  rmSync(dir, { recursive: true, force: true });
  console.log(`node ${process.version}, ${cpus().length} × ${cpus()[0]?.model ?? 'CPU'}, load average during the run ${Math.min(...loads).toFixed(2)}–${Math.max(...loads).toFixed(2)}${scipyVersion ? `, SciPy ${scipyVersion}` : ''}`);
  console.log(`${o.rounds} rounds × ${o.calls} calls per side, ${N}-point region; ms per call (min / median)`);
  console.log('case                              | fitRegion      | curve_fit      | ratio min | k vs k+1 (comparePeakCounts)');
  CASES.forEach((c, i) => {
    const a = stats(ours[i]);
    const b = theirs[i].length ? stats(theirs[i]) : null;
    const k = stats(counts[i]);
    console.log(
      `${c.name.padEnd(34)}| ${a.min.toFixed(2).padStart(6)} / ${a.median.toFixed(2).padStart(6)} | ${b ? `${b.min.toFixed(2).padStart(6)} / ${b.median.toFixed(2).padStart(6)}` : '      —       '} | ${b ? (a.min / b.min).toFixed(2).padStart(8) : '       —'}  | ${k.min.toFixed(1)} / ${k.median.toFixed(1)} (${c.shapes.length - 1} vs ${c.shapes.length})`,
    );
  });
}

main();
