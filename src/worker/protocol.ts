/**
 * The one typed contract between the page and the computation worker.
 * Raw traces cross once (`inputs`); after that only recipes and settings.
 * Arrays coming back are transferred, not copied.
 */
import type { Recipe } from '../core/recipe.ts';
import type { LoadOptions, LoadResult } from '../core/io/types.ts';
import type { SpikeEvent } from '../core/steps/types.ts';
import type { Trace } from '../core/trace.ts';
import type { AnalyseRequest, AnalyseResult } from '../core/analyse.ts';

export type { AnalyseRequest, AnalyseResult };

export type ToWorker =
  | { type: 'inputs'; traces: Trace[] }
  | { type: 'analyse'; jobId: number; request: AnalyseRequest }
  | { type: 'load'; jobId: number; bytes: Uint8Array; fileName: string; options?: Omit<LoadOptions, 'onProgress'> };

export type FromWorker =
  | { type: 'result'; jobId: number; result: AnalyseResult }
  | { type: 'loaded'; jobId: number; result: LoadResult }
  | { type: 'progress'; jobId: number; fraction: number }
  | { type: 'failed'; jobId: number; message: string };

export type { Recipe, SpikeEvent };
