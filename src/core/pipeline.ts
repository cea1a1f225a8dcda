/**
 * Runs a recipe over a signal, step by step, keeping every step's output.
 *
 * Each step's output is cached under a key made of the input's key, every
 * earlier step's id and parameters, and its own; editing step k therefore
 * reruns only steps k onward. A step whose parameters do not fit the data
 * is reported and passed over (its input flows on unchanged), so the page
 * always shows what was actually done and says what was not.
 *
 * Companions (issue 20): the blank and every repeated scan follow the
 * sample. Each enabled step that runs on the sample is also run, with the
 * same parameters, on each companion before any later step uses it, so a
 * step that subtracts the blank or averages the scans sees them processed
 * exactly as far as the sample is. Two exceptions, said in the step's note:
 * the blank is not subtracted from itself (it would vanish, and the
 * pharmacopoeial h needs it) and is not averaged with the scans; the scans
 * are not averaged with each other (averaging consumes them). A step that
 * does not fit a companion (e.g. a window longer than the blank) leaves it
 * as it was, and the note says so. Companion outputs are cached under the
 * sample step's key and the companion's role and id.
 */
import { unevenSpacingProblem } from './steps/checks.ts';
import type { Recipe, Registry } from './method.ts';
import type { Signal, SpikeEvent, StepContext, StepDefinition, StepOutput, StepParams } from './steps/types.ts';
import type { Trace } from './trace.ts';

export type StepStatus = 'ok' | 'off' | 'error';

export interface StepRun {
  uid: string;
  step: string;
  status: StepStatus;
  /** Why the step did not run (status 'error'). */
  message?: string;
  /** The step's output (status 'ok'). */
  output?: StepOutput;
  /** True when the output came from the cache. */
  cached: boolean;
  /** Milliseconds spent (0 when cached). */
  ms: number;
  /** True when the step, with these parameters, is affine in its inputs (StepDefinition.linear). */
  linear?: boolean;
}

export interface PipelineResult {
  /** The processed signal: the last output, or the input when nothing ran. */
  final: Signal;
  runs: StepRun[];
  /** Every spike event from despiking steps, in step order. */
  events: SpikeEvent[];
  /** The baseline of the last baseline step, when it is on the final grid. */
  baseline?: Float64Array;
  /** The blank and scans after every step that ran on them (the same steps as the sample, see the file comment). */
  companions: ProcessedCompanions;
}

/** The blank and the repeated scans as processed by the stack (raw when no step ran). */
export interface ProcessedCompanions {
  blank?: Trace;
  /** In the order of the context's scans. */
  scans: Trace[];
}

/** Steps that use a companion; they are not applied to the companion they consume. */
const USES_BLANK = 'blank-subtraction';
const USES_SCANS = 'ensemble-average';

/** Default memory budget of a {@link PipelineCache}: about twelve 10⁶-point outputs. */
export const PIPELINE_CACHE_BYTES = 200 * 1024 * 1024;

/** The typed-array stores an output holds (x is often shared with the step's input). */
function storesOf(v: StepOutput): ArrayBufferLike[] {
  const out = [v.x.buffer, v.y.buffer];
  if (v.baseline) out.push(v.baseline.buffer);
  if (v.extra) for (const a of Object.values(v.extra)) out.push(a.buffer);
  return out;
}

/**
 * A bounded cache of step outputs keyed by the chain of inputs that made
 * them. Bounded by entry count and by bytes: a store shared by several
 * outputs (steps that keep the grid hand on their input's x) is counted
 * once. When over either bound the least recently used entries go; the
 * newest entry always stays, even when it alone exceeds the byte budget.
 *
 * Bounded by use as well (issue 16, the heap at 10⁶ points): the owner
 * calls {@link PipelineCache.beginRun} when a new analysis starts, and
 * once that analysis stores a new output, every output that neither it nor
 * the analysis before it used goes. A slider drag thus keeps the unchanged
 * steps before the edited one (every run uses them) and the outputs of the
 * value just left (a step back, undo), not every value the slider passed
 * (8 MB each at 10⁶ points). Without
 * beginRun calls (tests, the CLI, batch runs) only the two bounds apply.
 */
