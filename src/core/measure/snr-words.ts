/**
 * The one wording of S/N definitions and peak flags, for the page and every
 * export alike. S/N = H/σ and the detection (3) and quantitation (10) limits
 * follow ICH Q2(R1) (2005), section 6; 2H/h is the pharmacopoeial signal-to-
 * noise ratio (Ph. Eur. 2.2.46, USP <621>).
 */
import type { PeakFlag, SnrDefinition } from './peak-types.ts';

/** The words for each S/N definition, as the exports and the report state them. */
export const SNR_DEFINITION_WORDS: Record<SnrDefinition, string> = {
  rms: 'S/N = H/σ: the peak height above its local baseline divided by the standard deviation σ of the noise.',
  pharmacopoeial: 'S/N = 2H/h: twice the peak height divided by the range h (largest minus smallest value) of the noise in a window around the peak (the pharmacopoeial definition).',
  region: 'S/N = mean/SD of the samples between the peak’s start and end.',
};

/** Short label for each S/N definition (column heads, the settings' choices). */
export const SNR_SHORT: Record<SnrDefinition, string> = { rms: 'H/σ', pharmacopoeial: '2H/h', region: 'mean/SD' };

/** What each flag means (the page's table and loss ledger, the exports). */
export const FLAG_TEXT: Record<PeakFlag, string> = {
  'below-detection': 'below detection limit',
  detectable: 'detected, not quantifiable',
  quantifiable: 'quantifiable',
  'not-measured': 'S/N not measured',
};

/** A short name with what it means, for the page's choice of S/N definition and the table's note. */
export const SNR_NAME: Record<SnrDefinition, string> = {
  rms: `${SNR_SHORT.rms} (height over RMS noise)`,
  pharmacopoeial: `${SNR_SHORT.pharmacopoeial} (height over noise range, pharmacopoeial)`,
  region: `${SNR_SHORT.region} of the peak region`,
};
