import { useApp } from '../../state/store.ts';

const NO_TRACES: never[] = [];

interface Props {
  /** Per scan, in the order the analysis received them (ensemble-average's extra). */
  shifts: Float64Array;
  correlations: Float64Array;
  /** The level below which a scan is named (the step's parameter). */
  minCorrelation: number;
  /** x-units per point of the sample, for the shift in x. */
  dx: number | null;
  xUnit: string;
}

/**
 * Issue 20: each repeated scan's shift and correlation with the signal, as
 * the averaging step measured them, with one click to leave a scan out (it
 * is set aside in the list of traces; mark it as a repeated scan again to
 * bring it back).
 */
export function ScanAlignment({ shifts, correlations, minCorrelation, dx, xUnit }: Props) {
  const traces = useApp((s) => s.traces) ?? NO_TRACES;
  const roles = useApp((s) => s.roles);
  const { setRole } = useApp.getState();
  // The same order the service layer (state/service.ts) sends (traces in load order with the role "scan").
  const scans = traces.filter((t) => roles[t.id] === 'scan');
  if (scans.length !== correlations.length) return null;
  const fmt = (v: number, d: number) => (Number.isFinite(v) ? v.toFixed(d) : '—');
  return (
    <div className="scan-alignment-wrap">
      <table className="data small scan-alignment" data-testid="scan-alignment">
        <caption>Repeated scans against the signal</caption>
        <thead>
          <tr>
            <th scope="col">scan</th>
            <th scope="col">shift: points{xUnit ? ` (${xUnit})` : ' (x)'}</th>
            <th scope="col">r</th>
            <th scope="col"><span className="sr-only">action</span></th>
          </tr>
        </thead>
        <tbody>
          {scans.map((t, k) => {
            const poor = !(correlations[k] >= minCorrelation);
            return (
              <tr key={t.id} className={poor ? 'warn-text' : undefined}>
                <th scope="row">{t.name}</th>
                <td>{fmt(shifts[k], 2)}{dx !== null && Number.isFinite(shifts[k]) ? ` (${Number((shifts[k] * dx).toPrecision(2))})` : ''}</td>
                <td>{fmt(correlations[k], 3)}{poor ? ` below ${minCorrelation}` : ''}</td>
                <td>
                  <button type="button" className="link" onClick={() => setRole(t.id, 'ignore')} aria-label={`Leave out the scan ${t.name}`} title="Set this trace aside; mark it as a repeated scan again to bring it back">leave out</button>
                </td>
              </tr>
            );
          })}
        </tbody>
      </table>
    </div>
  );
}
