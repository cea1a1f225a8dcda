/**
 * End to end in the core, on the invented demo standards (scripts/make-demo.mjs,
 * truth in public/demo/demo-standards-truth.json): load the six standards and
 * the sample through the real loader, detect peaks, name them from
 * demo-named-peaks.csv, calibrate from demo-standards.csv, and read the
 * sample's amounts. Each dye's true amount must lie in its 95 % interval.
 */
import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { calibrate, quantifySamples } from '../../../src/core/calibration/calibrate.ts';
import type { TracePeaks } from '../../../src/core/calibration/calibrate.ts';
import { calibrationExport } from '../../../src/core/calibration/export.ts';
import { readNamedPeaksCsv } from '../../../src/core/calibration/named-peaks.ts';
import { defaultCalibrationSettings } from '../../../src/core/calibration/settings.ts';
import { curveSlope } from '../../../src/core/calibration/regression.ts';
import { readStandardsCsv } from '../../../src/core/calibration/standards.ts';
import { loadFile } from '../../../src/core/io/load.ts';
import { noiseRms } from '../../../src/core/measure/noise-estimators.ts';
import { savitzkyGolay } from '../../../src/core/numeric/savgol.ts';
import { defaultPeakOptions, detectPeaks } from '../../../src/core/measure/peak-table.ts';
import { baselineAsls } from '../../../src/core/steps/baseline.ts';

const DEMO = fileURLToPath(new URL('../../../public/demo/', import.meta.url));
interface StandardsTruth {
  seed: number;
  amountUnit: string;
  noiseSd: number;
  drift: { c0: number; c1: number; c2: number };
  dyes: { name: string; centre: number; sigma: number; window: number; responsePerAmount: number; levels: number[]; sampleAmount: number }[];
  namedPeaksFile: string;
  amountsFile: string;
  sampleFile: string;
  files: { file: string; level: number; injection: string; amounts: number[] }[];
}
const truth = JSON.parse(readFileSync(join(DEMO, 'demo-standards-truth.json'), 'utf8')) as StandardsTruth;
const sampleTruth = JSON.parse(readFileSync(join(DEMO, 'demo-truth.json'), 'utf8')) as { peaks: { label: string; area: number }[]; seed: number };

function load(file: string) {
  const r = loadFile(new Uint8Array(readFileSync(join(DEMO, file))), file);
  if (!r.ok) throw new Error(`${file}: ${r.error.problem}`);
  return r.traces[0];
}

/**
 * Peaks as a user would measure them: the baseline step at its defaults (AsLS, λ 1e5, p 0.01,
 * 20 passes) and a Savitzky–Golay smoothing of 11 points, order 2; σ from the quiet end
 * (10.2 min on) of the processed trace; the detector's default options. (On the raw,
 * drifting trace the detector's integration bounds wander, so areas scatter by 10 % and more;
 * that belongs to peak measurement, not to calibration.)
 */
function peaksOf(file: string): TracePeaks {
  const t = load(file);
  const base = baselineAsls(t.y, 1e5, 0.01, 20).baseline;
  const y = savitzkyGolay(Float64Array.from(t.y, (v, i) => v - base[i]), 11, 2);
  const noise = noiseRms(t.x, y, 10.2, t.x[t.x.length - 1]);
  if (!noise.ok) throw new Error(noise.message);
  return { trace: file, peaks: detectPeaks(t.x, y, defaultPeakOptions(noise.sigma, t.x[1] - t.x[0])) };
}

describe('demo standards: files against their truth', () => {
  it('three levels in duplicate per dye, a separate seed, amounts table and named peaks as the truth says', () => {
    expect(truth.files).toHaveLength(6);
    expect(new Set(truth.files.map((f) => f.level))).toEqual(new Set([1, 2, 3]));
    expect(truth.seed).not.toBe(sampleTruth.seed);
    for (const f of truth.files) expect(load(f.file).metadata.Note).toContain(`seed ${truth.seed}`);
    const named = readNamedPeaksCsv(readFileSync(join(DEMO, truth.namedPeaksFile), 'utf8'), truth.namedPeaksFile);
    expect(named.ok && named.table.peaks).toEqual(truth.dyes.map((d) => ({ name: d.name, position: d.centre, window: d.window })));
    const amounts = readStandardsCsv(readFileSync(join(DEMO, truth.amountsFile), 'utf8'), truth.amountsFile);
    expect(amounts.ok && amounts.table.rows.map((r) => [r.standard, r.amounts])).toEqual(truth.files.map((f) => [f.file, f.amounts]));
    // The sample's true amount is its peak's true area over the response factor.
    for (const d of truth.dyes) {
      const area = sampleTruth.peaks.find((p) => Math.abs(p.area - d.sampleAmount * d.responsePerAmount) < 1e-6);
      expect(area, d.name).toBeDefined();
      // Each sample amount lies inside its dye's calibrated range, so the check is not an extrapolation.
      expect(d.sampleAmount).toBeGreaterThan(Math.min(...d.levels));
      expect(d.sampleAmount).toBeLessThan(Math.max(...d.levels));
    }
  });

  it('each standard is the drift plus the dyes\' Gaussians plus white noise of the stated SD', () => {
    for (const f of truth.files) {
      const t = load(f.file);
      let ss = 0;
      for (let i = 0; i < t.x.length; i++) {
        const x = t.x[i];
        let m = truth.drift.c0 + truth.drift.c1 * x + truth.drift.c2 * x * x;
        truth.dyes.forEach((d, k) => { m += ((f.amounts[k] * d.responsePerAmount) / (Math.sqrt(2 * Math.PI) * d.sigma)) * Math.exp(-0.5 * ((x - d.centre) / d.sigma) ** 2); });
        ss += (t.y[i] - m) ** 2;
      }
      const sd = Math.sqrt(ss / t.x.length);
      // SD of n Gaussian samples: standard error σ/√(2n) (common large-sample result); 4 of them.
      expect(Math.abs(sd - truth.noiseSd), f.file).toBeLessThan((4 * truth.noiseSd) / Math.sqrt(2 * t.x.length));
    }
  });
});

