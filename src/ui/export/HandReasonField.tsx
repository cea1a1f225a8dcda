import { useApp } from '../../state/store.ts';
import type { HandChangeKind } from '../../core/export/report-fields.ts';

const ASK: Record<HandChangeKind, string> = {
  added: 'Why add a peak at',
  removed: 'Why remove the peak at',
  bounds: 'Why move the start or end of the peak at',
};

/**
 * Issue 17: after a hand change (a peak added or removed, a start or end
 * dragged), a small inline field under the plot asks for a short reason.
 * It blocks nothing: the change is already made, and the reason can be
 * left empty or written later in the export panel's list of hand changes.
 */
export function HandReasonField() {
  const change = useApp((s) => s.lastHandChange);
  const unit = useApp((s) => s.traces.find((t) => t.id === s.sampleId)?.xUnit ?? '');
  const reason = useApp((s) => (s.lastHandChange ? s.handReasons.find((r) => r.kind === s.lastHandChange!.kind && r.x === s.lastHandChange!.x)?.reason ?? '' : ''));
  if (!change) return null;
  const { setHandReason, setLastHandChange } = useApp.getState();
  const where = `${Number(change.x.toPrecision(6))}${unit ? ` ${unit}` : ''}`;
  return (
    <form className="row small hand-reason" data-testid="hand-reason" onSubmit={(e) => { e.preventDefault(); setLastHandChange(null); }}>
      <label>{ASK[change.kind]} {where}?{' '}
        <input type="text" value={reason} maxLength={200} size={40} placeholder="a short reason, kept in every export" autoFocus
          data-testid="hand-reason-input" onChange={(e) => setHandReason(change.kind, change.x, e.target.value)} />
      </label>
      <button type="submit">{reason.trim() ? 'Keep this reason' : 'Later'}</button>
    </form>
  );
}
