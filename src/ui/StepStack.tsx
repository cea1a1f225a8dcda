import { useMemo, useState } from 'react';
import { STEP_REGISTRY, stepDefinition } from '../core/steps/registry.ts';
import { meanStep } from '../core/numeric/interpolate.ts';
import { useApp } from '../state/store.ts';
import { ParamControl } from './ParamControl.tsx';
import { stepFigureText } from './step-figures.ts';
import { windowVariants } from './alternatives.ts';
import { StepExtras } from './StepExtras.tsx';
import { ScanAlignment } from './steps/ScanAlignment.tsx';
import { DISPLAY_CAPS } from '../state/display-caps.ts';

const NO_RUNS: never[] = [];

/** The user's processing stack: add, reorder (drag or keyboard), switch, remove, edit. */
export function StepStack() {
  const recipe = useApp((s) => s.recipe);
  const runs = useApp((s) => s.result?.runs) ?? NO_RUNS;
  const sample = useApp((s) => s.traces.find((t) => t.id === s.sampleId) ?? null);
  const showUid = useApp((s) => s.showUid);
  const { addStep, removeStep, moveStep, toggleStep, setParam, undo, redo, setShowUid, addAlternatives } = useApp.getState();
  const advice = useApp((s) => s.result?.loss?.advice);
  const canUndo = useApp((s) => s.past.length > 0);
  const canRedo = useApp((s) => s.future.length > 0);
  const [choice, setChoice] = useState(STEP_REGISTRY[0]?.id ?? '');
  const [dragFrom, setDragFrom] = useState<number | null>(null);
  const [announce, setAnnounce] = useState('');
  const dx = useMemo(() => (sample ? meanStep(sample.x) : null), [sample]);

  const move = (from: number, to: number) => {
    if (to < 0 || to >= recipe.steps.length) return;
    moveStep(from, to);
    const def = stepDefinition(recipe.steps[from].step);
    setAnnounce(`${def?.label ?? 'Step'} moved to position ${to + 1} of ${recipe.steps.length}.`);
  };

  return (
    <section className="panel" aria-labelledby="stack-title">
      <div className="panel-head">
        <h2 id="stack-title">Processing</h2>
        <div className="row">
          <button type="button" onClick={undo} disabled={!canUndo} title="Undo (Ctrl+Z)">Undo</button>
          <button type="button" onClick={redo} disabled={!canRedo} title="Redo (Ctrl+Shift+Z)">Redo</button>
        </div>
      </div>
      <div className="row add-step">
        <label htmlFor="add-step-choice" className="sr-only">Step to add</label>
        <select id="add-step-choice" value={choice} onChange={(e) => setChoice(e.target.value)}>
          {STEP_REGISTRY.map((d) => <option key={d.id} value={d.id}>{d.label}</option>)}
        </select>
        <button type="button" className="primary" onClick={() => choice && addStep(choice)} disabled={!choice}>Add step</button>
      </div>
      {recipe.steps.length === 0 && <p className="muted">No steps: the raw trace is used as loaded. Add a step to clean it; each step shows what it changed in the residual below the plot.</p>}
      <ol className="steps">
        {recipe.steps.map((entry, i) => {
          const def = stepDefinition(entry.step);
          const run = runs.find((r) => r.uid === entry.uid);
          if (!def) return <li key={entry.uid} className="step step-error">Unknown step {entry.step}</li>;
          return (
            <li
              key={entry.uid}
              className={`step ${entry.enabled ? '' : 'step-off'} ${dragFrom === i ? 'dragging' : ''}`}
              draggable
              onDragStart={(e) => { setDragFrom(i); e.dataTransfer.effectAllowed = 'move'; }}
              onDragOver={(e) => { e.preventDefault(); }}
              onDrop={(e) => { e.preventDefault(); if (dragFrom !== null) move(dragFrom, i); setDragFrom(null); }}
              onDragEnd={() => setDragFrom(null)}
              data-testid={`step-${entry.step}`}
            >
              <div className="step-head">
                <button
                  type="button"
                  className="grip"
                  aria-label={`Reorder ${def.label}, position ${i + 1} of ${recipe.steps.length}. Use the up and down arrow keys.`}
                  onKeyDown={(e) => {
                    if (e.key === 'ArrowUp') { e.preventDefault(); move(i, i - 1); }
                    if (e.key === 'ArrowDown') { e.preventDefault(); move(i, i + 1); }
                  }}
                >⠿</button>
                <span className="step-num">{i + 1}</span>
                <h3 className="step-title">{def.label}</h3>
                <label className="switch">
                  <input type="checkbox" checked={entry.enabled} onChange={() => toggleStep(entry.uid)} aria-label={`${def.label} on`} />
                  on
                </label>
                <button type="button" className="link" onClick={() => setShowUid(showUid === entry.uid ? null : entry.uid)} aria-pressed={showUid === entry.uid}>
                  {showUid === entry.uid ? 'hide output' : 'show output'}
                </button>
                <button type="button" className="link danger" onClick={() => removeStep(entry.uid)} aria-label={`Remove ${def.label}`}>remove</button>
              </div>
              <p className="step-summary">{def.summary}</p>
              <div className="params">
                {def.params.map((spec) => (
                  <ParamControl key={spec.key} spec={spec} value={entry.params[spec.key]} dx={dx} xUnit={sample?.xUnit ?? ''} onChange={(v) => setParam(entry.uid, spec.key, v)} />
                ))}
              </div>
              {def.params.some((p) => p.key === 'window') && (
                <button type="button" className="link" onClick={() => addAlternatives(windowVariants(recipe, entry.uid))}>compare half and double window</button>
              )}
              {advice?.filter((a) => a.uid === entry.uid && a.advice.warning).map((a) => <p key={a.uid} className="step-problem">{a.advice.warning}</p>)}
              {run?.status === 'error' && <p className="step-problem" role="alert">{run.message}</p>}
              {run?.status === 'ok' && (
                <div className="step-notes">
                  {run.notes.map((n, k) => <p key={k}>{n}</p>)}
                  {run.figures && Object.keys(run.figures).length > 0 && (
                    <p className="figures">{Object.entries(run.figures).map(([k, v]) => stepFigureText(k, v, sample?.yUnit ?? '')).join(' · ')}</p>
                  )}
                  {run.events && run.events.length > 0 && (
                    <details className="events" open={run.events.length <= 5}>
                      <summary>{run.events.length} point{run.events.length === 1 ? '' : 's'} replaced (marked × on the plot)</summary>
                      <table className="data" data-testid="spike-events">
                        <thead><tr><th scope="col">x</th><th scope="col">was</th><th scope="col">now</th></tr></thead>
                        <tbody>
                          {run.events.slice(0, DISPLAY_CAPS.stepEvents).map((ev) => (
                            <tr key={ev.index}><td>{Number(ev.x.toPrecision(6))}</td><td>{Number(ev.original.toPrecision(5))}</td><td>{Number(ev.replacement.toPrecision(5))}</td></tr>
                          ))}
                        </tbody>
                      </table>
                      {run.events.length > DISPLAY_CAPS.stepEvents && <p className="small">First {DISPLAY_CAPS.stepEvents} of {run.events.length}; all are in the exports.</p>}
                    </details>
                  )}
                  {run.extra?.scanCorrelation && run.extra.scanShift && (
                    <ScanAlignment shifts={run.extra.scanShift} correlations={run.extra.scanCorrelation} minCorrelation={Number(entry.params.minCorrelation ?? 0.8)} dx={dx} xUnit={sample?.xUnit ?? ''} />
                  )}
                  {run.extra && Object.keys(run.extra).length > 0 && <StepExtras extra={run.extra} x={sample && run.points === sample.x.length ? sample.x : null} xUnit={sample?.xUnit ?? ''} />}
                  <p className="muted small">{run.points} points out{run.cached ? ' (from cache)' : ` in ${run.ms} ms`}</p>
                </div>
              )}
            </li>
          );
        })}
      </ol>
      <p className="sr-only" aria-live="polite">{announce}</p>
    </section>
  );
}
