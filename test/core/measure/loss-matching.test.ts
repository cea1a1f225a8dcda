// Matching features across the loss check's columns: the sweep along x gives the
// very ledger the straightforward every-peak-against-every-feature matching gave
// (that function is kept below, verbatim, as the definition), on random tables
// with close, equal, removed and unmeasurable peaks (fast-check, exact equality).
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { matchPeaks, type Alternative, type Ledger, type LedgerCell, type LedgerRow, type MatchOptions, type Standing } from '../../../src/core/measure/loss-matching.ts';
import type { Peak, PeakFlag } from '../../../src/core/measure/peak-types.ts';
import { makeRng } from '../../../src/core/numeric/random.ts';
import { points, xUnits } from '../../../src/core/units.ts';

// ---------------------------------------------------------------------------
// The definition: src/core/measure/loss-matching.ts matchPeaks before the sweep (commit fe7454e), unchanged.

const LEVEL: Record<Standing, number> = { 'lost': 0, 'below-detection': 1, 'detectable': 2, 'quantifiable': 3, 'not-measured': -1 };

function decimalsFor(dx: number): number {
  return Math.min(8, Math.max(0, Math.ceil(-Math.log10(Math.abs(dx)) - 1e-9)));
}

function pct(a: number, b: number): number | null {
  return b !== 0 && Number.isFinite(a / b) ? (100 * a) / b : null;
}

function naiveMatchPeaks(alternatives: readonly Alternative[], options: MatchOptions): Ledger {
  if (alternatives.length === 0) throw new RangeError('The loss check needs at least one alternative.');
  const dx = Math.abs(options.dx);
  if (!(dx > 0) || !Number.isFinite(dx)) throw new RangeError(`The sample spacing must be a positive number; got ${options.dx}.`);
  const frac = options.fwhmFraction ?? 0.5;
  const minPts = options.minPoints ?? 2;
  if (!(frac >= 0) || !(minPts >= 0)) throw new RangeError('The matching tolerance settings must be 0 or more.');
  const limits = options.limits ?? { detection: 3, quantitation: 10 };
  const unit = options.xUnit ? ` ${options.xUnit}` : '';
  const dec = decimalsFor(dx);

  interface Feature { position: number; tolerance: number; first: number; match: number[] }
  const features: Feature[] = [];
  const nAlt = alternatives.length;

  for (let a = 0; a < nAlt; a++) {
    const peaks = alternatives[a].peaks;
    const known = features.length;
    const pairs: [number, number, number][] = [];
    for (let p = 0; p < peaks.length; p++) {
      if (peaks[p].removedByUser) continue;
      for (let f = 0; f < known; f++) {
        const d = Math.abs(peaks[p].x - features[f].position);
        if (d <= features[f].tolerance) pairs.push([d, f, p]);
      }
    }
    pairs.sort((u, v) => u[0] - v[0] || u[1] - v[1] || u[2] - v[2]);
    const peakUsed = new Uint8Array(peaks.length);
    for (const [, f, p] of pairs) {
      if (features[f].match[a] >= 0 || peakUsed[p]) continue;
      features[f].match[a] = p;
      peakUsed[p] = 1;
    }
    for (let p = 0; p < peaks.length; p++) {
      if (peakUsed[p] || peaks[p].removedByUser) continue;
      const match = new Array<number>(nAlt).fill(-1);
      match[a] = p;
      features.push({ position: peaks[p].x, tolerance: Math.max(frac * peaks[p].fwhm, minPts * dx), first: a, match });
    }
  }
  features.sort((u, v) => u.position - v.position);

  const rows: LedgerRow[] = features.map((f) => {
    // Each feature is judged against the least-processed column that has it: on a noisy raw trace a small
    // peak may only show once lightly smoothed, and what heavier smoothing then does to it still matters.
    const refCol = f.first;
    const ref = alternatives[refCol].peaks[f.match[refCol]];
    const refStanding: Standing = ref.flag;
    const where = `The feature at ${f.position.toFixed(dec)}${unit}`;
    const sentences: string[] = [];
    if (refCol > 0) sentences.push(`${where} is not found with ${alternatives[0].label}; it first appears with ${alternatives[refCol].label}, so check that the processing did not make it.`);
    const cells: LedgerCell[] = f.match.map((p, a) => {
      const pk = p >= 0 ? alternatives[a].peaks[p] : null;
      const standing: Standing = pk ? pk.flag : 'lost';
      let crossed: LedgerCell['crossed'] = null;
      if (a > refCol && LEVEL[standing] >= 0 && LEVEL[refStanding] >= 0 && standing !== refStanding) {
        crossed = LEVEL[standing] < LEVEL[refStanding] ? 'down' : 'up';
        const label = alternatives[a].label;
        if (crossed === 'down') {
          if (standing === 'lost') sentences.push(`${where} is lost with ${label}.`);
          else if (standing === 'below-detection') sentences.push(`${where} drops below S/N ${limits.detection} with ${label}.`);
          else sentences.push(`${where} drops below S/N ${limits.quantitation} (quantitation limit) with ${label}.`);
        } else {
          const lim = standing === 'quantifiable' ? limits.quantitation : limits.detection;
          sentences.push(`${where} rises above S/N ${lim} with ${label}.`);
        }
      }
      const shift = pk && a >= refCol ? pk.x - ref.x : null;
      const cmp = pk !== null && a >= refCol;
      return {
        found: pk !== null, peakIndex: p, x: pk ? pk.x : null, snr: pk ? pk.snr : null, standing,
        height: pk ? pk.height : null, area: pk ? pk.area : null, fwhm: pk ? pk.fwhm : null,
        heightKept: cmp ? pct(pk.height, ref.height) : null,
        widthChange: cmp ? (pct(pk.fwhm - ref.fwhm, ref.fwhm)) : null,
        apexShift: shift, apexShiftPoints: shift === null ? null : shift / dx,
        areaChange: cmp ? pct(pk.area - ref.area, ref.area) : null,
        crossed,
      };
    });
    return {
      position: f.position, tolerance: f.tolerance, firstFoundIn: f.first, cells,
      crossed: cells.some((c) => c.crossed !== null), sentences,
    };
  });

  return {
    alternatives: alternatives.map((a) => ({ id: a.id, label: a.label })),
    rows,
    sentences: rows.flatMap((r) => r.sentences),
    rule: `Peaks are the same feature when their apexes lie within max(${frac} × FWHM, ${minPts} points) of the feature's first apex; nearest pairs first, one peak per feature. Each feature's changes are against the least-processed column that has it (${alternatives[0].label} when found there).`,
  };
}

