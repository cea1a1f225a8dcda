/**
 * The analysis, in stages. This file is the table of contents: the stages in
 * the order they run and land, each yielding one update as soon as it is
 * ready, so the page can draw the processed trace while peaks and the loss
 * check are still being worked out, and a newer request can stop older work
 * between stages (the consumer simply stops pulling).
 *
 *   1. processed    the recipe run on the sample (steps cached by the pipeline cache) and the residual curve
 *   2. residual     the residual's tests (verdict provisional until 7)
 *   3. noise        σ of the measured trace (raw σ carried through the stack)
 *   4. peaks        the peak table, marked against the raw trace's own table (memo)
 *   5. bumps        how many bumps pure noise would give with these settings (a simulation, cached)
 *   6. alternative  one job per alternative stack (memo: the current stack's edit cannot change them)
 *   7. loss         the ledger, the window advice, and the final residual verdict
 *
 * Inside stages 4–7 peak detection pauses every few milliseconds (the
 * tables, the noise-bump simulation, each alternative; `analyseSteps`,
 * pause.ts), so a worker can stop stale work there too.
 *
 * `analyse()` collects every update into one result: tests, the CLI, the
 * bench and batch runs use it. Pure: nothing here changes its input.
 */
import { pharmacopoeialBlank } from '../measure/companion-noise.ts'; // issue 20
import { markGhostPeaks } from '../measure/ghost-peaks.ts'; // issue 20
import type { PipelineCache } from '../pipeline.ts';
import type { Registry } from '../method.ts';
import type { Signal, StepContext } from '../steps/types.ts';
import type { Trace } from '../trace.ts';
import { meanStep } from '../numeric/interpolate.ts';
import { combineVerdict } from '../measure/residual-tests.ts';
import { markAppearsOnlyAfterProcessing, markSaturatedOnRaw } from '../measure/peak-table.ts';
import { expectedNoiseBumpsStepwise } from '../measure/noise-bumps.ts';
import type { SharedJob } from '../measure/peak-table.ts';
import { isShareOffer, type Pause } from './pause.ts';
import { DEFAULT_NOISE_SETTINGS, DEFAULT_PEAK_SETTINGS, MAX_ALTERNATIVES, type AnalyseRequest } from './request.ts';
import { STAGES, type AnalyseResult, type StageName, type StageUpdate } from './result.ts';
import { AnalysisMemo, type AlternativeMeasured } from './memo.ts';
import { intermediateOf, processedSomething, processSample, runSummaries, stackOf } from './stages/process.ts';
import { residualOfRun, residualTests } from './stages/residual.ts';
import { measurePeaksStepwise, noiseOn, peaksOnStepwise } from './stages/measure.ts';
import { rawReferenceStepwise } from './stages/reference.ts';
import { measureAlternative } from './stages/alternatives.ts';
import { lossReport } from './stages/loss.ts';

export * from './request.ts';
export * from './result.ts';
export { AnalysisMemo } from './memo.ts';
export { measureNoise } from '../measure/noise-report.ts';

/** Where the stages keep what they may reuse: step outputs (pipeline cache) and per-trace results (memo). */
export interface AnalysisCaches {
  pipeline?: PipelineCache;
  memo?: AnalysisMemo;
}

/** Run the analysis stage by stage; each `next()` does one stage's work and yields its update. */
export function* analyseStaged(
  request: AnalyseRequest, traces: ReadonlyMap<string, Trace>, registry: Registry, caches: AnalysisCaches = {},
): Generator<StageUpdate, void, void> {
  // for…of answers no offer, so every stage is worked out on this thread.
  for (const u of analyseSteps(request, traces, registry, caches)) if (isStageUpdate(u)) yield u;
}

/** True for a stage's update, false for a pause, an offer of work or a wait (pause.ts). */
export function isStageUpdate(v: StageUpdate | Pause): v is StageUpdate {
  return v !== undefined && !(v instanceof Promise) && !isShareOffer(v);
}

/**
 * {@link analyseStaged} with the pauses inside long stages passed on (pause.ts: `undefined` between updates, every
 * few ms of peak detection; offers of detection work to another thread, and waits for it): the worker lets a newer
 * request in at the pauses, may stop pulling, and answers the offers when it has a second thread.
 */
