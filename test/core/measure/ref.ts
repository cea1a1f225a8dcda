// Shared loader for test/reference/fit.json (written by test/reference/make_fit.py with SciPy).
import { readFileSync } from 'node:fs';
import type { BaselineKind } from '../../../src/core/measure/fit/region.ts';
import type { ShapeKind } from '../../../src/core/measure/fit/shapes.ts';

export interface FitCase {
  name: string;
  shapes: ShapeKind[];
  baseline: BaselineKind;
  x: number[];
  y: number[];
  truth: number[];
  p0: number[];
  params: number[];
  se: number[];
  areas: number[];
  areaSe: number[];
  ssr: number;
}

export interface FitRef {
  scipy: string;
  numpy: string;
  special: { x: number[]; erfc: number[]; erfcx: number[] };
  emgPdf: { x: number[]; cases: { mu: number; sigma: number; tau: number; pdf: number[] }[] };
  cases: FitCase[];
  batch: { rt: number[][]; area: number[][]; stats: { rt: { mean: number; sd: number; rsd: number }; area: { mean: number; sd: number; rsd: number } }[] };
}

export const fitRef = JSON.parse(readFileSync(new URL('../../reference/fit.json', import.meta.url), 'utf8')) as FitRef;

export const relErr = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);