// ---------------------------------------------------------------------------

const FLAGS: PeakFlag[] = ['below-detection', 'detectable', 'quantifiable', 'not-measured'];

/** A peak with the fields the matching reads; the rest of the table row does not take part. */
function peak(x: number, fwhm: number, flag: PeakFlag, snr: number, removed: boolean): Peak {
  return { x, fwhm, flag, snr, height: snr * 0.01, area: snr * 0.02, removedByUser: removed || undefined } as unknown as Peak;
}

const peakArb = fc.record({
  // Positions on a coarse grid as well as anywhere, so equal and nearly equal positions occur.
  x: fc.oneof(fc.integer({ min: 0, max: 60 }).map((k) => k * 0.25), fc.double({ min: 0, max: 15, noNaN: true })),
  fwhm: fc.oneof(fc.constantFrom(0, 0.1, 0.5, 1, 3), fc.double({ min: 0, max: 4, noNaN: true }), fc.constant(Number.NaN)),
  flag: fc.constantFrom(...FLAGS),
  snr: fc.double({ min: 0, max: 50, noNaN: true }),
  removed: fc.integer({ min: 0, max: 7 }).map((k) => k === 0),
}).map((r) => peak(r.x, r.fwhm, r.flag, r.snr, r.removed));

const alternativesArb = fc.array(fc.array(peakArb, { maxLength: 40 }), { minLength: 1, maxLength: 5 })
  .map((cols) => cols.map((peaks, k): Alternative => ({ id: `alt-${k}`, label: `alternative ${k}`, peaks })));

describe('matchPeaks: sweep along x = every peak against every feature', () => {
  it('the same ledger on random tables (positions on a grid and anywhere, widths 0 to 4 and unmeasured, removed peaks)', () => {
    fc.assert(fc.property(
      alternativesArb, fc.constantFrom(0.01, 0.25, 1), fc.constantFrom(0, 0.5, 2), fc.constantFrom(0, 2, 5),
      (alts, dx, fwhmFraction, minPoints) => {
        const o: MatchOptions = { dx: xUnits(dx), xUnit: 'min', fwhmFraction, minPoints: points(minPoints) };
        expect(matchPeaks(alts, o)).toEqual(naiveMatchPeaks(alts, o));
      },
    ), { seed: 81031, numRuns: 400 });
  });

  it('the same ledger with infinite widths and positions (an interval that covers everything)', () => {
    const alts: Alternative[] = [
      { id: 'a', label: 'raw', peaks: [peak(1, Infinity, 'detectable', 5, false), peak(Infinity, 1, 'detectable', 4, false), peak(3, 1, 'quantifiable', 12, false)] },
      { id: 'b', label: 'smoothed', peaks: [peak(2, 1, 'detectable', 5, false), peak(Infinity, 1, 'detectable', 4, false), peak(-Infinity, 2, 'below-detection', 1, false)] },
      { id: 'c', label: 'more', peaks: [peak(3.2, 0.2, 'detectable', 6, false), peak(Number.NaN, 1, 'detectable', 4, false)] },
    ];
    expect(matchPeaks(alts, { dx: xUnits(0.1) })).toEqual(naiveMatchPeaks(alts, { dx: xUnits(0.1) }));
  });

  it('the same ledger on a long noisy table (4 columns × 3000 peaks, most within a tolerance of a neighbour)', () => {
    const rng = makeRng(81032);
    const base = Array.from({ length: 3000 }, () => rng.uniform() * 1000);
    const alts: Alternative[] = [0, 1, 2, 3].map((k) => ({
      id: `c${k}`, label: `column ${k}`,
      peaks: base.filter(() => rng.uniform() > 0.15 * k).map((x) => peak(x + 0.05 * rng.normal() * k, 0.1 + 0.5 * rng.uniform(), FLAGS[Math.floor(rng.uniform() * 3)], 10 * rng.uniform(), rng.uniform() < 0.02)),
    }));
    const fast: Ledger = matchPeaks(alts, { dx: xUnits(0.01), xUnit: 'min' });
    const slow: Ledger = naiveMatchPeaks(alts, { dx: xUnits(0.01), xUnit: 'min' });
    expect(fast.rows.length).toBe(slow.rows.length);
    expect(fast).toEqual(slow);
    // Not a trivial ledger: features matched across columns and features lost.
    const matched = fast.rows.filter((r: LedgerRow) => r.cells.filter((c: LedgerCell) => c.found).length >= 2).length;
    expect(matched).toBeGreaterThan(1000);
  });
});
