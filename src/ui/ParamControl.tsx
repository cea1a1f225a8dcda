import { useEffect, useId, useState } from 'react';
import type { ParamSpec, ParamValue } from '../core/steps/types.ts';
import { checkParam } from '../core/method.ts';
import { useApp } from '../state/store.ts';

interface Props {
  spec: ParamSpec;
  value: ParamValue;
  /** Mean x step of the input (x-units per point) to show windows in x-units. */
  dx: number | null;
  xUnit: string;
  onChange: (v: ParamValue) => void;
}

function fmt(v: number): string {
  if (!Number.isFinite(v)) return String(v);
  const a = Math.abs(v);
  return a !== 0 && (a < 1e-3 || a >= 1e6) ? v.toExponential(3) : String(Number(v.toPrecision(6)));
}

/** Slider with a typed-in value beside it; invalid typing is shown, never applied. */
export function ParamControl({ spec, value, dx, xUnit, onChange }: Props) {
  const id = useId();
  const [text, setText] = useState(String(value));
  const [problem, setProblem] = useState<string | null>(null);
  const marked = useApp((s) => s.markedRange);
  useEffect(() => { setText(Array.isArray(value) ? '' : String(value)); setProblem(null); }, [value]);

  if (spec.kind === 'choice') {
    return (
      <label className="param" htmlFor={id}>
        <span className="param-label">{spec.label}</span>
        <select id={id} value={String(value)} onChange={(e) => onChange(e.target.value)} title={spec.help}>
          {spec.choices.map((c) => <option key={c.value} value={c.value}>{c.label}</option>)}
        </select>
      </label>
    );
  }
  if (spec.kind === 'boolean') {
    return (
      <label className="param param-check" htmlFor={id}>
        <input id={id} type="checkbox" checked={value === true} onChange={(e) => onChange(e.target.checked)} />
        <span className="param-label">{spec.label}</span>
      </label>
    );
  }
  if (spec.kind === 'ranges') {
    const ranges = Array.isArray(value) ? value : [];
    return (
      <div className="param">
        <span className="param-label">{spec.label} ({xUnit || 'x-units'})</span>
        <ul className="ranges">
          {ranges.map((r, i) => (
            <li key={i}>
              {fmt(r[0])} – {fmt(r[1])}
              <button type="button" className="link" aria-label={`Remove range ${fmt(r[0])} to ${fmt(r[1])}`} onClick={() => onChange(ranges.filter((_, j) => j !== i))}>remove</button>
            </li>
          ))}
          {ranges.length === 0 && <li className="muted">No ranges yet.</li>}
        </ul>
        <button type="button" disabled={!marked} onClick={() => marked && onChange([...ranges, [marked[0], marked[1]]])}>
          Add the marked x-range
        </button>
        {!marked && <p className="hint">Switch on “Mark a range” above the plot and drag across a stretch of baseline.</p>}
      </div>
    );
  }
  const num = typeof value === 'number' ? value : Number(value);
  const log = spec.kind === 'number' && spec.log === true;
  const step = spec.kind === 'int' ? (spec.odd ? 2 : spec.step ?? 1) : spec.step ?? (spec.max - spec.min) / 200;
  const sliderMax = spec.kind === 'int' ? Math.min(spec.max, Math.max(num * 4, 101)) : spec.max;
  const toSlider = (v: number) => (log ? Math.log10(v) : v);
  const fromSlider = (v: number) => (log ? Number((10 ** v).toPrecision(3)) : v);
  const commit = (raw: string) => {
    setText(raw);
    const v = Number(raw.replace(',', '.'));
    const bad = raw.trim() === '' ? `${spec.label} needs a value.` : checkParam(spec, v);
    setProblem(bad);
    if (!bad) onChange(v);
  };
  // Issue 17: the width in x always says its unit ("x-units" when the file gave none).
  const xWidth = spec.unit === 'points' && dx ? `${fmt(num * dx)} ${xUnit || 'x-units'}` : null;
  return (
    <div className="param">
      <label className="param-label" htmlFor={id}>{spec.label}{spec.unit !== 'none' ? ` (${spec.unit})` : ''}</label>
      <div className="param-row">
        <input
          type="range"
          aria-label={`${spec.label} slider`}
          min={toSlider(spec.min)}
          max={toSlider(sliderMax)}
          step={log ? 0.05 : step}
          value={toSlider(num)}
          onChange={(e) => {
            let v = fromSlider(Number(e.target.value));
            if (spec.kind === 'int' && spec.odd && v % 2 === 0) v += 1;
            onChange(v);
          }}
        />
        <input
          id={id}
          className="param-number"
          type="text"
          inputMode="decimal"
          value={text}
          aria-invalid={problem ? true : undefined}
          onChange={(e) => setText(e.target.value)}
          onBlur={(e) => commit(e.target.value)}
          onKeyDown={(e) => { if (e.key === 'Enter') commit((e.target as HTMLInputElement).value); }}
        />
      </div>
      {xWidth && <span className="hint">= {xWidth}</span>}
      {spec.help && (
        <details className="param-help">
          <summary>about {spec.label.toLowerCase()}</summary>
          <span className="hint">{spec.help}</span>
        </details>
      )}
      {problem && <span className="field-problem" role="alert">{problem}</span>}
    </div>
  );
}
