/** Shared readers for the calibration reference data (test/reference/calibration.json, test/fixtures/nist/Norris.dat). */
import { readFileSync } from 'node:fs';
import type { CurveKind, Weighting } from '../../../src/core/calibration/regression.ts';

export interface RefFit {
  kind: CurveKind;
  throughOrigin: boolean;
  weighting: Weighting;
  source: string;
  powers: number[];
  coefficients: number[];
  standardErrors: number[];
  covariance: number[][];
  residualSd: number;
  rSquared: number;
  weightScale: number;
  df: number;
  linregress?: { slope: number; intercept: number; stderr: number; interceptStderr: number; rvalue: number };
  lackOfFit: null | { pureErrorSumOfSquares: number; pureErrorDf: number; lackOfFitSumOfSquares: number; lackOfFitDf: number; f: number; pValue: number };
  curvature?: { t: number; df: number; pValue: number };
  /** The same fit in exact rational arithmetic (Python fractions), square roots at the end. */
  exact: { coefficients: number[]; standardErrors: number[]; residualSd: number };
}
export interface RefCase { name: string; note: string; amounts: number[]; responses: number[]; fits: RefFit[] }
export interface RefInverse {
  name: string;
  model: CurveKind;
  weighting: Weighting;
  amounts: number[];
  responses: number[];
  response: number;
  replicates: number;
  level: number;
  amount: number;
  standardError: number;
  standardErrorIso84662?: number;
  symmetric: [number, number];
  fieller?: [number | null, number | null];
  exact?: [number | null, number | null];
  g?: number;
  t: number;
}
export interface Reference { scipy: string; numpy: string; fits: RefCase[]; inverse: RefInverse[] }

export const reference = JSON.parse(readFileSync(new URL('../../reference/calibration.json', import.meta.url), 'utf8')) as Reference;

/** The NIST StRD Norris file: data and the certified values, read from the file itself. */
export function readNorris(): {
  x: number[]; y: number[];
  b0: number; b0Sd: number; b1: number; b1Sd: number; residualSd: number; rSquared: number;
} {
  const text = readFileSync(new URL('../../fixtures/nist/Norris.dat', import.meta.url), 'utf8');
  const lines = text.split(/\r?\n/);
  const num = (s: string) => Number(s.replace(/E/i, 'e'));
  const find = (re: RegExp) => {
    for (const l of lines) { const m = re.exec(l); if (m) return m; }
    throw new Error(`Norris.dat: no line matches ${re}`);
  };
  const b0 = find(/^\s*B0\s+(\S+)\s+(\S+)/);
  const b1 = find(/^\s*B1\s+(\S+)\s+(\S+)/);
  const rsd = find(/Standard Deviation\s+(\S+)\s*$/);
  const r2 = find(/R-Squared\s+(\S+)/);
  const start = lines.findIndex((l) => /^\s*Data:\s+y\s+x/.test(l));
  const x: number[] = [], y: number[] = [];
  for (const l of lines.slice(start + 1)) {
    const f = l.trim().split(/\s+/);
    if (f.length === 2 && f.every((v) => Number.isFinite(Number(v)))) { y.push(Number(f[0])); x.push(Number(f[1])); }
  }
  return { x, y, b0: num(b0[1]), b0Sd: num(b0[2]), b1: num(b1[1]), b1Sd: num(b1[2]), residualSd: num(rsd[1]), rSquared: num(r2[1]) };
}

/** |a − b| ≤ rel·|b| + abs. */
export function near(a: number, b: number, rel: number, abs = 0): boolean {
  return Math.abs(a - b) <= rel * Math.abs(b) + abs;
}
