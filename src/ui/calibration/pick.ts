/**
 * Issue 21: a click on the plot while naming: the nearest live peak of the
 * sample's table becomes a named peak (expected position its apex, window
 * its FWHM), called "Peak n" until the user renames it.
 */
import { namedPeakFromPeak } from '../../core/calibration/named-peaks.ts';
import { useApp } from '../../state/store.ts';
import { currentResult } from '../../state/selectors.ts';

export function pickNamedPeakAt(x: number): void {
  const s = useApp.getState();
  const result = currentResult(s);
  const sample = s.traces.find((t) => t.id === s.sampleId);
  const live = result?.peaks.filter((p) => !p.removedByUser && p.height > 0) ?? [];
  if (!live.length) { s.notify('warning', 'No peak to name here', ['The sample has no measured peak; adjust the peak settings first.']); return; }
  const peak = live.reduce((b, p) => (Math.abs(p.x - x) < Math.abs(b.x - x) ? p : b), live[0]);
  if (s.namedPeaks.peaks.some((n) => Math.abs(n.position - peak.x) <= n.window)) {
    s.notify('info', `The peak at ${peak.x.toPrecision(5)} already lies in a named peak's window`, ['Change that named peak in the table instead.']);
    return;
  }
  let k = s.namedPeaks.peaks.length + 1;
  while (s.namedPeaks.peaks.some((n) => n.name.toLowerCase() === `peak ${k}`)) k++;
  if (s.namedPeaks.peaks.length === 0 && sample) s.setNamedPeaks({ ...s.namedPeaks, xUnit: sample.xUnit });
  useApp.getState().addNamedPeak(namedPeakFromPeak(`Peak ${k}`, peak));
}
