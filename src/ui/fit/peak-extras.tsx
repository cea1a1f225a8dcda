/**
 * The peak table's optional columns (issue 18): the figures of chromatography
 * (formula in each header's tooltip; "not measurable" with the reason on
 * hover) and, for rows inside a fitted region, the fitted area beside the
 * table's drop-line area. Kept here so PeakTable.tsx changes by a few lines.
 */
import { useMemo, type ReactNode } from 'react';
import { useShallow } from 'zustand/react/shallow';
import type { AnalyseResult } from '../../core/analysis/index.ts';
import { FIGURE_FORMULAS } from '../../core/measure/figures.ts';
import { dropLineWords, FIGURE_HEADERS, figureColumnsFor, fittedPeakFor, peakFigures } from '../../core/export/fit-export.ts';
import type { Peak } from '../../core/measure/peak-types.ts';
import { useApp } from '../../state/store.ts';
import { num } from '../format.ts';
import { useExactSignal } from '../plot-exact.ts';
import { currentResult } from '../../state/selectors.ts';

export interface PeakExtras {
  headers: { key: string; label: string; title: string }[];
  cells: (p: Peak, index: number) => ReactNode[];
}

/** Headers and cells of the optional columns for the current result. */
export function usePeakExtras(): PeakExtras {
  // Only the fields the columns read: a stage that leaves them alone keeps the same columns, so the table's rows do not re-render (issue 16).
  const result = useApp(useShallow((s) => { const r = currentResult(s); return r ? { peaks: r.peaks, processed: r.processed, peakOptions: r.peakOptions } : null; }));
  const sample = useApp((s) => s.traces.find((t) => t.id === s.sampleId) ?? null);
  const measureOn = useApp((s) => s.peakSettings.measureOn);
  const showFigures = useApp((s) => s.showFigures);
  const deadTime = useApp((s) => s.deadTime);
  const allFits = useApp((s) => s.fits);
  // The figures are measured on the exact processed trace (fetched from the worker when it stayed there).
  const processed = useExactSignal(result?.processed ?? null, showFigures && measureOn !== 'raw');
  return useMemo(() => {
    const headers: PeakExtras['headers'] = [];
    const parts: ((p: Peak, i: number) => ReactNode[])[] = [];
    if (!result || !sample) return { headers, cells: () => [] };
    const fits = allFits.filter((f) => f.sampleId === sample.id);
    if (fits.length) {
      headers.push({ key: 'fitted-area', label: 'Fitted area ± SE', title: `Area of the fitted peak whose apex lies within this row's half-height crossings (region fit, fit panel); the Area column is the drop-line area (${dropLineWords(result as AnalyseResult)}).` });
      parts.push((p) => {
        const hit = fittedPeakFor(p, fits);
        if (!hit) return [<span className="muted" key="f">not fitted</span>];
        const a = hit.fit.result.fit.peaks[hit.peakNumber - 1].area;
        return [<span key="f" title={`fit ${hit.fitNumber}, peak ${hit.peakNumber} of ${hit.fit.result.count} on the ${hit.fit.result.fittedLabel} trace`}>{num(a.value)} ± {Number.isFinite(a.se) ? num(a.se, 2) : 'n/a'}</span>];
      });
    }
    const measured = measureOn === 'raw' ? { x: sample.x, y: sample.y } : processed;
    if (showFigures && measured) {
      const names = figureColumnsFor(deadTime);
      const figs = peakFigures(measured, result.peaks, deadTime);
      for (const n of names) headers.push({ key: n, label: FIGURE_HEADERS[n], title: FIGURE_FORMULAS[n].formula });
      parts.push((_p, i) => names.map((n) => {
        const v = figs.get(i)?.[n];
        if (!v) return <span key={n} className="muted">—</span>;
        if (v.status === 'ok' && v.value !== null) return <span key={n}>{num(v.value, n === 'plates' ? 5 : 4)}</span>;
        return <span key={n} className="muted" title={v.reason}>{v.status === 'not-measurable' ? 'not measurable' : 'n/a'}</span>;
      }));
    }
    return { headers, cells: (p: Peak, i: number) => parts.flatMap((f) => f(p, i)) };
  }, [result, sample, measureOn, showFigures, deadTime, allFits, processed]);
}

/** The switch for the figure columns and the dead time field. */
export function FigureControls() {
  const showFigures = useApp((s) => s.showFigures);
  const deadTime = useApp((s) => s.deadTime);
  const xUnit = useApp((s) => s.traces.find((t) => t.id === s.sampleId)?.xUnit ?? '');
  const { setShowFigures, setDeadTime } = useApp.getState();
  return (
    <>
      <label className="switch" title="Retention time, tailing factor (5 %), asymmetry factor (10 %), plate number, resolution; with a dead time also retention factor and selectivity. Hover a header for its formula.">
        <input type="checkbox" checked={showFigures} data-testid="show-figures" onChange={(e) => setShowFigures(e.target.checked)} /> chromatography figures
      </label>
      {showFigures && (
        <label>dead time t_M{xUnit ? ` (${xUnit})` : ''}{' '}
          <input type="number" min={0} step="any" style={{ width: '6em' }} data-testid="dead-time" value={deadTime ?? ''}
            onChange={(e) => { const v = Number(e.target.value); setDeadTime(e.target.value === '' || !(v > 0) ? null : v); }} />
        </label>
      )}
    </>
  );
}