export class PipelineCache {
  private readonly map = new Map<string, StepOutput>();
  /** How many cached outputs hold each store. */
  private readonly refs = new Map<ArrayBufferLike, number>();
  /** The run in which each key was last read or written. */
  private readonly usedIn = new Map<string, number>();
  private run = 0;
  private held = 0;
  constructor(private readonly maxEntries = 64, private readonly maxBytes = PIPELINE_CACHE_BYTES) {}
  get(key: string): StepOutput | undefined {
    const v = this.map.get(key);
    if (v) { this.map.delete(key); this.map.set(key, v); this.usedIn.set(key, this.run); }
    return v;
  }
  /**
   * A new analysis starts. Before it stores its first new output, the
   * outputs that neither it nor the run just before it used are let go: the
   * value just left can still come back from the cache (it is looked up
   * before anything new is stored), and a run that only reads keeps all.
   */
  beginRun(): void {
    this.run++;
    this.sweepDue = true;
  }
  private sweepDue = false;
  set(key: string, value: StepOutput): void {
    if (this.sweepDue) {
      this.sweepDue = false;
      for (const [k, at] of this.usedIn) if (at < this.run - 1) this.remove(k);
    }
    if (this.map.has(key)) this.remove(key);
    this.map.set(key, value);
    this.usedIn.set(key, this.run);
    for (const b of new Set(storesOf(value))) {
      const r = this.refs.get(b) ?? 0;
      if (r === 0) this.held += b.byteLength;
      this.refs.set(b, r + 1);
    }
    while (this.map.size > 1 && (this.map.size > this.maxEntries || this.held > this.maxBytes)) {
      const oldest = this.map.keys().next().value;
      if (oldest === undefined) break;
      this.remove(oldest);
    }
  }
  private remove(key: string): void {
    const v = this.map.get(key);
    if (!v) return;
    this.map.delete(key);
    this.usedIn.delete(key);
    for (const b of new Set(storesOf(v))) {
      const r = (this.refs.get(b) ?? 1) - 1;
      if (r <= 0) { this.refs.delete(b); this.held -= b.byteLength; } else this.refs.set(b, r);
    }
  }
  clear(): void { this.map.clear(); this.refs.clear(); this.usedIn.clear(); this.held = 0; this.sweepDue = false; }
  get size(): number { return this.map.size; }
  /** Bytes of the distinct typed-array stores the cached outputs hold. */
  get bytes(): number { return this.held; }
}

function allFinite(a: Float64Array): boolean {
  for (let i = 0; i < a.length; i++) if (!Number.isFinite(a[i])) return false;
  return true;
}

/** True when a and b hold the same numbers bit for bit (finite values: equal, and zeros of the same sign). */
function sameNumbers(a: Float64Array, b: Float64Array): boolean {
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i] || (a[i] === 0 && 1 / a[i] !== 1 / b[i])) return false;
  return true;
}

/**
 * The output with its x replaced by the input's x array when the step kept
 * the grid but returned a copy of it (most smoothers do, so their output is
 * theirs alone): kept in the cache, every such output would hold its own
 * 8 MB of identical x at 10⁶ points (issue 16). Nothing changes an x array
 * after a step made it, so sharing it is safe; the numbers are the same bits.
 */
function shareGrid<T extends Signal>(output: T, input: Signal): T {
  return output.x !== input.x && sameNumbers(output.x, input.x) ? { ...output, x: input.x } : output;
}

/**
 * Run `recipe` on `input`. `inputKey` identifies the input data (e.g. the
 * trace id) for caching; `ctx` carries the blank and repeated scans; pass a
 * {@link PipelineCache} to reuse outputs between runs; `companionCache`
 * (default: the same cache) keeps the processed blank and scans, keyed by
 * the identity of their raw arrays.
 */
