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

/** A computation that pauses (yields undefined) now and then and returns T. */
export type Stepwise<T> = Generator<undefined, T, void>;

/** Run a stepwise computation to its end, ignoring the pauses. */
export function drain<T>(steps: Generator<unknown, T, void>): T {
  for (;;) {
    const r = steps.next();
    if (r.done) return r.value;
  }
}
