import { useApp } from '../state/store.ts';
import { addExcludedRange } from '../core/measure/excluded-ranges.ts';
import { num } from './format.ts';

/**
 * Issue 17: ranges left out of peak finding (a solvent front, an injection
 * artefact). The trace is not changed; the ranges are kept with the
 * processing method and drawn shaded on the plot.
 */
export function ExcludedRanges({ xUnit }: { xUnit: string }) {
  const marked = useApp((s) => s.markedRange);
  const excluded = useApp((s) => s.peakSettings.excluded);
  const { setPeakSettings, setMarkedRange } = useApp.getState();
  const list = excluded ?? [];
  const u = xUnit ? ` ${xUnit}` : '';
  return (
    <div className="row small excluded-ranges" data-testid="excluded-ranges">
      <button
        type="button"
        disabled={!marked}
        title={marked ? 'Peaks whose apex lies in the marked range are not listed; the trace itself is not changed.' : 'Mark a range on the plot first.'}
        onClick={() => { if (marked) { setPeakSettings({ excluded: addExcludedRange(list, marked) }); setMarkedRange(null); } }}
      >Leave the marked range out of peak finding</button>
      {list.length > 0 && <span>Left out of peak finding:</span>}
      {list.map(([a, b], i) => (
        <span key={`${a}-${b}`} className="excluded-chip">
          {num(a, 4)} – {num(b, 4)}{u}{' '}
          <button
            type="button"
            className="link"
            aria-label={`Put ${num(a, 4)} – ${num(b, 4)}${u} back into peak finding`}
            onClick={() => { const rest = list.filter((_, k) => k !== i); setPeakSettings({ excluded: rest.length ? rest : undefined }); }}
          >put back</button>
        </span>
      ))}
    </div>
  );
}
