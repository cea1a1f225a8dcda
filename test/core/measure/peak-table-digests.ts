/**
 * The peak table's output, case by case, as SHA-256 digests of its full JSON
 * (every field of every peak, the options the table was made with, or the
 * problem the detector raised). peak-table-digests.test.ts recomputes them
 * and compares them with test/reference/peak-table-digests.json, made at
 * commit 4591a42 (before the issue-16 kernel round 2 made the local measures
 * cheaper): a change of speed must not change one byte of any table.
 *
 * Cases (traces nobody designed the measures for, and the ones the project
 * ships): the bench trace at 10⁶ points, and at 10⁵ as dips (test/bench/bench-trace.ts); the
 * invented demo (scripts/make-demo.mjs), seeds 1–100, peaks and dips, σ 0.05
 * and 0.1, and seeds 1–4 with the other S/N definitions, the other split
 * rule, a separation, a noise correlation and a noise profile; the three
 * MALDI-TOF spectra at σ 5, 20 and 100; drifting baselines, bands over the
 * whole range and AR(1) noise at 10⁵ points (test/core/measure/long-traces.ts).
 */
import { createHash } from 'node:crypto';
// @ts-expect-error a plain script without type declarations
import { makeDemo } from '../../../scripts/make-demo.mjs';
import { defaultPeakOptions, detectPeaks } from '../../../src/core/measure/peak-table.ts';
import type { Peak, PeakOptions } from '../../../src/core/measure/peak-types.ts';
import { makeBenchTrace } from '../../bench/bench-trace.ts';
import { loadReal, MALDI_FILES } from '../../real/load-real.ts';
import { longTrace } from './long-traces.ts';

/** One table to digest: its trace and options, made only when asked (the 10⁶-point trace is 16 MB). */
export interface DigestCase {
  readonly name: string;
  make(): { x: Float64Array; y: Float64Array; options: PeakOptions };
}

/** What a case gives: the number of rows (for a readable failure) and the digest of the JSON. */
export interface Digest {
  readonly rows: number;
  readonly sha256: string;
}

/** JSON that keeps what JSON.stringify would blur: NaN, ±Infinity, −0 and typed arrays written out. */
function exactJson(v: unknown): string {
  return JSON.stringify(v, (_k, val: unknown) => {
    if (typeof val === 'number') {
      if (Number.isNaN(val)) return 'NaN';
      if (!Number.isFinite(val)) return val > 0 ? 'Infinity' : '-Infinity';
      if (Object.is(val, -0)) return '-0';
      return val;
    }
    if (ArrayBuffer.isView(val)) return Array.from(val as unknown as ArrayLike<number>);
    return val;
  });
}

/** The digest of one case: the detector's rows and options, or its problem. */
export function digestOf(c: DigestCase): Digest {
  const { x, y, options } = c.make();
  let outcome: Peak[] | Error;
  try {
    outcome = detectPeaks(x, y, options);
  } catch (e) {
    outcome = e instanceof Error ? e : new Error(String(e));
  }
  return digestOfTable(options, outcome);
}

/** The digest of a table (or of the problem raised) made with `options`, however it was made. */
export function digestOfTable(options: PeakOptions, outcome: Peak[] | Error): Digest {
  const body = outcome instanceof Error
    ? exactJson({ options, problem: `${outcome.name}: ${outcome.message}` })
    : exactJson({ options, peaks: outcome });
  return { rows: outcome instanceof Error ? -1 : outcome.length, sha256: createHash('sha256').update(body).digest('hex') };
}

interface Demo { x: number[]; files: { y: number[] }[]; truth: { x: { step: number } } }

/** The fixed list of cases. */
export function digestCases(): DigestCase[] {
  const cases: DigestCase[] = [];
  cases.push({ name: 'bench trace 1e6', make: () => { const t = makeBenchTrace(1_000_000); return { x: t.x, y: t.y, options: defaultPeakOptions(t.sigma, 0.001) }; } });
  cases.push({ name: 'bench trace 1e5 dips', make: () => { const t = makeBenchTrace(100_000); return { x: t.x, y: t.y.map((v) => -v), options: { ...defaultPeakOptions(t.sigma, 0.001), negative: true } }; } });
  const demo = (seed: number) => {
    const d = makeDemo(seed) as Demo;
    return { x: Float64Array.from(d.x), y: Float64Array.from(d.files[0].y), step: d.truth.x.step };
  };
  for (let seed = 1; seed <= 100; seed++) {
    for (const sigma of [0.05, 0.1]) {
      for (const negative of [false, true]) {
        cases.push({
          name: `demo seed ${seed} σ ${sigma}${negative ? ' dips' : ''}`,
          make: () => { const d = demo(seed); return { x: d.x, y: negative ? d.y.map((v) => -v) : d.y, options: { ...defaultPeakOptions(sigma, d.step), negative } }; },
        });
      }
    }
  }
  const variants: [string, (o: PeakOptions, n: number) => PeakOptions][] = [
    ['pharmacopoeial S/N, region S/N, separation 0.05', (o) => ({ ...o, snrDefinition: 'pharmacopoeial', regionSnr: true, minSeparation: 0.05 })],
    ['region S/N, valley to valley, min S/N 3', (o) => ({ ...o, snrDefinition: 'region', split: 'valley-to-valley', minSnr: 3 })],
    ['noise correlation 0.6, 0.3, 0.1', (o) => ({ ...o, noiseCorrelation: [1, 0.6, 0.3, 0.1] })],
    ['noise profile 0.04 / 0.08', (o, n) => ({ ...o, noiseProfile: { points: n, starts: Int32Array.of(0, n >> 1), sigma: Float64Array.of(0.04, 0.08) } })],
  ];
  for (let seed = 1; seed <= 4; seed++) {
    for (const [what, change] of variants) {
      cases.push({ name: `demo seed ${seed} ${what}`, make: () => { const d = demo(seed); return { x: d.x, y: d.y, options: change(defaultPeakOptions(0.05, d.step), d.x.length) }; } });
    }
  }
  for (const f of MALDI_FILES) {
    for (const sigma of [5, 20, 100]) {
      cases.push({
        name: `${f} σ ${sigma}`,
        make: () => {
          const t = loadReal(f).traces[0]!;
          const x = Float64Array.from(t.x), y = Float64Array.from(t.y);
          return { x, y, options: defaultPeakOptions(sigma, (x[x.length - 1] - x[0]) / (x.length - 1)) };
        },
      });
    }
  }
  const n = 100_000;
  const grid = () => Float64Array.from({ length: n }, (_, i) => i * 0.001);
  for (const kind of ['drift', 'bands', 'ar1'] as const) {
    for (const seed of [1, 2]) {
      cases.push({
        name: `${kind} 1e5 seed ${seed}`,
        make: () => {
          const y = longTrace(n, 1600 + seed, kind);
          // AR(1) with φ 0.9 and innovations of SD 0.05: σ = 0.05/√(1 − 0.81); seed 2 also says how it is correlated (ρ_k = 0.9^k).
          const o = kind === 'ar1' ? defaultPeakOptions(0.05 / Math.sqrt(1 - 0.81), 0.001) : defaultPeakOptions(0.05, 0.001);
          return { x: grid(), y, options: kind === 'ar1' && seed === 2 ? { ...o, noiseCorrelation: Array.from({ length: 40 }, (_, k) => 0.9 ** k) } : o };
        },
      });
    }
  }
  return cases;
}