for (const response of ['area', 'height'] as const) {
  describe(`demo end to end in the core, ${response} as response: amounts of the sample's named peaks`, () => {
    const named = readNamedPeaksCsv(readFileSync(join(DEMO, truth.namedPeaksFile), 'utf8'), truth.namedPeaksFile);
    const amounts = readStandardsCsv(readFileSync(join(DEMO, truth.amountsFile), 'utf8'), truth.amountsFile);
    if (!named.ok || !amounts.ok) throw new Error('demo tables');
    const standardTraces = truth.files.map((f) => peaksOf(f.file));
    const set = calibrate({ namedPeaks: named.table, standards: amounts.table, standardTraces, settings: { ...defaultCalibrationSettings(), response } });
    const [sample] = quantifySamples(set, [peaksOf(truth.sampleFile)]);

    it('names every dye in every standard and in the sample; the inputs fit together', () => {
      expect(set.problems).toEqual([]);
      for (const s of set.standardNaming) expect(s.naming.missing, s.trace).toEqual([]);
      expect(sample.naming.missing).toEqual([]);
    });

    it('calibrates each dye through all six standards, the curve chosen by the lack-of-fit test (duplicates)', () => {
      for (const d of truth.dyes) {
        const cal = set.calibrations.find((c) => c.name === d.name)!;
        expect(cal.status, d.name).toBe('calibrated');
        expect(cal.choice!.rule).toBe('lack-of-fit');
        expect(cal.points.every((p) => p.used)).toBe(true);
        if (response === 'area' && cal.fit!.model.kind === 'line') {
          // Area per amount is the dye's response factor; the measured areas are within a few % of the true ones.
          expect(Math.abs(cal.fit!.coefficients[1] / d.responsePerAmount - 1), d.name).toBeLessThan(0.1);
        }
        // A standard's back-calculated amount differs from its known amount by its residual over the slope:
        // within 4 residual SDs in amount (s/b) unless something is wrong with it.
        const slope = Math.abs(curveSlope(cal.fit!, cal.fit!.range.low));
        for (const p of cal.points) expect(Math.abs(p.backCalculated! - p.amount), `${d.name} ${p.standard}`).toBeLessThan((4 * cal.fit!.residualSd) / slope);
      }
    });

    it('each dye\'s true amount in the sample lies within its 95 % interval', () => {
      const lines: string[] = [];
      for (const d of truth.dyes) {
        const a = sample.amounts.find((v) => v.name === d.name)!;
        expect(a.status, d.name).toBe('measured');
        const iv = a.estimate!.interval!;
        const cal = set.calibrations.find((c) => c.name === d.name)!;
        lines.push(`${response} ${d.name}: ${cal.fit!.model.kind}, ${a.estimate!.amount!.toFixed(3)} [${iv.low!.toFixed(3)}, ${iv.high!.toFixed(3)}] ${truth.amountUnit}, truth ${d.sampleAmount.toFixed(3)}; QL ${cal.limits!.quantitation.toFixed(3)}; flags ${a.flags.join(',') || 'none'}`);
        expect(iv.low!, d.name).toBeLessThanOrEqual(d.sampleAmount);
        expect(iv.high!, d.name).toBeGreaterThanOrEqual(d.sampleAmount);
      }
      console.log(lines.join('\n'));
    });

    it('the export object carries three calibrations and the sample\'s three amounts', () => {
      const exp = calibrationExport(set, [sample], '2026-12-21T00:00:00.000Z');
      expect(exp.calibrations.map((c) => c.name)).toEqual(truth.dyes.map((d) => d.name));
      expect(exp.samples[0].amounts.map((a) => a.status)).toEqual(['measured', 'measured', 'measured']);
    });
  });
}
