/**
 * Issue 17: the figures a step reports, in plain words with their units,
 * instead of the names they carry in the code ("noiseGain 0.5774").
 * A figure not listed here is shown with its name split into words, so a
 * new step's figure is never hidden.
 */
type Unit = 'y' | 'points' | 'ratio' | 'count' | 'none';

const WORDS: Record<string, { words: string; unit: Unit }> = {
  noiseGain: { words: 'white noise kept (SD out ÷ SD in)', unit: 'ratio' },
  points: { words: 'points in the marked ranges', unit: 'points' },
  iterations: { words: 'iterations', unit: 'count' },
  pointsIn: { words: 'points in', unit: 'points' },
  pointsOut: { words: 'points out', unit: 'points' },
  pointsDropped: { words: 'points left over at the end', unit: 'points' },
  n: { words: 'traces averaged', unit: 'count' },
  expectedGain: { words: 'noise fall expected (√n)', unit: 'ratio' },
  measuredGain: { words: 'noise fall measured', unit: 'ratio' },
  noiseBefore: { words: 'noise before (from point-to-point differences)', unit: 'y' },
  noiseAfter: { words: 'noise after', unit: 'y' },
  varianceKeptRatio: { words: 'share of the variance kept', unit: 'ratio' },
  pointsLine: { words: 'points fitted with a straight line', unit: 'points' },
  pointsQuadratic: { words: 'points fitted with a quadratic', unit: 'points' },
};

function fallbackWords(key: string): string {
  return key.replace(/([a-z0-9])([A-Z])/g, '$1 $2').toLowerCase();
}

/** One step figure as a chemist reads it, e.g. "white noise kept (SD out ÷ SD in) 0.5774". */
export function stepFigureText(key: string, value: number, yUnit: string): string {
  const w = WORDS[key] ?? { words: fallbackWords(key), unit: 'none' as Unit };
  const v = Number.isFinite(value) ? String(Number(value.toPrecision(4))) : String(value);
  const unit = w.unit === 'y' ? ` ${yUnit || 'y-units'}` : '';
  return `${w.words} ${v}${unit}`;
}
