/**
 * Pauses inside a long stage (issue 16). A worker runs one task at a time:
 * a newer request can only be seen when the running code hands control back.
 * Long loops (peak detection measures every candidate, 0.3–1.5 s at 10⁶
 * points) are therefore written as generators that yield `undefined` every
 * few milliseconds of work; the staged analysis passes those pauses on
 * (`analyseSteps`), and the worker's stager lets queued messages in there
 * and stops the job when a newer request came. Code that wants the answer
 * at once drains the generator.
 */

import type { CandidateShare, SharedJob } from '../measure/peak-table.ts';

/** Work offered to another thread (peak detection's later candidates, peak-table.ts). */
export interface ShareOffer {
  readonly share: CandidateShare;
}

/**
 * What a stepwise computation yields: `undefined` for a pause; an offer of
 * work another thread could do, which the consumer answers (the value it
 * passes to `next`) with the job it started, or with undefined; or a promise
 * when it waits for such a job. `drain` answers nothing and never waits, so
 * the computation does all the work itself, with the same result.
 */
export type Pause = undefined | ShareOffer | Promise<void>;

/** A computation that pauses now and then and returns T; `next` may answer an offer with a job. */
export type Stepwise<T> = Generator<Pause, T, SharedJob | undefined>;

/** True for an offer of work (not a pause, a promise or a stage's update). */
export function isShareOffer(v: unknown): v is ShareOffer {
  return typeof v === 'object' && v !== null && 'share' in v;
}

/** Run a stepwise computation to its end, ignoring the pauses (and never waiting for another thread). */
export function drain<T>(steps: Generator<unknown, T, SharedJob | undefined>): T {
  for (;;) {
    const r = steps.next();
    if (r.done) return r.value;
  }
}
