/**
 * One fit job as the page asks for it (issue 18): fit a region of the raw or
 * the processed trace, choose the peak count by the forward BIC comparison
 * (./count.ts), and, for the loss check, choose it again on every other
 * version of the trace (./processing.ts). Pure: the worker runs it beside the
 * analysis, tests run it in Node. Never changes its inputs.
 */
import { supportedPeakCount, type CountComparison } from './count.ts';
import { sameGrid } from '../../numeric/interpolate.ts';
import { peakCountAcrossProcessing, type CountSupportAcrossProcessing } from './processing.ts';
import { MAX_PEAKS, type BaselineKind, type PeakStart, type RegionFit } from './region.ts';
import { SHAPE_KINDS, SHAPES, type ShapeKind } from './shapes.ts';

/** What the user chose in the fit panel. */
export interface FitSettings {
  /** Region start and end, x-units. */
  from: number;
  to: number;
  /** The version fitted and shown: the raw trace or the current processing's output. */
  on: 'raw' | 'processed';
  shape: ShapeKind;
  baseline: BaselineKind;
  /** Largest count the forward comparison tries (1–4). */
  maxPeaks: number;
}

/** One version of the trace, signal on its own grid. */
export interface FitVersion {
  label: string;
  x: Float64Array;
  y: Float64Array;
}

export interface FitJobInput {
  settings: FitSettings;
  raw: FitVersion;
  /** The current stack's output (label e.g. "current processing"); absent when no step ran. */
  processed?: FitVersion;
  /** The loss check's alternatives, in order. */
  alternatives?: readonly FitVersion[];
  /** Starting peaks (from the peak table rows inside the region). */
  starts?: readonly PeakStart[];
  /** Checked between fits; a true answer stops the job. */
  isCancelled?: () => boolean;
}

/** One row of the processing check, without the arrays of its fits (the chosen fit's count and sentence). */
export interface FitProcessingRow {
  label: string;
  count: number | null;
  sameAsReference: boolean | null;
  independentResiduals: boolean | null;
  statement: string;
}

export interface FitJobResult {
  settings: FitSettings;
  /** Label of the version fitted ("raw" or the processing's). */
  fittedLabel: string;
  /** The supported count and its fit. */
  count: number;
  fit: RegionFit;
  /** The last comparison made (k vs k + 1), whose residuals the panel draws beneath; null when maxPeaks is 1. */
  decisive: CountComparison | null;
  /** Every step of the forward comparison, as figures (no arrays). */
  steps: { smaller: number; larger: number; supported: boolean; deltaBic: number; deltaAic: number; fStatistic: number; criterion: string; statement: string }[];
  statement: string;
  /** The first sentence of the statement: how many peaks the fit supports, on which trace. */
  lead: string;
  /** Does each version support the same count? The raw trace is the reference. */
  processing: { reference: string; referenceCount: number | null; rows: FitProcessingRow[]; fewer: string[]; summary: string } | null;
  ms: number;
}

export type FitJobOutcome = { ok: true; result: FitJobResult } | { ok: false; message: string };

/** Check the settings a user can get wrong; null when they are usable. */
export function fitSettingsProblem(s: FitSettings): string | null {
  if (!(Number.isFinite(s.from) && Number.isFinite(s.to))) return 'Mark a region first: drag across the plot with “Mark a range”, or zoom to the region.';
  if (!(s.to > s.from)) return `The region must run from a smaller to a larger x (got ${s.from} to ${s.to}).`;
  if (!SHAPE_KINDS.includes(s.shape)) return `Unknown peak shape “${String(s.shape)}”.`;
  if (s.baseline !== 'line' && s.baseline !== 'quadratic') return `Unknown baseline “${String(s.baseline)}”.`;
  if (!(Number.isInteger(s.maxPeaks) && s.maxPeaks >= 1 && s.maxPeaks <= MAX_PEAKS)) return `The largest count must be 1 to ${MAX_PEAKS}.`;
  return null;
}

/**
 * Run one fit job.
 * The processing check needs versions on the raw trace's x grid; a version
 * on another grid (resampled) gets a row that says so and is not fitted.
 */
export function runFitJob(input: FitJobInput): FitJobOutcome {
  const t0 = Date.now();
  const s = input.settings;
  const problem = fitSettingsProblem(s);
  if (problem) return { ok: false, message: problem };
  const target = s.on === 'processed' && input.processed ? input.processed : input.raw;
  const options = { from: s.from, to: s.to, shape: s.shape, baseline: s.baseline, starts: input.starts, maxPeaks: s.maxPeaks };
  const out = supportedPeakCount(target.x, target.y, options);
  if (!out.ok) return { ok: false, message: out.message };
  const r = out.result;
  const decisive = r.comparisons.length ? r.comparisons[r.comparisons.length - 1] : null;
  const steps = r.comparisons.map((c) => ({
    smaller: c.smaller.peaks.length, larger: c.larger.peaks.length, supported: c.supported,
    deltaBic: c.deltaBic, deltaAic: c.deltaAic, fStatistic: c.fStatistic.value, criterion: c.criterion, statement: c.statement,
  }));
  let processing: FitJobResult['processing'] = null;
  const others = [...(input.processed ? [input.processed] : []), ...(input.alternatives ?? [])];
  if (others.length && !input.isCancelled?.()) {
    const same = others.filter((v) => sameGrid(v.x, input.raw.x));
    const apart = others.filter((v) => !sameGrid(v.x, input.raw.x));
    const across: CountSupportAcrossProcessing = peakCountAcrossProcessing(input.raw.x, [input.raw, ...same].map((v) => ({ label: v.label, y: v.y })), { ...options, starts: input.starts });
    const rows: FitProcessingRow[] = across.rows.map((row) => ({ label: row.label, count: row.count, sameAsReference: row.sameAsReference, independentResiduals: row.independentResiduals, statement: row.statement }));
    for (const v of apart) rows.push({ label: v.label, count: null, sameAsReference: null, independentResiduals: null, statement: `${v.label}: its x grid differs from the raw trace's (resampled), so its count is not compared.` });
    processing = {
      reference: across.reference,
      referenceCount: across.referenceCount,
      rows,
      fewer: across.fewer,
      summary: across.summary,
    };
  }
  const shapeWords = SHAPES[s.shape].label;
  // Lead with the count, then each step's own sentence (the last says plainly when the extra peak is not supported).
  const lead = `The fit on the ${target.label} trace supports ${r.count} ${shapeWords} peak${r.count === 1 ? '' : 's'}.`;
  const statement = s.maxPeaks === 1 ? `One ${shapeWords} peak fitted; no larger count was tried.` : [lead, ...r.comparisons.map((c) => c.statement)].join(' ');
  return { ok: true, result: { settings: { ...s }, fittedLabel: target.label, count: r.count, fit: r.fit, decisive, steps, statement, processing, lead: s.maxPeaks === 1 ? statement : lead, ms: Date.now() - t0 } };
}
