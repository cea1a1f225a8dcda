import { useShallow } from 'zustand/react/shallow';
import { useApp } from '../state/store.ts';
import { withCurrent } from '../state/selectors.ts';

const VERDICT_CLASS = { 'nothing-removed': 'ok', clean: 'ok', caution: 'warn', structure: 'bad' } as const;

/** What the processing removed, and whether it looks like noise (one verdict with the loss check). */
export function ResidualPanel() {
  const result = useApp(useShallow((s) => (withCurrent(s, (r) => ({ diagnostics: r.diagnostics, residualNote: r.residualNote })))));
  // The verdict is one with the loss check: until that lands it may still be held back from 'clean'.
  const waiting = useApp((s) => (s.pending.includes('residual') ? 'residual' : s.pending.includes('loss') ? 'loss' : null));
  if (!result) return null;
  const d = result.diagnostics;
  return (
    <section className="panel residual" aria-labelledby="residual-title" data-testid="residual-panel">
      <h2 id="residual-title">What the processing removed</h2>
      {result.residualNote && <p className="muted">{result.residualNote}</p>}
      {d ? (
        <>
          <p className={`verdict ${waiting ? 'provisional' : VERDICT_CLASS[d.level]}`} data-testid="residual-verdict" data-level={d.level} data-provisional={waiting ? 'true' : undefined}>
            {waiting && <strong>Provisional: </strong>}{d.verdict}
            {waiting === 'loss' && <> (the loss check is still running; it may hold this verdict back)</>}
            {waiting === 'residual' && <> (from before the latest change)</>}
          </p>
          <dl className="figures-grid">
            <dt>RMS of the residual</dt><dd>{d.rms.toPrecision(4)}</dd>
            <dt>Lag-1 autocorrelation</dt><dd>{d.lag1.toFixed(3)} (white noise stays within ±{d.lag1Threshold.toFixed(3)})</dd>
            <dt>Runs about the median</dt><dd>{d.runs.runs} (expected {d.runs.expected.toFixed(1)}, z = {d.runs.z.toFixed(2)}, p = {d.runs.p.toPrecision(2)})</dd>
          </dl>
        </>
      ) : <p className="muted">No processing yet, so nothing was removed.</p>}
    </section>
  );
}
