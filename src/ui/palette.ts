/**
 * Colours from the Okabe–Ito palette (Okabe & Ito 2002, "Color Universal
 * Design"), chosen to stay distinguishable for the common colour-vision
 * deficiencies. Lines also differ in width and dash, never colour alone.
 */
export const COLOURS = {
  raw: '#8c8c8c',
  processed: '#0072B2',
  residual: '#D55E00',
  baseline: '#E69F00',
  spike: '#CC79A7',
  peak: '#009E73',
  intermediate: '#56B4E9',
  ink: '#1d232b',
  grid: '#e4e7eb',
  /** Rings on features some choice loses: the residual's vermillion, as open rings on the trace panel (the residual is a line on its own panel). */
  lost: '#D55E00',
} as const;

/** Alternatives (loss check) get these in order. */
export const ALTERNATIVE_COLOURS = ['#0072B2', '#D55E00', '#009E73', '#CC79A7', '#E69F00', '#56B4E9'] as const;
