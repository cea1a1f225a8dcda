/**
 * The invented demo data in public/demo: it loads through the real loader,
 * and demo-truth.json describes the files exactly (model residuals behave
 * like white noise of the stated SD). Tolerances are 4 standard errors of
 * each statistic for n = 1201 Gaussian samples unless stated.
 */
import { describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { mkdtempSync, readFileSync, readdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { loadFile } from '../../../src/core/io/load.ts';
import type { Trace } from '../../../src/core/trace.ts';

const DEMO = fileURLToPath(new URL('../../../public/demo/', import.meta.url));
const SCRIPT = fileURLToPath(new URL('../../../scripts/make-demo.mjs', import.meta.url));

interface Truth {
  seed: number;
  x: { name: string; unit: string; start: number; step: number; points: number };
  y: { name: string; unit: string };
  noiseSd: number;
  drift: { c0: number; c1: number; c2: number };
  peaks: { label: string; centre: number; height: number; sigma: number; fwhm: number; area: number; trueSn: number }[];
  spike: { file: string; index: number; x: number; size: number; sizeInNoiseSd: number };
  files: { file: string; role: string; peaks: boolean; spike: boolean }[];
}
const truth = JSON.parse(readFileSync(join(DEMO, 'demo-truth.json'), 'utf8')) as Truth;
/** The calibration standards' own truth (checked in test/core/calibration/demo.test.ts); listed here so nothing unlisted hides in public/demo. */
const standardsTruth = JSON.parse(readFileSync(join(DEMO, 'demo-standards-truth.json'), 'utf8')) as {
  files: { file: string }[]; namedPeaksFile: string; amountsFile: string;
};

function load(file: string): Trace {
  const r = loadFile(new Uint8Array(readFileSync(join(DEMO, file))), file);
  if (!r.ok) throw new Error(`${file}: ${r.error.problem}`);
  expect(r.traces.length).toBe(1);
  expect(r.report.skipped).toEqual([]);
  expect(r.report.format).toContain('comma, decimal point');
  return r.traces[0];
}

/** The truth's model of a file at point i, without noise. */
function model(file: Truth['files'][number], i: number, t: number): number {
  const d = truth.drift;
  let v = d.c0 + d.c1 * t + d.c2 * t * t;
  if (file.peaks) for (const p of truth.peaks) v += p.height * Math.exp(-0.5 * ((t - p.centre) / p.sigma) ** 2);
  if (file.spike && i === truth.spike.index) v += truth.spike.size;
  return v;
}

function residual(file: Truth['files'][number], trace: Trace): Float64Array {
  return Float64Array.from(trace.y, (y, i) => y - model(file, i, trace.x[i]));
}

const mean = (a: ArrayLike<number>) => Array.from(a).reduce((s, v) => s + v, 0) / a.length;
function sd(a: ArrayLike<number>): number {
  const m = mean(a);
  return Math.sqrt(Array.from(a).reduce((s, v) => s + (v - m) ** 2, 0) / (a.length - 1));
}

const traces = new Map(truth.files.map((f) => [f.file, load(f.file)]));
const n = truth.x.points;
const sigma = truth.noiseSd;

describe('demo data', () => {
  it('has every file the truth lists, and nothing else', () => {
    const standardsFiles = standardsTruth.files.map((f) => f.file).concat(standardsTruth.namedPeaksFile, standardsTruth.amountsFile, 'demo-standards-truth.json');
    expect(truth.files.map((f) => f.file).concat('demo-truth.json', ...standardsFiles).sort()).toEqual(readdirSync(DEMO).sort());
    expect(truth.files.filter((f) => f.role === 'scan').length).toBe(8);
    expect(truth.files.filter((f) => f.role === 'blank').length).toBe(1);
    expect(truth.files.filter((f) => f.spike).map((f) => f.file)).toEqual([truth.spike.file]);
  });

  it('loads each file with its grid, names, units and metadata', () => {
    for (const [file, t] of traces) {
      expect(t.x.length, file).toBe(n);
      for (let i = 0; i < n; i += 100) expect(t.x[i]).toBeCloseTo(truth.x.start + i * truth.x.step, 9);
      expect([t.xName, t.xUnit, t.yName, t.yUnit]).toEqual([truth.x.name, truth.x.unit, truth.y.name, truth.y.unit]);
      expect(t.name).toBe(`${file}: ${truth.y.name}`);
      expect(Object.keys(t.metadata)).toEqual(['Run', 'Date', 'Rig', 'Detector', 'Note']);
      expect(t.metadata.Note).toContain(`seed ${truth.seed}`);
    }
  });

  it('matches its truth: residuals are white noise of the stated SD in every file', () => {
    // SD of n Gaussian samples has standard error sigma/sqrt(2(n-1)) (common large-sample result); mean has sigma/sqrt(n).
    // Rounding to 4 decimals adds SD 1e-4/sqrt(12), far below these tolerances.
    const sdTol = (4 * sigma) / Math.sqrt(2 * (n - 1));
    const meanTol = (4 * sigma) / Math.sqrt(n);
    for (const f of truth.files) {
      const r = residual(f, traces.get(f.file)!);
      expect(Math.abs(mean(r)), f.file).toBeLessThan(meanTol);
      expect(Math.abs(sd(r) - sigma), f.file).toBeLessThan(sdTol);
      // Largest of 1201 standard normals exceeds 5 SD with probability about 1201 * 5.7e-7 < 0.1 %: no unlisted spike.
      expect(Math.max(...Array.from(r, Math.abs)), f.file).toBeLessThan(5 * sigma);
    }
  });

  it('measures the stated noise SD in a peak-free stretch without using the truth model', () => {
    // 9.5 to 12 min has no peak within 6 sigma of any peak; a quadratic fitted there removes the drift.
    for (const file of ['demo-blank.csv', 'demo-scan-3.csv', 'demo-sample.csv']) {
      const t = traces.get(file)!;
      const xs: number[] = [], ys: number[] = [];
      for (let i = 0; i < n; i++) {
        if (t.x[i] >= 9.5 && i !== truth.spike.index) { xs.push(t.x[i]); ys.push(t.y[i]); }
      }
      const rss = quadraticResidualSumOfSquares(xs, ys);
      const m = xs.length;
      const measured = Math.sqrt(rss / (m - 3));
      expect(Math.abs(measured - sigma), file).toBeLessThan((4 * sigma) / Math.sqrt(2 * (m - 3)));
    }
  });

  it('has the spike where the truth says, in the sample only', () => {
    const sample = traces.get(truth.spike.file)!;
    const withoutSpike = { file: truth.spike.file, role: 'sample', peaks: true, spike: false };
    const r = residual(withoutSpike, sample);
    const at = r.reduce((best, v, i) => (Math.abs(v) > Math.abs(r[best]) ? i : best), 0);
    expect(at).toBe(truth.spike.index);
    expect(sample.x[at]).toBeCloseTo(truth.spike.x, 9);
    expect(Math.abs(r[at] - truth.spike.size)).toBeLessThan(4 * sigma);
    expect(truth.spike.size).toBeCloseTo(truth.spike.sizeInNoiseSd * sigma, 12);
    for (let k = 1; k <= 8; k++) {
      const scan = traces.get(`demo-scan-${k}.csv`)!;
      const rs = residual({ file: '', role: 'scan', peaks: true, spike: false }, scan);
      expect(Math.abs(rs[truth.spike.index])).toBeLessThan(5 * sigma);
    }
  });

  it('draws independent noise for each file, so averaging 8 scans divides the noise SD by sqrt(8)', () => {
    const scans = truth.files.filter((f) => f.role === 'scan').map((f) => residual(f, traces.get(f.file)!));
    // Correlation of independent series: standard error about 1/sqrt(n).
    const corr = (a: Float64Array, b: Float64Array) => {
      const ma = mean(a), mb = mean(b);
      let sab = 0, saa = 0, sbb = 0;
      for (let i = 0; i < a.length; i++) { sab += (a[i] - ma) * (b[i] - mb); saa += (a[i] - ma) ** 2; sbb += (b[i] - mb) ** 2; }
      return sab / Math.sqrt(saa * sbb);
    };
    for (let k = 1; k < scans.length; k++) expect(Math.abs(corr(scans[0], scans[k]))).toBeLessThan(4 / Math.sqrt(n));
    const average = Float64Array.from(scans[0], (_, i) => scans.reduce((s, r) => s + r[i], 0) / scans.length);
    // Averaging n scans of white noise divides its SD by sqrt(n) (REFERENCES.md, "Gaussian peaks and averaging").
    const expected = sigma / Math.sqrt(8);
    expect(Math.abs(sd(average) - expected)).toBeLessThan((4 * expected) / Math.sqrt(2 * (n - 1)));
  });

  it('describes the peaks the brief asks for, with consistent widths and areas', () => {
    expect(truth.peaks.length).toBe(6);
    const sigmas = truth.peaks.map((p) => p.sigma);
    expect(Math.min(...sigmas)).toBeLessThanOrEqual(0.02);
    expect(Math.max(...sigmas)).toBeGreaterThanOrEqual(0.15);
    for (const p of truth.peaks) {
      // FWHM = 2 sqrt(2 ln 2) sigma = 2.3548200 sigma; area = sqrt(2 pi) H sigma = 2.5066283 H sigma (REFERENCES.md).
      expect(p.fwhm).toBeCloseTo(2.35482 * p.sigma, 5);
      expect(p.area).toBeCloseTo(2.5066283 * p.height * p.sigma, 5);
      expect(p.trueSn).toBeCloseTo(p.height / sigma, 9);
      // The spike sits more than 5 sigma from every peak, so it never rides on one.
      expect(Math.abs(truth.spike.x - p.centre)).toBeGreaterThan(5 * p.sigma);
    }
    const shoulder = truth.peaks.find((p) => p.label === 'shoulder')!;
    expect(shoulder.trueSn).toBeGreaterThanOrEqual(3);
    expect(shoulder.trueSn).toBeLessThanOrEqual(5);
    const host = truth.peaks.filter((p) => p !== shoulder).sort((a, b) => Math.abs(a.centre - shoulder.centre) - Math.abs(b.centre - shoulder.centre))[0];
    expect(host.height).toBeGreaterThan(5 * shoulder.height);
    // On the host peak's tail (within 4 host σ), where the host still lifts the baseline under it.
    expect(Math.abs(host.centre - shoulder.centre)).toBeLessThan(4 * host.sigma);
    const nearLoq = truth.peaks.find((p) => p.label === 'near quantitation limit')!;
    // Detection S/N 3 and quantitation S/N 10 are the usual limits (ICH Q2(R1), from memory; USP <621>).
    expect(nearLoq.trueSn).toBeGreaterThanOrEqual(8);
    expect(nearLoq.trueSn).toBeLessThanOrEqual(12);
    expect(Math.max(...truth.peaks.map((p) => p.trueSn))).toBeGreaterThan(100);
  });

  it('is written again byte for byte by the seeded script', () => {
    const dir = mkdtempSync(join(tmpdir(), 'demo-'));
    try {
      execFileSync(process.execPath, [SCRIPT, dir], { stdio: 'pipe' });
      for (const file of readdirSync(DEMO)) {
        expect(readFileSync(join(dir, file)).equals(readFileSync(join(DEMO, file))), file).toBe(true);
      }
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });
});

/** Residual sum of squares of a least-squares quadratic in x (normal equations on centred x, solved by Cramer's rule). */
function quadraticResidualSumOfSquares(xs: number[], ys: number[]): number {
  const xm = mean(xs);
  const u = xs.map((v) => v - xm);
  const s = [0, 0, 0, 0, 0];
  const b = [0, 0, 0];
  for (let i = 0; i < u.length; i++) {
    let p = 1;
    for (let k = 0; k < 5; k++) { s[k] += p; if (k < 3) b[k] += p * ys[i]; p *= u[i]; }
  }
  const det3 = (m: number[][]) =>
    m[0][0] * (m[1][1] * m[2][2] - m[1][2] * m[2][1]) - m[0][1] * (m[1][0] * m[2][2] - m[1][2] * m[2][0]) + m[0][2] * (m[1][0] * m[2][1] - m[1][1] * m[2][0]);
  const A = [[s[0], s[1], s[2]], [s[1], s[2], s[3]], [s[2], s[3], s[4]]];
  const D = det3(A);
  const coef = [0, 1, 2].map((j) => det3(A.map((row, r) => row.map((v, c) => (c === j ? b[r] : v)))) / D);
  let rss = 0;
  for (let i = 0; i < u.length; i++) rss += (ys[i] - (coef[0] + coef[1] * u[i] + coef[2] * u[i] * u[i])) ** 2;
  return rss;
}
