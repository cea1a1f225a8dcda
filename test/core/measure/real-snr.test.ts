import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { defaultPeakOptions, detectPeaks } from '../../../src/core/measure/peak-table.ts';
import { meanStep } from '../../../src/core/numeric/interpolate.ts';
import { loadReal } from '../../real/load-real.ts';

// Worked out by hand, step by step, in test/reference/make_real_snr.py (NumPy; the steps are written there).
const hand = JSON.parse(readFileSync(new URL('../../reference/real-snr.json', import.meta.url), 'utf8')) as {
  file: string; peaks: { mz: number; index: number; width_samples: number; baseline_at_apex: number; height: number; sigma: number; snr: number }[];
};

describe(`a real MALDI-TOF spectrum (${hand.file}; MALDIquant fiedler2009subset, GPL-3+): S/N of five peaks against the hand computation`, () => {
  const t = loadReal(hand.file).traces[0];
  // m/z 5904.6 and 7766.2 sit on broad humps (the trace climbs from about 1,400 to 5,500 counts over 150 samples
  // before the 5904.6 peak). The hand line skims the hump through windows 2–3 widths out; ours runs to the peak's
  // own bounds (the width limit on the hump's side, the valley at its foot on the other), under part of the hump:
  // measured +4.6 % and +5.0 %. Skimming a rider off a hump that is no peak of its own is not done by the table; the
  // tolerance there is 6 % and says so.
  const onHump = new Set([5904.6, 7766.2].map((v) => v.toFixed(1)));
  for (const h of hand.peaks) {
    const tol = onHump.has(h.mz.toFixed(1)) ? 0.06 : 0.03;
    it(`m/z ${h.mz.toFixed(1)}: height and S/N within ${100 * tol} % of the hand figures (hand S/N ${h.snr.toFixed(0)})`, () => {
      // The hand σ is given (the noise estimate is not under test here); everything else is the table's own.
      const opts = { ...defaultPeakOptions(h.sigma, meanStep(t.x)), minProminence: 50 * h.sigma };
      const rows = detectPeaks(t.x, t.y, opts);
      const p = rows.reduce((a, b) => (Math.abs(b.x - h.mz) < Math.abs(a.x - h.mz) ? b : a));
      expect(Math.abs(p.index - h.index)).toBeLessThanOrEqual(2);
      // The hand baseline runs through windows 2–3 widths out; ours through the levels beyond our own bounds.
      expect(Math.abs(p.height / h.height - 1)).toBeLessThan(tol);
      expect(Math.abs((p.snr as number) / h.snr - 1)).toBeLessThan(tol);
      // Own width and bounds near the peak: the width agrees with the hand count of samples above half height
      // within 10 % (a count of whole samples against interpolated crossings, over slightly different baselines),
      // and the bounds lie within 8 half-widths (the stated limit).
      expect(Math.abs(p.fwhmPoints / h.width_samples - 1)).toBeLessThan(0.1);
      // (Each side's own half-width, in samples: the m/z grid of time of flight is uneven, so measured on it.)
      const dx = t.x[p.index + 1] - t.x[p.index - 1];
      expect(p.endIndex - p.index).toBeLessThanOrEqual(Math.ceil((8 * 2 * (p.rightHalf - t.x[p.index])) / dx) + 2);
      expect(p.index - p.startIndex).toBeLessThanOrEqual(Math.ceil((8 * 2 * (t.x[p.index] - p.leftHalf)) / dx) + 2);
    });
  }
});