export function runPipeline(
  input: Signal, inputKey: string, recipe: Recipe, registry: Registry, ctx: StepContext = {}, cache?: PipelineCache,
  clock: () => number = () => Date.now(), companionCache: PipelineCache | undefined = cache,
): PipelineResult {
  const runs: StepRun[] = [];
  const events: SpikeEvent[] = [];
  let current: Signal = input;
  let baseline: Float64Array | undefined;
  const ctxKey = `b:${ctx.blank?.id ?? '-'}|s:${(ctx.scans ?? []).map((s) => s.id).join(',')}`;
  let key = `${inputKey}|${ctxKey}`;
  // The companions as processed so far; the context each step sees holds these, never the raw ones.
  let blank: Trace | undefined = ctx.blank;
  let scans: Trace[] = [...(ctx.scans ?? [])];
  const stepCtx = (): StepContext => ({ blank, scans });
  const tokens: CompanionTokens = { of: new Map(), blank: ctx.blank ? arrayToken(ctx.blank.y) : '-' };
  if (ctx.blank) tokens.of.set(ctx.blank.id, arrayToken(ctx.blank.y));
  for (const s of scans) tokens.of.set(s.id, arrayToken(s.y));
  // Scans are processed only up to the last step that averages them; nothing after it reads them.
  let lastScanUse = -1;
  recipe.steps.forEach((e, i) => { if (e.enabled && e.step === USES_SCANS) lastScanUse = i; });
  let stepIndex = -1;
  for (const entry of recipe.steps) {
    stepIndex++;
    if (!entry.enabled) { runs.push({ uid: entry.uid, step: entry.step, status: 'off', cached: false, ms: 0 }); continue; }
    const def = registry.find((d) => d.id === entry.step);
    if (!def) {
      runs.push({ uid: entry.uid, step: entry.step, status: 'error', message: `Unknown step "${entry.step}".`, cached: false, ms: 0 });
      continue;
    }
    let problem: string | null = null;
    // Even spacing is checked here, once, for every step that declares it needs it (the steps do not check it again).
    if (def.needsEvenSpacing) problem = unevenSpacingProblem(current.x, def.label);
    if (!problem) {
      try { problem = def.validate(entry.params, current, stepCtx()); } catch (e) { problem = `Could not check the parameters: ${(e as Error).message}`; }
    }
    if (problem) {
      runs.push({ uid: entry.uid, step: entry.step, status: 'error', message: problem, cached: false, ms: 0 });
      continue;
    }
    const stepKey = `${key}>${entry.step}:${JSON.stringify(entry.params)}`;
    let output = cache?.get(stepKey);
    const cached = output !== undefined;
    const t0 = clock();
    if (!output) {
      try {
        output = def.apply(current, entry.params, stepCtx());
      } catch (e) {
        runs.push({ uid: entry.uid, step: entry.step, status: 'error', message: `${def.label} failed: ${(e as Error).message}`, cached: false, ms: 0 });
        continue;
      }
      if (output.x.length !== output.y.length || output.y.length < 2 || !allFinite(output.y) || !allFinite(output.x)) {
        runs.push({ uid: entry.uid, step: entry.step, status: 'error', message: `${def.label} produced values that are not finite numbers, so its output was not used.`, cached: false, ms: 0 });
        continue;
      }
      output = shareGrid(output, current);
      cache?.set(stepKey, output);
    }
    // The companions follow: the same step, the same parameters, on each (before any later step uses them).
    const follow = processCompanions(def, entry.params, stepKey, { blank, scans }, stepIndex <= lastScanUse, tokens, companionCache);
    blank = follow.blank;
    scans = follow.scans;
    if (follow.notes.length) output = { ...output, notes: [...output.notes, ...follow.notes] };
    const linear = typeof def.linear === 'function' ? def.linear(entry.params) : def.linear === true;
    runs.push({ uid: entry.uid, step: entry.step, status: 'ok', output, cached, ms: cached ? 0 : clock() - t0, linear });
    key = stepKey;
    if (output.events) events.push(...output.events);
    if (output.baseline) baseline = output.baseline;
    else if (baseline && output.x.length !== baseline.length) baseline = undefined;
    current = { x: output.x, y: output.y };
  }
  return { final: current, runs, events, baseline, companions: { blank, scans } };
}

