/**
 * Does the moving average's written-out loop still earn its duplication?
 * `src/core/steps/moving-average.ts` repeats its compensated running-sum
 * step in three loops (padded start, interior, padded end), and its comment
 * says a shared closure "doubles the time". This bench times the step as
 * shipped (`movingAverage(y, w, 'mirror')`) against the same algorithm with
 * the step written once, two ways:
 *   closure: one arrow function that updates the captured running sum and
 *            its compensation (what the comment describes);
 *   helper:  one module-level function that updates a two-element state
 *            array (the other way to write the step once without a closure).
 * Both variants are checked to give the shipped output bit for bit before
 * anything is timed. Calls alternate (shipped, closure, helper, then the
 * order rotates every round), each after a garbage collection outside the
 * timing; it prints the fastest call and the median of each side and the
 * median of the per-round ratios, with the load average before and after.
 *
 *   npx vite build --ssr test/bench/moving-average-closure.ts --outDir node_modules/.cache/bench-ma --emptyOutDir --logLevel warn \
 *     && node --expose-gc node_modules/.cache/bench-ma/moving-average-closure.js [--n 1000000] [--rounds 15] [--window 25]
 */
import { loadavg } from 'node:os';
import { padIndex } from '../../src/core/numeric/convolve.ts';
import { makeRng } from '../../src/core/numeric/random.ts';
import { movingAverage } from '../../src/core/steps/moving-average.ts';

type Mode = 'nearest' | 'mirror' | 'reflect';

/** The shipped slide with its step written once, as a closure over the running sum. */
function slideClosure(y: Float64Array, out: Float64Array, h: number, first: number, last: number, mode: Mode): void {
  const n = y.length;
  const w = 2 * h + 1;
  const at = (j: number): number => (j >= 0 && j < n ? y[j] : y[padIndex(j, n, mode)]);
  const safeLo = h + 1;
  const safeHi = n - 1 - h;
  const every = Math.max(4096, 4 * w);
  for (let start = first; start <= last; start += every) {
    const stop = Math.min(last, start + every - 1);
    let s = 0;
    let c = 0;
    const add = (v: number): void => {
      const t = s + v;
      const b = t - s;
      c += (s - (t - b)) + (v - b);
      s = t;
    };
    for (let j = start - h; j <= start + h; j++) add(at(j));
    out[start] = (s + c) / w;
    const inLo = Math.max(start + 1, safeLo);
    const inHi = Math.min(stop, safeHi);
    let i = start + 1;
    for (; i <= stop && i < inLo; i++) { add(at(i + h)); add(-at(i - h - 1)); out[i] = (s + c) / w; }
    for (; i <= inHi; i++) { add(y[i + h]); add(-y[i - h - 1]); out[i] = (s + c) / w; }
    for (; i <= stop; i++) { add(at(i + h)); add(-at(i - h - 1)); out[i] = (s + c) / w; }
  }
}

/** Knuth's TwoSum into a two-element state [sum, compensation]. */
function addTo(st: Float64Array, v: number): void {
  const s = st[0];
  const t = s + v;
  const b = t - s;
  st[1] += (s - (t - b)) + (v - b);
  st[0] = t;
}

/** The shipped slide with its step written once, as a module-level function over a state array. */
function slideHelper(y: Float64Array, out: Float64Array, h: number, first: number, last: number, mode: Mode): void {
  const n = y.length;
  const w = 2 * h + 1;
  const at = (j: number): number => (j >= 0 && j < n ? y[j] : y[padIndex(j, n, mode)]);
  const safeLo = h + 1;
  const safeHi = n - 1 - h;
  const every = Math.max(4096, 4 * w);
  const st = new Float64Array(2);
  for (let start = first; start <= last; start += every) {
    const stop = Math.min(last, start + every - 1);
    st[0] = 0;
    st[1] = 0;
    for (let j = start - h; j <= start + h; j++) addTo(st, at(j));
    out[start] = (st[0] + st[1]) / w;
    const inLo = Math.max(start + 1, safeLo);
    const inHi = Math.min(stop, safeHi);
    let i = start + 1;
    for (; i <= stop && i < inLo; i++) { addTo(st, at(i + h)); addTo(st, -at(i - h - 1)); out[i] = (st[0] + st[1]) / w; }
    for (; i <= inHi; i++) { addTo(st, y[i + h]); addTo(st, -y[i - h - 1]); out[i] = (st[0] + st[1]) / w; }
    for (; i <= stop; i++) { addTo(st, at(i + h)); addTo(st, -at(i - h - 1)); out[i] = (st[0] + st[1]) / w; }
  }
}

