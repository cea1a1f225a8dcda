import { useEffect, useMemo, useState } from 'react';
import { useShallow } from 'zustand/react/shallow';
import { useApp } from '../state/store.ts';
import { decimateMinMax } from '../core/numeric/decimate.ts';
import { meanStep } from '../core/numeric/interpolate.ts';
import type { Signal } from '../core/steps/types.ts';
import { againstRaw, columnVerdict, focusWindow, rowAt, sharedYRange, type Verdict } from './focus.ts';
import { num } from './format.ts';
import { farOf } from '../worker/bridge.ts';
import { getBackend } from '../state/service.ts';
import { withCurrent } from '../state/selectors.ts';

const W = 220, H = 120, PAD = 6;

/** Verdict words as shown; the CSS class keys on the same word. */
const VERDICT_CLASS: Record<Verdict, string> = {
  reference: 'v-raw', kept: 'v-kept', weakened: 'v-weakened', lost: 'v-lost', 'appears only after processing': 'v-born', 'not found': 'v-lost',
};

function pctText(v: number | null): string {
  if (v === null) return '';
  return ` (${v > 0 ? '+' : ''}${v.toFixed(Math.abs(v) < 10 ? 1 : 0)} %)`;
}

/** One small plot: the stretch of one column's trace, on the shared y scale, with the matched apex marked. */
function Small({ signal, from, to, y, apex, label }: { signal: Signal; from: number; to: number; y: [number, number]; apex: number | null; label: string }) {
  const d = decimateMinMax(signal.x as Float64Array, signal.y as Float64Array, from, to, 110);
  const px = (v: number) => PAD + ((v - from) / (to - from)) * (W - 2 * PAD);
  const py = (v: number) => H - PAD - ((v - y[0]) / (y[1] - y[0])) * (H - 2 * PAD);
  let path = '';
  for (let i = 0; i < d.x.length; i++) path += `${i ? 'L' : 'M'}${px(d.x[i]).toFixed(1)},${py(d.y[i]).toFixed(1)}`;
  return (
    <svg width={W} height={H} viewBox={`0 0 ${W} ${H}`} role="img" aria-label={label} className="focus-svg">
      <rect x={0.5} y={0.5} width={W - 1} height={H - 1} className="focus-frame" />
      <path d={path} className="focus-line" />
      {apex !== null && <line x1={px(apex)} x2={px(apex)} y1={PAD} y2={H - PAD} className="focus-apex" />}
    </svg>
  );
}

/**
 * Issue 17: the feature the user clicked (a bump on the plot, a peak-table or
 * ledger row) under the raw trace, the current stack and each alternative,
 * side by side on one y scale, each with S/N, height and area against raw and
 * a one-word verdict.
 */
