/**
 * σ on real traces that no one on the project made (test/fixtures/real; see
 * its README), against figures made by hand in test/reference/make_real_noise.py
 * (NumPy, independent of the code under test; values in real-noise.json).
 *
 * * MALDI-TOF (MALDIquant fiedler2009subset items 1 and 2, technical
 *   replicates): in three m/z ranges picked by eye as free of peaks, the
 *   replicate difference gives σ and the noise correlation. The noise there is
 *   strongly correlated (ρ₁ 0.6–0.8), so the finest-scale figure alone is
 *   about half the truth; the σ we use at those places must be within a factor
 *   1.5 of the replicate figure (measured: 0.92–1.42 ×) and the noise must be
 *   reported as growing with the signal.
 * * NIR (pls gasoline, 60 spectra, bands over the whole range): σ must not be
 *   the band shape. It must lie below the 7-point quadratic residual figure
 *   (which counts band curvature as noise) by at least 5 × (measured 5.5–16 ×),
 *   and within 0.6–1.0 × the unmasked MAD of 4th differences (features left
 *   in, so that one is an upper figure; measured 0.65–0.90 ×).
 */
import { describe, expect, it } from 'vitest';
import { rawNoiseModel } from '../../src/core/measure/noise-raw.ts';
import { sigmaAt } from '../../src/core/measure/noise-profile.ts';
import { loadReal } from './load-real.ts';
import ref from '../reference/real-noise.json';

describe('σ on real MALDI-TOF spectra (replicates 1 and 2)', () => {
  for (const f of ['maldi-fiedler2009-01.csv', 'maldi-fiedler2009-02.csv']) {
    it(`${f}: σ near each peak-free range within 1.5 × of the replicate-difference figure`, () => {
      const m = rawNoiseModel(loadReal(f).traces[0].y)!;
      expect(m.checks.find((c) => c.id === 'level')!.held).toBe(false);
      expect(m.checks.find((c) => c.id === 'correlation')!.held).toBe(true);
      for (const r of ref.maldi_replicates_1_2) {
        const mid = (r.index_from + r.index_to) >> 1;
        const ratio = sigmaAt(m.profile, mid) / r.sigma;
        expect(ratio).toBeGreaterThan(1 / 1.5);
        expect(ratio).toBeLessThan(1.5);
      }
      // The finest scale alone would be about half the truth here: the correction is needed.
      expect(m.sigma / m.sigmaFinest).toBeGreaterThan(1.6);
    });
  }
});

describe('σ on the gasoline NIR spectra (bands over the whole range)', () => {
  it('all 60: far below the band shape, near the finest-scale figure', () => {
    const traces = loadReal('gasoline-nir.csv').traces;
    traces.forEach((t, k) => {
      const m = rawNoiseModel(t.y)!;
      const r = ref.nir[k];
      expect(m.sigma).toBeLessThan(r.sigma_quadratic_7 / 5);
      expect(m.sigma / r.sigma_mad_differences['4']).toBeGreaterThan(0.6);
      expect(m.sigma / r.sigma_mad_differences['4']).toBeLessThan(1.0);
      expect(m.sigma / r.range).toBeLessThan(1e-3);
      // 401 points are too few to measure a correlation: the estimate says it assumed white noise, untested.
      expect(m.checks.find((c) => c.id === 'correlation')!.held).toBeNull();
      expect(m.description).toMatch(/white noise assumed/);
    });
  });
});
