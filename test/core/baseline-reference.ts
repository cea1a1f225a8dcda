// Shared loader for test/reference/baseline.json (written by test/reference/make_baseline.py).
import { readFileSync } from 'node:fs';

export interface BaselineRef {
  scipy: string;
  numpy: string;
  median: { signal: number[]; short: number[]; cases: { input: 'signal' | 'short'; window: number; mode: 'reflect' | 'mirror' | 'nearest' | 'constant'; output: number[] }[] };
  medianShrink: Record<string, number[]>;
  median456: { medfilt_zero: number[]; constant: number[]; reflect: number[]; mirror: number[] };
  hampel: { k: number; t: number; output: number[]; replaced: number[] };
  whittaker: { lambda: number; y: number[]; z: number[] };
  whittakerWeighted: { lambda: number; w: number[]; z: number[] };
  whittakerLarge: { n: number; lambda: number; every: number; z: number[] };
  asls: { lambda: number; p: number; maxIter: number; y: number[]; z: number[]; iterations: number; converged: boolean };
  arpls: { lambda: number; maxIter: number; tol: number; z: number[]; iterations: number; converged: boolean };
  polynomial: { x: number[]; y: number[]; ranges: [number, number][]; order: number; baseline: number[] };
  expectile: Record<string, number>;
  twoSidedP: { z: number[]; p: number[] };
  runs: { e: number[]; runs: number; expected: number; z: number; p: number; lag1: number };
}

export const ref = JSON.parse(readFileSync(new URL('../reference/baseline.json', import.meta.url), 'utf8')) as BaselineRef;

/** Largest |a − b| / max(1, |b|): relative for large values, absolute near zero. */
export function maxMixedError(a: ArrayLike<number>, b: ArrayLike<number>): number {
  let e = 0;
  for (let i = 0; i < b.length; i++) e = Math.max(e, Math.abs(a[i] - b[i]) / Math.max(1, Math.abs(b[i])));
  return e;
}