export function FocusedFeature() {
  const x0 = useApp((s) => s.selectedPeakX);
  const sample = useApp((s) => s.traces.find((t) => t.id === s.sampleId) ?? null);
  const res = useApp(useShallow((s) => (withCurrent(s, (r) => ({ processed: r.processed, loss: r.loss })))));
  const noiseRowsOn = useApp((s) => s.ledgerNoiseLevel);
  const { selectPeak, setLedgerNoiseLevel } = useApp.getState();

  const view = useMemo(() => {
    if (x0 === null || !sample || !res?.loss) return null;
    const loss = res.loss;
    const row = rowAt(loss.ledger.rows, x0);
    if (!row) return { row: null } as const;
    const dx = meanStep(sample.x);
    const [from, to] = focusWindow(row, dx);
    const signals: (Signal | null)[] = loss.ledger.alternatives.map((a, k) => {
      if (k === 0) return sample;
      if (k === 1) return res.processed;
      return loss.outcomes.find((o) => o.id === a.id)?.processed ?? null;
    });
    return { row, from, to, signals, labels: loss.ledger.alternatives.map((a) => a.label) } as const;
  }, [x0, sample, res]);
  // Long series stay in the worker (worker/series.ts): the stretch shown is asked for there, exactly.
  const [stretches, setStretches] = useState<{ of: unknown; got: ReadonlyMap<Signal, Signal> } | null>(null);
  useEffect(() => {
    if (!view?.row) return;
    const far = view.signals.filter((s): s is Signal => s !== null && farOf(s) !== undefined);
    if (!far.length) return;
    let stale = false;
    getBackend().slice(far.map((s) => farOf(s)!.ref), view.from, view.to).then((got) => {
      if (!stale) setStretches({ of: view, got: new Map(far.map((s, i) => [s, got[i]])) });
    }, () => undefined /* a result let go meanwhile: the newer one asks again */);
    return () => { stale = true; };
  }, [view]);
  const shownSignals = useMemo(() => {
    if (!view?.row) return null;
    const got = stretches?.of === view ? stretches.got : null;
    const signals = view.signals.map((s) => (s && farOf(s) ? got?.get(s) ?? null : s));
    return { signals, y: sharedYRange(signals.filter((s): s is Signal => s !== null), view.from, view.to) };
  }, [view, stretches]);

  if (x0 === null || !sample) return null;
  const xu = sample.xUnit ? ` ${sample.xUnit}` : '';
  const yu = sample.yUnit ? ` ${sample.yUnit}` : '';
  const au = sample.yUnit || sample.xUnit ? ` ${sample.yUnit || 'y-units'}·${sample.xUnit || 'x-units'}` : '';
  const close = <button type="button" className="link" onClick={() => selectPeak(null)}>close</button>;
  if (!res?.loss) {
    return (
      <section className="focus" aria-label="The selected feature under each processing choice" data-testid="focus-view">
        <p className="small muted">Selected: the feature at {num(x0, 5)}{xu}. Add a step or an alternative (under “What each choice keeps”) to see it under each choice side by side. {close}</p>
      </section>
    );
  }
  if (!view || !view.row) {
    return (
      <section className="focus" aria-label="The selected feature under each processing choice" data-testid="focus-view">
        <p className="small muted">
          The feature at {num(x0, 5)}{xu} is not in the comparison: it is below the detection limit in every column.
          {!noiseRowsOn && <> <button type="button" className="link" onClick={() => setLedgerNoiseLevel(true)}>List noise-level features too</button></>} {close}
        </p>
      </section>
    );
  }
  const { row, from, to, labels } = view;
  const { signals, y } = shownSignals ?? { signals: view.signals.map(() => null), y: null };
  const raw = row.cells[0];
  return (
    <section className="focus" aria-labelledby="focus-title" data-testid="focus-view" data-position={row.position}>
      <div className="panel-head">
        <h3 id="focus-title">The feature at {num(row.position, 5)}{xu} under each choice</h3>
        {close}
      </div>
      <p className="small muted">
        {num(from, 4)} – {num(to, 4)}{xu} (4 half-height widths either side), one y scale for all{y ? `: ${num(y[0], 3)} to ${num(y[1], 3)}${yu}` : ''}. The line marks where the feature’s apex was found in that column.
        Height and area in brackets: change against the raw trace. Weakened: a limit crossed downwards, or less than 80 % of the raw height kept.
      </p>
      <div className="focus-row">
        {row.cells.map((c, k) => {
          const v = columnVerdict(row, k);
          const sig = signals[k];
          return (
            <figure key={k} className="focus-card" data-testid={`focus-card-${k}`} data-verdict={v}>
              <figcaption>
                <span className="focus-label">{k === 0 ? 'raw trace' : labels[k]}</span>
                <span className={`verdict-word ${VERDICT_CLASS[v]}`} data-testid="focus-verdict">{v}</span>
              </figcaption>
              {sig && y ? <Small signal={sig} from={from} to={to} y={y} apex={c.x} label={`${k === 0 ? 'raw trace' : labels[k]} from ${num(from, 4)} to ${num(to, 4)}${xu}`} /> : <p className="small muted">not drawn</p>}
              <dl className="focus-figures small">
                <dt>S/N</dt><dd>{c.found ? num(c.snr, 3) : '—'}</dd>
                <dt>height</dt><dd>{c.found ? `${num(c.height)}${yu}${k > 0 ? pctText(againstRaw(raw.height, c.height)) : ''}` : '—'}</dd>
                <dt>area</dt><dd>{c.found ? `${num(c.area)}${au}${k > 0 ? pctText(againstRaw(raw.area, c.area)) : ''}` : '—'}</dd>
              </dl>
            </figure>
          );
        })}
      </div>
    </section>
  );
}