function arg(name: string, fallback: number): number {
  const i = process.argv.indexOf(`--${name}`);
  return i > 0 ? Number(process.argv[i + 1]) : fallback;
}

const median = (a: number[]): number => {
  const s = [...a].sort((p, q) => p - q);
  return s.length % 2 ? s[(s.length - 1) / 2] : (s[s.length / 2 - 1] + s[s.length / 2]) / 2;
};

const gc = (globalThis as { gc?: () => void }).gc;

function main(): void {
  const n = arg('n', 1e6);
  const rounds = arg('rounds', 15);
  const window = arg('window', 25);
  const h = (window - 1) / 2;
  // Seeded trace: drift, a Gaussian peak every 4000 points, white noise (invented here, like the main bench's).
  const rng = makeRng(20261203);
  const y = new Float64Array(n);
  for (let i = 0; i < n; i++) y[i] = 0.5 + 1e-6 * i + 3 * Math.exp(-0.5 * (((i % 4000) - 2000) / 20) ** 2) + 0.05 * rng.normal();
  const sides: Record<string, () => Float64Array> = {
    shipped: () => movingAverage(y, window, 'mirror'),
    closure: () => { const o = new Float64Array(n); slideClosure(y, o, h, 0, n - 1, 'mirror'); return o; },
    helper: () => { const o = new Float64Array(n); slideHelper(y, o, h, 0, n - 1, 'mirror'); return o; },
  };
  const names = Object.keys(sides);
  // Same output bit for bit, or the comparison means nothing.
  const ref = sides.shipped();
  for (const k of names) {
    const o = sides[k]();
    for (let i = 0; i < n; i++) if (!Object.is(o[i], ref[i])) throw new Error(`${k} differs from the shipped step at ${i}: ${o[i]} vs ${ref[i]}`);
  }
  // Warm-up: every side compiled on the full trace.
  for (let k = 0; k < 5; k++) for (const s of names) sides[s]();
  const loadBefore = loadavg().map((v) => v.toFixed(2)).join(' ');
  const ms: Record<string, number[]> = Object.fromEntries(names.map((k) => [k, []]));
  for (let r = 0; r < rounds; r++) {
    const order = names.map((_, j) => names[(j + r) % names.length]);
    for (const s of order) {
      gc?.();
      const t0 = performance.now();
      sides[s]();
      ms[s].push(performance.now() - t0);
    }
  }
  const loadAfter = loadavg().map((v) => v.toFixed(2)).join(' ');
  console.log(`moving average, window ${window}, mirror ends, n=${n}, ${rounds} rounds; Node ${process.version}; gc ${gc ? 'on' : 'OFF (run with --expose-gc)'}`);
  console.log(`LOAD before ${loadBefore} after ${loadAfter}`);
  for (const k of names) {
    const ratios = ms[k].map((v, r) => v / ms.shipped[r]);
    console.log(`MA side=${k} min_ms=${Math.min(...ms[k]).toFixed(2)} median_ms=${median(ms[k]).toFixed(2)} ratio_of_mins=${(Math.min(...ms[k]) / Math.min(...ms.shipped)).toFixed(2)} median_ratio=${median(ratios).toFixed(2)}`);
  }
}

main();
