/**
 * The worker's side of the bridge, written as a plain object so it can run
 * in-process where no Worker exists (Node tests, very old browsers).
 */
import { analyse, type AnalyseRequest, type AnalyseResult } from '../core/analyse.ts';
import { loadFileHashed } from '../core/io/load.ts';
import type { LoadOptions, LoadResult } from '../core/io/types.ts';
import { PipelineCache } from '../core/pipeline.ts';
import { STEP_REGISTRY } from '../core/steps/registry.ts';
import type { Trace } from '../core/trace.ts';

export class Engine {
  private traces = new Map<string, Trace>();
  private cache = new PipelineCache(96);

  setInputs(traces: Trace[]): void {
    this.traces = new Map(traces.map((t) => [t.id, t]));
    this.cache.clear();
  }

  analyse(request: AnalyseRequest): AnalyseResult {
    return analyse(request, this.traces, STEP_REGISTRY, this.cache);
  }

  /** Load a file; the SHA-256 is made by the platform's native digest where there is one (same hex as the pure one). */
  load(bytes: Uint8Array, fileName: string, options: LoadOptions | undefined, onProgress: (f: number) => void): Promise<LoadResult> {
    return loadFileHashed(bytes, fileName, { ...(options ?? {}), onProgress });
  }
}

/** Every typed array buffer in a result, for zero-copy transfer. */
export function transferablesOf(value: unknown, out: Set<ArrayBuffer> = new Set(), depth = 0): ArrayBuffer[] {
  if (depth > 6 || value === null || typeof value !== 'object') return [...out];
  if (ArrayBuffer.isView(value)) {
    if (value.buffer instanceof ArrayBuffer) out.add(value.buffer);
    return [...out];
  }
  for (const v of Object.values(value as Record<string, unknown>)) transferablesOf(v, out, depth + 1);
  return [...out];
}
