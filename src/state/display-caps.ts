/**
 * How much of a long list the page shows at once, in one place. Each cap
 * only limits what is drawn: the full list stays in the store and in every
 * export (the page says so where a list is cut).
 */
export const DISPLAY_CAPS = {
  /** Rows of the peak table (the user's decisions always, then the highest S/N). */
  peakRows: 500,
  /** Rows of the loss ledger (rows that cross a limit first). */
  ledgerRows: 300,
  /** Sentences under the loss ledger. */
  ledgerSentences: 300,
  /** What one step did, listed under it in the stack. */
  stepEvents: 200,
  /** Notices shown at once (newest first). */
  noticesShown: 6,
  /** Notices kept in the store; older ones drop off. */
  noticesKept: 30,
  /** Skipped lines named in a load notice (the load report lists every one). */
  skippedLinesNamed: 8,
} as const;
