// Peak shapes for region fitting (src/core/measure/fit/shapes.ts). Sources: the
// closed-form areas of a Gaussian, h·w·√(π/(4 ln 2)) = 1.064467·h·w, and of a
// Lorentzian, (π/2)·h·w (any spectroscopy or statistics handbook; REFERENCES.md);
// FWHM = 2√(2 ln 2)·σ = 2.354820·σ; the pseudo-Voigt as η·L + (1 − η)·G (Wertheim
// et al. 1974); the EMG density against SciPy stats.exponnorm (K = τ/σ) from
// test/reference/make_peak_shapes.py (peak-shapes.json). Integrals here are
// trapezoid sums on fine grids, derivatives central differences.
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { FWHM_PER_SIGMA, GAUSS_AREA, LORENTZ_AREA, SHAPES, SHAPE_KINDS, emgFigures, emgPdf } from '../../../../src/core/measure/fit/shapes.ts';

interface Ref { scipy: string; exponnorm_pdf_loc0_scale1: { K: number; t: number; pdf: number }[] }
const ref = JSON.parse(readFileSync(new URL('../../../reference/peak-shapes.json', import.meta.url), 'utf8')) as Ref;

function integrate(f: (x: number) => number, a: number, b: number, n = 200000): number {
  const h = (b - a) / n;
  let s = 0.5 * (f(a) + f(b));
  for (let i = 1; i < n; i++) s += f(a + i * h);
  return s * h;
}

function valueAt(kind: keyof typeof SHAPES, p: number[], x: number): number {
  const out = new Float64Array(1);
  SHAPES[kind].evaluate(Float64Array.of(x), p, 0, out, null, 0);
  return out[0];
}

describe('constants (handbook values)', () => {
  it('FWHM per σ 2.354820, Gaussian area per height·FWHM 1.064467, Lorentzian π/2', () => {
    expect(FWHM_PER_SIGMA).toBeCloseTo(2.354820, 6);
    expect(GAUSS_AREA).toBeCloseTo(1.064467, 6);
    expect(LORENTZ_AREA).toBe(Math.PI / 2);
    expect(SHAPE_KINDS).toEqual(Object.keys(SHAPES));
  });
});

describe('symmetric shapes: height at the centre, half of it at ±FWHM/2, area as stated', () => {
  const c = 3, h = 2.5, w = 0.8;
  it.each([
    ['gaussian', [c, h, w]],
    ['lorentzian', [c, h, w]],
    ['pseudo-voigt', [c, h, w, 0.3]],
  ] as const)('%s', (kind, p) => {
    expect(valueAt(kind, [...p], c)).toBeCloseTo(h, 14);
    expect(valueAt(kind, [...p], c - w / 2)).toBeCloseTo(h / 2, 14);
    expect(valueAt(kind, [...p], c + w / 2)).toBeCloseTo(h / 2, 14);
    const f = SHAPES[kind].figures(p, 0);
    expect(f.position).toBe(c);
    expect(f.height).toBe(h);
    expect(f.fwhm).toBe(w);
    // Lorentzian tails: the integral over ±L is (h·w/2)·2·atan(2L/w) (closed form), so integrate over ±L and add the rest analytically.
    const L = 200;
    const eta = kind === 'lorentzian' ? 1 : kind === 'pseudo-voigt' ? p[3]! : 0;
    const lorentzTail = eta * h * w * (Math.PI / 2 - Math.atan((2 * L) / w));
    const numeric = integrate((x) => valueAt(kind, [...p], x), c - L, c + L, 400000) + lorentzTail;
    expect(Math.abs(numeric / f.area - 1)).toBeLessThan(1e-7);
  });
});

describe('the Jacobian each shape writes equals central differences of its values', () => {
  const x = Float64Array.from({ length: 41 }, (_, i) => 1 + i * 0.1);
  it.each([
    ['gaussian', [3, 2, 0.7]],
    ['lorentzian', [3.1, 1.5, 0.9]],
    ['pseudo-voigt', [2.9, 1.2, 0.6, 0.4]],
    ['emg', [2.7, 1.3, 0.25, 0.4]],
  ] as const)('%s', (kind, p) => {
    const n = x.length, m = p.length;
    const model = new Float64Array(n), jac = new Float64Array(n * m);
    SHAPES[kind].evaluate(x, p, 0, model, jac, 0);
    for (let j = 0; j < m; j++) {
      const step = 1e-6 * Math.max(1, Math.abs(p[j]));
      const up = [...p], dn = [...p];
      up[j] += step; dn[j] -= step;
      const fu = new Float64Array(n), fd = new Float64Array(n);
      SHAPES[kind].evaluate(x, up, 0, fu, null, 0);
      SHAPES[kind].evaluate(x, dn, 0, fd, null, 0);
      for (let i = 0; i < n; i++) expect(Math.abs(jac[j * n + i] - (fu[i] - fd[i]) / (2 * step)), `${kind} parameter ${j} at x = ${x[i]}`).toBeLessThan(1e-6);
    }
  });
});

