// Against SciPy optimize.curve_fit (method 'lm', MINPACK) on the very same data: parameters,
// standard errors (sqrt of the diagonal of pcov, absolute_sigma=False) and the areas' standard
// errors by the delta method, all within 1e-4 relative. Values from test/reference/make_fit.py.
import { describe, expect, it } from 'vitest';
import { fitRegion } from '../../../../src/core/measure/fit/region.ts';
import { SHAPES } from '../../../../src/core/measure/fit/shapes.ts';
import { fitRef, relErr } from '../ref.ts';

describe(`region fit equals scipy.optimize.curve_fit (SciPy ${fitRef.scipy}, NumPy ${fitRef.numpy})`, () => {
  for (const c of fitRef.cases) {
    it(c.name, () => {
      const x = Float64Array.from(c.x);
      const y = Float64Array.from(c.y);
      // Starts from SciPy's p0, turned into (position, height, FWHM) as peak detection would give them.
      let o = 0;
      const starts = c.shapes.map((s) => {
        const m = SHAPES[s];
        const f = m.figures(c.p0, o);
        o += m.paramNames.length;
        return { position: f.position, height: f.height, fwhm: f.fwhm };
      });
      const out = fitRegion(x, y, { from: c.x[0], to: c.x[c.x.length - 1], shape: c.shapes, baseline: c.baseline, starts });
      expect(out.ok).toBe(true);
      if (!out.ok) return;
      const fit = out.fit;
      expect(fit.converged).toBe(true);
      expect(fit.parameters.length).toBe(c.params.length);
      c.params.forEach((v, j) => expect(relErr(fit.parameters[j], v), fit.parameterNames[j]).toBeLessThan(1e-4));
      const se = fit.covariance as Float64Array;
      c.se.forEach((v, j) => expect(relErr(Math.sqrt(se[j * c.params.length + j]), v), `SE of ${fit.parameterNames[j]}`).toBeLessThan(1e-4));
      fit.peaks.forEach((p, k) => {
        expect(relErr(p.area.value, c.areas[k])).toBeLessThan(1e-4);
        expect(relErr(p.area.se, c.areaSe[k])).toBeLessThan(1e-4);
      });
      expect(relErr(fit.ssr, c.ssr)).toBeLessThan(1e-8);
    });
  }
});
