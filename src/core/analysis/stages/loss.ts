/**
 * The loss check's last step: the raw trace, the current stack and each
 * alternative (already measured, one job each) matched into one ledger, with
 * the sentences the export asks the user to confirm.
 */
import type { Signal } from '../../steps/types.ts';
import type { Trace } from '../../trace.ts';
import type { Registry } from '../../method.ts';
import { meanStep } from '../../numeric/interpolate.ts';
import { combineVerdict, HEIGHT_LOSS_TOLERANCE } from '../../measure/residual-tests.ts';
import { matchPeaks, type Ledger, type LedgerRow } from '../../measure/loss-matching.ts';
import type { NoiseBumpCount } from '../../measure/noise-bumps.ts';
import type { AlternativeMeasured } from '../memo.ts';
import { DEFAULT_PEAK_SETTINGS, type AnalyseRequest } from '../request.ts';
import type { LossItem, LossReport } from '../result.ts';
import type { Measured } from './measure.ts';
import { windowAdviceRows } from './advice.ts';
import { points, toPoints, xUnits } from '../../units.ts';

export function lossReport(
  request: AnalyseRequest, raw: Signal, sample: Trace, main: Measured, current: Measured, reference: Measured,
  alternatives: AlternativeMeasured[], noiseBumps: NoiseBumpCount | null, registry: Registry,
): LossReport {
  const ps = request.peaks ?? DEFAULT_PEAK_SETTINGS;
  const columns = [
    { id: 'raw', label: 'no processing (raw)', peaks: reference.peaks },
    { id: 'current', label: 'the current stack', peaks: current.peaks },
    ...alternatives.map((a) => ({ id: a.outcome.id, label: a.outcome.label, peaks: a.measured.peaks })),
  ];
  const limits = { detection: ps.detectionLimit, quantitation: ps.quantitationLimit };
  const full = matchPeaks(columns, { dx: meanStep(raw.x), xUnit: sample.xUnit, limits });
  // Features below the detection limit in every column are noise-level candidates: counted, and carried only when
  // the page asks (a long noisy trace has tens of thousands, and sending them all would stall it).
  const atOrAbove = (r: LedgerRow) => r.cells.some((c) => c.standing === 'detectable' || c.standing === 'quantifiable');
  const kept = request.ledgerNoiseLevel ? full.rows.slice() : full.rows.filter(atOrAbove);
  const ledger: Ledger = { ...full, rows: kept, sentences: kept.flatMap((r) => r.sentences) };
  const noiseLevelRows = full.rows.filter((r) => !atOrAbove(r)).length;
  // Window advice from quantifiable features only: noise bumps that just pass S/N 3 are narrow by nature and would
  // make every window look too wide.
  const dxRaw = meanStep(raw.x);
  const quant = reference.peaks.filter((p) => p.flag === 'quantifiable' && !p.removedByUser);
  const narrowest = quant.length ? points(Math.min(...quant.map((p) => toPoints(xUnits(p.fwhm), dxRaw)))) : null;
  const advice = windowAdviceRows(request.recipe, registry, narrowest);
  const where = (x: number) => `${x.toPrecision(5)}${sample.xUnit ? ` ${sample.xUnit}` : ''}`;
  const stackName = (col: number) => (col === 1 ? 'the current stack' : `"${columns[col].label}"`);
  /** Quantifiable raw features a stack loses, drops below a limit, or keeps less than 1 − HEIGHT_LOSS_TOLERANCE of: no 'clean' verdict then. */
  const weakenedIn = (col: number): string[] => {
    const out: string[] = [];
    for (const row of full.rows) {
      if (row.firstFoundIn !== 0) continue;
      const ref = row.cells[0], cur = row.cells[col];
      if (ref.standing !== 'quantifiable') continue;
      if (!cur.found) out.push(`The feature at ${where(row.position)} (S/N ${ref.snr?.toFixed(1)} raw) is lost with ${stackName(col)}.`);
      else if (cur.crossed === 'down') out.push(`The feature at ${where(row.position)} falls from quantifiable (S/N ${ref.snr?.toFixed(1)}) to ${cur.standing.replace('-', ' ')} (S/N ${cur.snr?.toFixed(1)}) with ${stackName(col)}.`);
      else if (cur.heightKept !== null && cur.heightKept < 100 * (1 - HEIGHT_LOSS_TOLERANCE)) out.push(`The feature at ${where(row.position)} keeps only ${cur.heightKept.toFixed(0)} % of its raw height with ${stackName(col)}.`);
    }
    return out;
  };
  // The alternatives' verdicts cannot read clean while they weaken a quantifiable feature either (copies: the memo keeps the originals).
  const outcomes = alternatives.map((a, k) => (a.outcome.diagnostics ? { ...a.outcome, diagnostics: combineVerdict(a.outcome.diagnostics, weakenedIn(k + 2)) } : a.outcome));
  const currentWarnings: string[] = [];
  const currentItems: LossItem[] = [];
  // Detectable features no higher than what pure noise of this length reaches about once are summed up, not listed.
  const ceiling = noiseBumps?.oneBumpSnr ?? null;
  const withinNoise = (snr: number | null, standing: string) => standing !== 'quantifiable' && ceiling !== null && snr !== null && snr < ceiling;
  let noiseLevelLosses = 0;
  for (const row of full.rows) {
    // Only features present on the raw trace can be lost by the current stack (column 1).
    if (row.firstFoundIn !== 0) continue;
    const ref = row.cells[0], cur = row.cells[1];
    if (ref.standing !== 'quantifiable' && ref.standing !== 'detectable') continue;
    let sentence: string | null = null;
    const kind: LossItem['kind'] = cur.found ? 'weakened' : 'lost';
    if (!cur.found) sentence = `The feature at ${where(row.position)} (S/N ${ref.snr?.toFixed(1)} raw) is lost with the current stack.`;
    else if (cur.crossed === 'down') sentence = `The feature at ${where(row.position)} falls from ${ref.standing} (S/N ${ref.snr?.toFixed(1)}) to ${cur.standing.replace('-', ' ')} (S/N ${cur.snr?.toFixed(1)}) with the current stack.`;
    else if (ref.standing === 'quantifiable' && cur.heightKept !== null && cur.heightKept < 100 * (1 - HEIGHT_LOSS_TOLERANCE)) sentence = `The feature at ${where(row.position)} keeps only ${cur.heightKept.toFixed(0)} % of its raw height with the current stack.`;
    if (!sentence) continue;
    if (withinNoise(ref.snr, ref.standing)) noiseLevelLosses++;
    else { currentWarnings.push(sentence); currentItems.push({ kind, x: row.position, snr: ref.snr, sentence }); }
  }
  // Features the raw trace does not have (a spike smoothing spread, a bump smoothing made out of noise).
  let noiseLevelBorn = 0;
  for (const p of main.peaks) {
    if (p.removedByUser || !p.marks.includes('appears-only-after-processing')) continue;
    if (p.flag !== 'quantifiable' && p.flag !== 'detectable') continue;
    if (withinNoise(p.snr, p.flag)) { noiseLevelBorn++; continue; }
    const sentence = `The feature at ${where(p.x)} (S/N ${p.snr?.toFixed(1)}, ${p.flag === 'quantifiable' ? 'quantifiable' : 'detected'}) appears only after processing: the raw trace has nothing there that passes the same thresholds.`;
    currentWarnings.push(sentence);
    currentItems.push({ kind: 'appeared', x: p.x, snr: p.snr ?? null, sentence });
  }
  if (noiseLevelLosses + noiseLevelBorn > 0 && ceiling !== null) {
    const parts = [
      noiseLevelLosses ? `${noiseLevelLosses} detectable feature${noiseLevelLosses === 1 ? ' is' : 's are'} lost or weakened` : '',
      noiseLevelBorn ? `${noiseLevelBorn} detectable feature${noiseLevelBorn === 1 ? ' appears' : 's appear'} only after processing` : '',
    ].filter(Boolean);
    currentWarnings.push(`Within the noise range (below S/N ${ceiling.toFixed(1)}, which pure noise of this length reaches about once) ${parts.join(' and ')}; the ledger lists them.`);
  }
  return { ledger, noiseLevelRows, noiseLevelShown: !!request.ledgerNoiseLevel, outcomes, narrowestFwhmPoints: narrowest, advice, currentWarnings, currentWeakened: weakenedIn(1), currentItems };
}