describe('exponentially modified Gaussian', () => {
  it(`density equals SciPy stats.exponnorm (SciPy ${ref.scipy}), K = τ/σ, including far tails`, () => {
    expect(ref.exponnorm_pdf_loc0_scale1.length).toBeGreaterThan(10);
    for (const r of ref.exponnorm_pdf_loc0_scale1) {
      const got = emgPdf(r.t, 0, 1, r.K);
      expect(Math.abs(got - r.pdf), `K = ${r.K}, t = ${r.t}`).toBeLessThanOrEqual(1e-12 * r.pdf + 1e-300);
    }
  });

  it('unit area, and the figures (apex, height, FWHM) equal a brute-force search of the density', () => {
    for (const [mu, area, s, t] of [[5, 2, 0.3, 0.1], [5, 2, 0.3, 0.9], [0, 1, 1, 3]]) {
      expect(integrate((x) => emgPdf(x, mu, s, t), mu - 12 * s, mu + 12 * s + 40 * t, 400000)).toBeCloseTo(1, 8);
      const f = emgFigures(mu, area, s, t);
      let best = -Infinity, at = 0;
      const step = s / 2000;
      for (let x = mu - 3 * s; x < mu + 3 * s + 3 * t; x += step) { const v = emgPdf(x, mu, s, t); if (v > best) { best = v; at = x; } }
      expect(Math.abs(f.position - at)).toBeLessThan(2 * step);
      // The grid's best is a lower bound of the true top, within ~1e-7 of it at this step.
      expect(f.height).toBeGreaterThanOrEqual(area * best);
      expect(f.height / (area * best) - 1).toBeLessThan(1e-6);
      expect(f.area).toBe(area);
      expect(emgPdf(f.position - 0, mu, s, t) * area).toBeCloseTo(f.height, 12);
      // Half height at both ends of the FWHM (the left crossing is fwhm to the left of the right one).
      const vals: number[] = [];
      for (let x = mu - 6 * s; x < mu + 6 * s + 30 * t; x += step) if (emgPdf(x, mu, s, t) >= best / 2) vals.push(x);
      expect(Math.abs(vals[vals.length - 1] - vals[0] - f.fwhm)).toBeLessThan(3 * step);
    }
  });

  it('with τ → 0 it becomes the Gaussian: FWHM 2.354820·σ, apex at μ', () => {
    const f = emgFigures(1, 1, 0.5, 1e-4);
    expect(f.fwhm / 0.5).toBeCloseTo(FWHM_PER_SIGMA, 3);
    expect(f.position).toBeCloseTo(1 + 1e-4, 4);
  });

  it('a start made from a position, height and FWHM has its apex and height near them', () => {
    const p = SHAPES.emg.start(10, 4, 1);
    const f = SHAPES.emg.figures(p, 0);
    expect(Math.abs(f.position - 10)).toBeLessThan(0.01);
    // The start's apex offset 0.428σ is SciPy's apex for K = 0.5 rounded to 3 digits: height within 1e-6.
    expect(Math.abs(f.height / 4 - 1)).toBeLessThan(1e-6);
  });
});

describe('bounds', () => {
  it('every shape keeps its position inside the region (EMG: μ may lie up to a width before it) and its size positive', () => {
    const b = { from: 2, to: 8, minFwhm: 0.05, maxFwhm: 6 };
    for (const kind of SHAPE_KINDS) {
      const s = SHAPES[kind], lo = s.lower(b), hi = s.upper(b);
      expect(lo.length).toBe(s.paramNames.length);
      expect(lo[s.sizeParam]).toBe(0);
      expect(hi[s.positionParam]).toBe(8);
      for (let j = 0; j < lo.length; j++) expect(lo[j]).toBeLessThan(hi[j]);
    }
  });
});
