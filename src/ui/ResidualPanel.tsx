import { useApp } from '../state/store.ts';

const VERDICT_CLASS = { 'nothing-removed': 'ok', clean: 'ok', caution: 'warn', structure: 'bad' } as const;

/** What the processing removed, and whether it looks like noise (one verdict with the loss check). */
export function ResidualPanel() {
  const result = useApp((s) => (s.result && s.result.sampleId === s.sampleId ? s.result : null));
  if (!result) return null;
  const d = result.diagnostics;
  return (
    <section className="panel residual" aria-labelledby="residual-title" data-testid="residual-panel">
      <h2 id="residual-title">What the processing removed</h2>
      {result.residualNote && <p className="muted">{result.residualNote}</p>}
      {d ? (
        <>
          <p className={`verdict ${VERDICT_CLASS[d.level]}`} data-testid="residual-verdict" data-level={d.level}>{d.verdict}</p>
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
