import { useState } from 'react';
import type { Trace } from '../core/trace.ts';
import { useApp } from '../state/store.ts';

/**
 * Issue 17: name the axes of the trace shown and give their units, for a
 * file whose header gave none or gave them wrongly. Only the words change;
 * the numbers stay as loaded. Every table, readout and export of this
 * trace then uses the new names.
 */
export function AxisNames({ trace, onClose }: { trace: Trace; onClose: () => void }) {
  const [v, setV] = useState({ xName: trace.xName, xUnit: trace.xUnit, yName: trace.yName, yUnit: trace.yUnit });
  const field = (key: keyof typeof v, label: string) => (
    <label className="axis-field">
      <span>{label}</span>
      <input type="text" value={v[key]} onChange={(e) => setV({ ...v, [key]: e.target.value })} data-testid={`axis-${key}`} maxLength={80} />
    </label>
  );
  const trimmed = { xName: v.xName.trim() || 'x', xUnit: v.xUnit.trim(), yName: v.yName.trim() || 'y', yUnit: v.yUnit.trim() };
  return (
    <form
      className="axis-names"
      aria-label={`Axis names and units of ${trace.name}`}
      onSubmit={(e) => {
        e.preventDefault();
        useApp.getState().setAxisNames(trace.id, trimmed);
        useApp.getState().notify('info', `Axes of ${trace.name} renamed`, [`x: ${trimmed.xName}${trimmed.xUnit ? ` (${trimmed.xUnit})` : ', no unit'}; y: ${trimmed.yName}${trimmed.yUnit ? ` (${trimmed.yUnit})` : ', no unit'}. Only the words changed; the numbers are as loaded. Exports from now on carry these names.`]);
        onClose();
      }}
    >
      {field('xName', 'x name')}
      {field('xUnit', 'x unit')}
      {field('yName', 'y name')}
      {field('yUnit', 'y unit')}
      <button type="submit" className="primary">Apply</button>
      <button type="button" onClick={onClose}>Cancel</button>
    </form>
  );
}