export function* analyseSteps(
  request: AnalyseRequest, traces: ReadonlyMap<string, Trace>, registry: Registry, caches: AnalysisCaches = {},
): Generator<StageUpdate | Pause, void, SharedJob | undefined> {
  const cache = caches.pipeline;
  const memo = caches.memo ?? new AnalysisMemo();
  const sample = traces.get(request.sampleId);
  if (!sample) throw new Error(`No trace with id ${request.sampleId}`);
  const sampleId = sample.id;
  const ctx: StepContext = {
    blank: request.blankId ? traces.get(request.blankId) : undefined,
    scans: request.scanIds.map((id) => traces.get(id)).filter((t): t is Trace => t !== undefined),
  };
  const raw: Signal = { x: sample.x, y: sample.y };
  const alts = (request.alternatives ?? []).slice(0, MAX_ALTERNATIVES);
  const pendingAfter = (stage: StageName): StageName[] => {
    const order: StageName[] = [...STAGES];
    return order.slice(order.indexOf(stage) + 1).filter((s) => s !== 'alternative' || alts.length > 0);
  };

  // 1. The processed trace.
  const run = processSample(raw, sampleId, request.recipe, registry, ctx, cache);
  const ran = processedSomething(run);
  // The residual curve is cheap and drawn under the processed trace, so it lands with it (one redraw of the plot).
  const { residual, note } = residualOfRun(raw, run);
  yield {
    stage: 'processed', sampleId, pending: pendingAfter('processed'),
    patch: { sampleId, processed: run.final, residual, residualNote: note, baseline: run.baseline, intermediate: intermediateOf(run, request.showUid), runs: runSummaries(run), events: run.events },
  };

  // 2. The residual's tests (the verdict is provisional: the loss check may hold it back).
  const tests = residualTests(raw, residual, ran);
  yield { stage: 'residual', sampleId, pending: pendingAfter('residual'), patch: { diagnostics: tests } };

  // 3. Noise on the measured trace.
  const ps = request.peaks ?? DEFAULT_PEAK_SETTINGS;
  const noiseSettings = request.noise ?? DEFAULT_NOISE_SETTINGS;
  const measured = ps.measureOn === 'raw' ? raw : run.final;
  const stack = stackOf(run, request.recipe, registry, ctx, sampleId);
  const noise = noiseOn(measured, raw, noiseSettings, stack);
  yield { stage: 'noise', sampleId, pending: pendingAfter('noise'), patch: { noise } };

  // 4. Peaks, marked against the raw trace's own table (which the loss check uses too, and only needs when
  //    something processed the trace or alternatives are asked for).
  const main = yield* peaksOnStepwise(measured, raw, noise, ps, ctx, stack, request.decisions);
  const reference = ran || alts.length > 0 ? yield* rawReferenceStepwise(request, raw, ctx, memo) : main;
  if (measured !== raw && ran) {
    // What the raw trace does not have, and tops flat at the raw trace's largest value (smoothing rounds them).
    main.peaks = markSaturatedOnRaw(markAppearsOnlyAfterProcessing(main.peaks, reference.peaks, meanStep(raw.x)), raw.x, raw.y, ps.negative);
  }
  // Issue 20: peaks that also stand in the (processed) blank: carry-over or ghost peaks.
  if (ctx.blank && main.peakOptions) main.peaks = markGhostPeaks(main.peaks, pharmacopoeialBlank(measured, raw, ctx, stack)!, main.peakOptions, meanStep(measured.x));
  yield { stage: 'peaks', sampleId, pending: pendingAfter('peaks'), patch: { peaks: main.peaks, peakOptions: main.peakOptions, peakProblem: main.peakProblem } };

  // 5. The expected count of noise-only bumps: a simulation for each new set of thresholds and noise correlation
  //    (0.3–1 s), so it lands after the table.
  const noiseBumps = main.peakOptions && main.peakOptions.noiseSigma > 0
    ? yield* expectedNoiseBumpsStepwise(measured.y.length, meanStep(measured.x), main.peakOptions, main.noise?.measuredRho)
    : null;
  yield { stage: 'bumps', sampleId, pending: pendingAfter('bumps'), patch: { noiseBumps } };

  // 6. One job per alternative.
  const measuredAlts: AlternativeMeasured[] = [];
  for (let k = 0; k < alts.length; k++) {
    measuredAlts.push(yield* measureAlternative(request, alts[k], raw, ctx, registry, memo, cache));
    const pending = pendingAfter('alternative');
    yield { stage: 'alternative', sampleId, pending: k + 1 < alts.length ? ['alternative', ...pending] : pending, patch: {}, progress: { done: k + 1, of: alts.length } };
  }

  // 7. The loss check, and with it the final residual verdict.
  let loss = null;
  if (ran || alts.length > 0) {
    // Hand decisions belong to the current table only; the comparison uses what detection finds.
    const reuse = ps.measureOn === 'processed' && !request.decisions?.added.length && !request.decisions?.removed.length && !request.decisions?.bounds?.length;
    const lossPs = { ...ps, measureOn: 'processed' as const };
    const current = reuse ? main : yield* measurePeaksStepwise(run.final, raw, noiseSettings, lossPs, ctx, stack);
    loss = lossReport(request, raw, sample, main, current, reference, measuredAlts, noiseBumps, registry);
  }
  const diagnostics = tests && loss ? combineVerdict(tests, loss.currentWeakened) : tests;
  yield { stage: 'loss', sampleId, pending: [], patch: { loss, diagnostics } };
}

/** The empty result the stages fill in. */
function emptyResult(sampleId: string): AnalyseResult {
  return {
    sampleId, processed: { x: new Float64Array(0), y: new Float64Array(0) }, residual: { x: new Float64Array(0), y: new Float64Array(0) },
    diagnostics: null, runs: [], events: [], noise: null, peaks: [], peakOptions: null, noiseBumps: null, loss: null, ms: 0,
  };
}

/** Fold one stage's update into a result (a new object; fields the stage did not set keep their identity). */
export function applyStage(result: AnalyseResult | null, update: StageUpdate): AnalyseResult {
  const base = result && result.sampleId === update.sampleId ? result : emptyResult(update.sampleId);
  return { ...base, ...update.patch };
}

/** Run one whole analysis. `traces` holds every loaded trace by id. */
export function analyse(
  request: AnalyseRequest, traces: ReadonlyMap<string, Trace>, registry: Registry, cache?: PipelineCache, memo?: AnalysisMemo,
): AnalyseResult {
  const t0 = Date.now();
  let result = emptyResult(request.sampleId);
  for (const update of analyseStaged(request, traces, registry, { pipeline: cache, memo })) result = applyStage(result, update);
  return { ...result, ms: Date.now() - t0 };
}
