/**
 * Runs a recipe over a signal, step by step, keeping every step's output.
 *
 * Each step's output is cached under a key made of the input's key, every
 * earlier step's id and parameters, and its own; editing step k therefore
 * reruns only steps k onward. A step whose parameters do not fit the data
 * is reported and passed over (its input flows on unchanged), so the page
 * always shows what was actually done and says what was not.
 */
import { isEvenlySpaced } from './numeric/interpolate.ts';
import type { Recipe, Registry } from './recipe.ts';
import type { Signal, SpikeEvent, StepContext, StepOutput } from './steps/types.ts';

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
}

export interface PipelineResult {
  /** The processed signal: the last output, or the input when nothing ran. */
  final: Signal;
  runs: StepRun[];
  /** Every spike event from despiking steps, in step order. */
  events: SpikeEvent[];
  /** The baseline of the last baseline step, when it is on the final grid. */
  baseline?: Float64Array;
}

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
 */
export class PipelineCache {
  private readonly map = new Map<string, StepOutput>();
  /** How many cached outputs hold each store. */
  private readonly refs = new Map<ArrayBufferLike, number>();
  private held = 0;
  constructor(private readonly maxEntries = 64, private readonly maxBytes = PIPELINE_CACHE_BYTES) {}
  get(key: string): StepOutput | undefined {
    const v = this.map.get(key);
    if (v) { this.map.delete(key); this.map.set(key, v); }
    return v;
  }
  set(key: string, value: StepOutput): void {
    if (this.map.has(key)) this.remove(key);
    this.map.set(key, value);
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
    for (const b of new Set(storesOf(v))) {
      const r = (this.refs.get(b) ?? 1) - 1;
      if (r <= 0) { this.refs.delete(b); this.held -= b.byteLength; } else this.refs.set(b, r);
    }
  }
  clear(): void { this.map.clear(); this.refs.clear(); this.held = 0; }
  get size(): number { return this.map.size; }
  /** Bytes of the distinct typed-array stores the cached outputs hold. */
  get bytes(): number { return this.held; }
}

function allFinite(a: Float64Array): boolean {
  for (let i = 0; i < a.length; i++) if (!Number.isFinite(a[i])) return false;
  return true;
}

/**
 * Run `recipe` on `input`. `inputKey` identifies the input data (e.g. the
 * trace id) for caching; `ctx` carries the blank and repeated scans; pass a
 * {@link PipelineCache} to reuse outputs between runs.
 */
export function runPipeline(
  input: Signal, inputKey: string, recipe: Recipe, registry: Registry, ctx: StepContext = {}, cache?: PipelineCache,
  clock: () => number = () => Date.now(),
): PipelineResult {
  const runs: StepRun[] = [];
  const events: SpikeEvent[] = [];
  let current: Signal = input;
  let baseline: Float64Array | undefined;
  const ctxKey = `b:${ctx.blank?.id ?? '-'}|s:${(ctx.scans ?? []).map((s) => s.id).join(',')}`;
  let key = `${inputKey}|${ctxKey}`;
  for (const entry of recipe.steps) {
    if (!entry.enabled) { runs.push({ uid: entry.uid, step: entry.step, status: 'off', cached: false, ms: 0 }); continue; }
    const def = registry.find((d) => d.id === entry.step);
    if (!def) {
      runs.push({ uid: entry.uid, step: entry.step, status: 'error', message: `Unknown step "${entry.step}".`, cached: false, ms: 0 });
      continue;
    }
    let problem: string | null = null;
    if (def.needsEvenSpacing && !isEvenlySpaced(current.x)) {
      problem = `${def.label} assumes evenly spaced x, and these x values are not evenly spaced. Add the step "Resample to even spacing" before it.`;
    }
    if (!problem) {
      try { problem = def.validate(entry.params, current, ctx); } catch (e) { problem = `Could not check the parameters: ${(e as Error).message}`; }
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
        output = def.apply(current, entry.params, ctx);
      } catch (e) {
        runs.push({ uid: entry.uid, step: entry.step, status: 'error', message: `${def.label} failed: ${(e as Error).message}`, cached: false, ms: 0 });
        continue;
      }
      if (output.x.length !== output.y.length || output.y.length < 2 || !allFinite(output.y) || !allFinite(output.x)) {
        runs.push({ uid: entry.uid, step: entry.step, status: 'error', message: `${def.label} produced values that are not finite numbers, so its output was not used.`, cached: false, ms: 0 });
        continue;
      }
      cache?.set(stepKey, output);
    }
    runs.push({ uid: entry.uid, step: entry.step, status: 'ok', output, cached, ms: cached ? 0 : clock() - t0 });
    key = stepKey;
    if (output.events) events.push(...output.events);
    if (output.baseline) baseline = output.baseline;
    else if (baseline && output.x.length !== baseline.length) baseline = undefined;
    current = { x: output.x, y: output.y };
  }
  return { final: current, runs, events, baseline };
}
