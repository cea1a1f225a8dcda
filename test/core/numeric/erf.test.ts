import { describe, expect, it } from 'vitest';
import { erfc, erfcx } from '../../../src/core/numeric/erf.ts';
import { emgFigures, emgPdf } from '../../../src/core/measure/fit/shapes.ts';
import { fitRef, relErr } from '../measure/ref.ts';

describe('erfc and erfcx', () => {
  it(`match scipy.special.erfc / erfcx (SciPy ${fitRef.scipy}) to 1e-14 relative`, () => {
    fitRef.special.x.forEach((x, i) => {
      const e = fitRef.special.erfc[i];
      // Below the smallest normal double (erfc(27) ≈ 5e-319, erfc(300) = 0) only absolute agreement means anything.
      if (e > 1e-300) expect(relErr(erfc(x), e)).toBeLessThan(1e-14);
      else expect(Math.abs(erfc(x) - e)).toBeLessThan(1e-300);
      expect(relErr(erfcx(x), fitRef.special.erfcx[i])).toBeLessThan(1e-14);
    });
  });
  it('keep the identities erfc(−x) = 2 − erfc(x) and erfc(0) = 1 (A&S 7.1)', () => {
    expect(erfc(0)).toBe(1);
    for (const x of [0.3, 1.7, 3.2]) expect(erfc(-x) + erfc(x)).toBeCloseTo(2, 15);
    expect(Number.isNaN(erfc(NaN))).toBe(true);
  });
});

describe('exponentially modified Gaussian', () => {
  it(`density equals scipy.stats.exponnorm.pdf (SciPy ${fitRef.scipy}) to 5e-12 of its peak, from K = 0.01 to 13`, () => {
    for (const c of fitRef.emgPdf.cases) {
      const peak = Math.max(...c.pdf);
      fitRef.emgPdf.x.forEach((x, i) => {
        expect(Math.abs(emgPdf(x, c.mu, c.sigma, c.tau) - c.pdf[i])).toBeLessThan(5e-12 * peak);
      });
    }
  });
  it('apex and half-height width match the table in REFERENCES.md (SciPy 1.17.1 on the exact density)', () => {
    const table = [
      { k: 0.5, apex: 0.428142, w: 2.558864 },
      { k: 1, apex: 0.697369, w: 2.89089 },
      { k: 2, apex: 1.017913, w: 3.586465 },
    ];
    for (const r of table) {
      const f = emgFigures(0, 1, 1, r.k);
      expect(f.position).toBeCloseTo(r.apex, 6);
      expect(f.fwhm).toBeCloseTo(r.w, 6);
      expect(f.area).toBe(1);
    }
    // K → 0 is the Gaussian: FWHM/σ = 2√(2 ln 2) = 2.3548200 (REFERENCES.md, Gaussian peaks).
    expect(emgFigures(0, 1, 1, 1e-4).fwhm).toBeCloseTo(2.35482, 3);
  });
});
