/**
 * The real traces in test/fixtures/real (exported by scripts/export-real-traces.R
 * from MALDIquant 1.22 and pls 2.8.1; see the README there) load through the
 * page's own loader into the shapes the packages describe: 42,388 points per
 * MALDI-TOF spectrum from m/z 1000 to 10,000 (?fiedler2009subset, R), 60 NIR
 * spectra of 401 wavelengths 900–1700 nm in 2 nm steps (?gasoline, R; Kalivas 1997).
 * First and last values were read from R with print(…, digits = 17).
 */
import { describe, expect, it } from 'vitest';
import { loadReal, MALDI_FILES } from './load-real.ts';

describe('real traces load as published', () => {
  it('MALDI-TOF spectra: 42,388 points, m/z 1000.015–9999.734, integer counts', () => {
    for (const f of MALDI_FILES) {
      const r = loadReal(f);
      expect(r.traces).toHaveLength(1);
      const t = r.traces[0]!;
      expect(t.x.length).toBe(42388);
      expect(t.x[0]).toBeCloseTo(1000.015, 3);
      expect(t.x[t.x.length - 1]).toBeCloseTo(9999.734, 1);
      expect(t.y.every((v) => Number.isInteger(v))).toBe(true);
    }
    // item 1 starts 3149, 3134, 3127 (R: head(intensity(fiedler2009subset[[1]])))
    const y = loadReal('maldi-fiedler2009-01.csv').traces[0]!.y;
    expect(Array.from(y.subarray(0, 3))).toEqual([3149, 3134, 3127]);
  });

  it('gasoline NIR: 60 traces of 401 points, 900–1700 nm', () => {
    const r = loadReal('gasoline-nir.csv');
    expect(r.traces).toHaveLength(60);
    for (const t of r.traces) {
      expect(t.x.length).toBe(401);
      expect(t.x[0]).toBe(900);
      expect(t.x[400]).toBe(1700);
    }
    // R: gasoline$NIR[1, 1:2] = -0.050193, -0.045903; gasoline$NIR[2, 1] = -0.044227
    expect(r.traces[0]!.y[0]).toBe(-0.050193);
    expect(r.traces[0]!.y[1]).toBe(-0.045903);
    expect(r.traces[1]!.y[0]).toBe(-0.044227);
  });
});