/**
 * A number per typed array, by identity: companion outputs are cached under
 * the identity of the raw arrays they came from, so a changed companion
 * under the same trace id (the noise carriage bumps single points) never
 * meets a stale entry.
 */
const ARRAY_TOKENS = new WeakMap<Float64Array, number>();
let nextToken = 1;
export function arrayToken(a: Float64Array): number {
  let t = ARRAY_TOKENS.get(a);
  if (t === undefined) { t = nextToken++; ARRAY_TOKENS.set(a, t); }
  return t;
}

interface CompanionTokens {
  /** Token of each raw companion's y, by trace id. */
  of: Map<string, number>;
  /** Token of the raw blank's y ('-' without a blank): the scans depend on it once the blank is subtracted from them. */
  blank: number | '-';
}

/** A companion's name for a note. */
function companionName(role: 'blank' | 'scan', t: Trace): string {
  return role === 'blank' ? `the blank "${t.name}"` : `the scan "${t.name}"`;
}

/**
 * Run one step on each companion (see the file comment): the blank with the
 * scans as context, each scan with the processed blank as context. Returns
 * the processed companions and the sentences for the step's note.
 */
function processCompanions(
  def: StepDefinition, params: StepParams, stepKey: string,
  now: ProcessedCompanions, scansStillUsed: boolean, tokens: CompanionTokens, cache?: PipelineCache,
): ProcessedCompanions & { notes: string[] } {
  const applied: string[] = [];
  const notes: string[] = [];
  const one = (role: 'blank' | 'scan', t: Trace, ctx: StepContext): Trace => {
    const name = companionName(role, t);
    const key = `${stepKey}#${role}:${t.id}:${tokens.of.get(t.id) ?? '?'}${role === 'scan' ? `|b:${tokens.blank}` : ''}`;
    let out = cache?.get(key);
    if (!out) {
      let problem: string | null = null;
      if (def.needsEvenSpacing) problem = unevenSpacingProblem(t.x, def.label);
      if (!problem) {
        try { problem = def.validate(params as never, t, ctx); } catch (e) { problem = (e as Error).message; }
      }
      if (!problem) {
        try { out = def.apply(t, params as never, ctx); } catch (e) { problem = (e as Error).message; }
      }
      if (!problem && out && (out.x.length !== out.y.length || out.y.length < 2 || !allFinite(out.y) || !allFinite(out.x))) {
        problem = 'the step gave values that are not finite numbers';
        out = undefined;
      }
      if (problem || !out) {
        notes.push(`Not applied to ${name}, which stays as it was before this step: ${problem}`);
        return t;
      }
      out = shareGrid(out, t);
      cache?.set(key, out);
    }
    applied.push(name);
    return { ...t, x: out.x, y: out.y };
  };
  let blank = now.blank;
  let scans = now.scans;
  if (blank) {
    if (def.id === USES_BLANK) notes.push(`The blank is not subtracted from itself: it goes on to later steps${scans.length ? ', and was subtracted from each scan,' : ''} as processed so far.`);
    else if (def.id === USES_SCANS) notes.push('The blank is not averaged with the scans: it goes on to later steps as processed so far.');
    else blank = one('blank', blank, { scans });
  }
  if (scans.length && scansStillUsed) {
    if (def.id === USES_SCANS) notes.push(`Each scan was processed by every step before this one, as the sample was${scans.length > 1 ? '; the scans are not averaged with each other' : ''}.`);
    else scans = scans.map((s) => one('scan', s, { blank }));
  }
  if (applied.length) notes.unshift(`Applied with the same parameters to ${applied.join(', ')}.`);
  return { blank, scans, notes };
}
