import { sigmaProvisional, type NoiseMethod, type PeakSettings } from '../core/analysis/index.ts';
import { useApp } from '../state/store.ts';
import { num } from './format.ts';
import { SNR_NAME } from '../core/measure/snr-words.ts';
import { profileRange, type SigmaProfile } from '../core/measure/noise-profile.ts';
import { currentResult } from '../state/selectors.ts';

/** The σ range along the trace, or null when σ is the same everywhere. */
function profileSpan(p: SigmaProfile): [number, number] | null {
  const [lo, hi] = profileRange(p);
  return hi > lo * 1.001 ? [lo, hi] : null;
}

function NumberField({ label, value, min, max, step, unit, onChange }: { label: string; value: number; min: number; max: number; step: number; unit?: string; onChange: (v: number) => void }) {
  const id = `nf-${label.replace(/\W+/g, '-')}`;
  return (
    <label className="param" htmlFor={id}>
      <span className="param-label">{label}{unit ? ` (${unit})` : ''}</span>
      <input id={id} type="number" className="param-number" value={value} min={min} max={max} step={step}
        onChange={(e) => { const v = Number(e.target.value); if (Number.isFinite(v) && v >= min && v <= max) onChange(v); }} />
    </label>
  );
}

/** Noise method, quiet range and peak thresholds. */
export function NoisePanel() {
  const noise = useApp((s) => (currentResult(s)?.noise ?? null));
  // Issue 14: σ (so every S/N) is provisional until the noise stage of the newest request lands.
  const sigmaWaiting = useApp((s) => sigmaProvisional(s.pending, currentResult(s)?.noise ?? null));
  const settings = useApp((s) => s.noiseSettings);
  const ps = useApp((s) => s.peakSettings);
  const marked = useApp((s) => s.markedRange);
  const hasBlank = useApp((s) => Object.values(s.roles).includes('blank'));
  const sample = useApp((s) => s.traces.find((t) => t.id === s.sampleId) ?? null);
  const { setNoiseSettings, setPeakSettings } = useApp.getState();
  const set = (p: Partial<PeakSettings>) => setPeakSettings(p);
  const xu = sample?.xUnit ?? '';
  const range = noise ? profileSpan(noise.profile) : null;
  return (
    <section className="panel" aria-labelledby="noise-title" data-testid="noise-panel">
      <h2 id="noise-title">Noise and peak finding</h2>
      <div className="noise-grid">
        <div>
          <label className="param" htmlFor="noise-method">
            <span className="param-label">Noise σ for S/N</span>
            <select id="noise-method" value={settings.method === 'rms' || settings.method === 'blank' ? settings.method : 'auto'} onChange={(e) => setNoiseSettings({ method: e.target.value as NoiseMethod })}>
              <option value="auto">automatic: finest-scale spread of the raw trace, carried through the steps</option>
              <option value="rms">RMS about a straight line over the quiet range (raw trace), carried through the steps</option>
              <option value="blank">the blank&apos;s own noise, carried through the steps</option>
            </select>
          </label>
          <div className="row">
            <button type="button" disabled={!marked} onClick={() => marked && setNoiseSettings({ quietRange: marked, method: 'rms' })}>Use the marked range as quiet baseline</button>
            {settings.quietRange && <button type="button" className="link" onClick={() => setNoiseSettings({ quietRange: null, method: 'auto' })}>clear quiet range</button>}
          </div>
          {settings.quietRange && <p className="small">Quiet range: {num(settings.quietRange[0])} – {num(settings.quietRange[1])} {xu}</p>}
          {noise && (
            <dl className="figures-grid" data-testid="noise-figures">
              <dt>σ for S/N, {ps.measureOn} trace</dt>
              <dd>
                <span data-testid="noise-sigma">{num(noise.sigma.sigma)}</span>
                {range && <span className="small"> (median; {num(range[0])} to {num(range[1])} along the trace, each peak uses the σ at its apex)</span>}
                {sigmaWaiting && <span className="badge warn-text" data-testid="noise-provisional"> S/N provisional: σ from before the latest change, still being carried through the steps</span>}
              </dd>
              {noise.rawSigma && noise.carried && <><dt>σ of the raw trace</dt><dd>{num(noise.rawSigma.sigma)} ({noise.rawSigma.points} points)</dd></>}
              {noise.carried && noise.carried.route !== 'none' && (
                <><dt>carried through the steps</dt><dd data-testid="noise-route">{noise.carried.route === 'linear' ? `exactly (linear steps), × ${num(noise.carried.gain)}` : `by simulation, ${noise.carried.realisations} noise pair${noise.carried.realisations === 1 ? '' : 's'}, × ${num(noise.carried.gain)}`}</dd></>
              )}
              {noise.peakToPeak && <><dt>Peak-to-peak h, quiet range</dt><dd>{num(noise.peakToPeak.sigma)} ({noise.peakToPeak.points} points)</dd></>}
              <dt>assumptions</dt>
              <dd data-testid="noise-assumptions" className={noise.assumptionsHeld ? '' : 'warn-text'}>{noise.assumptionsHeld ? 'held, where they could be tested' : 'not all held — see below'}</dd>
            </dl>
          )}
          {noise && <p className="hint">{noise.sigma.description}</p>}
          {noise && noise.checks.length > 0 && (
            <ul className="checks small" data-testid="noise-checks">
              {noise.checks.map((c, i) => (
                <li key={i} className={c.held === false ? 'warn-text' : 'muted'}>
                  <span className="check-mark">{c.held === true ? 'held' : c.held === false ? 'did not hold' : 'not tested'}:</span> {c.text}
                </li>
              ))}
            </ul>
          )}
          {noise?.notes.map((n, i) => <p key={i} className="hint warn-text">{n}</p>)}
        </div>
        <div className="params">
          <label className="param" htmlFor="snr-def">
            <span className="param-label">S/N definition for the table and flags</span>
            <select id="snr-def" value={ps.snrDefinition} onChange={(e) => set({ snrDefinition: e.target.value as PeakSettings['snrDefinition'] })}>
              {Object.entries(SNR_NAME).map(([k, v]) => <option key={k} value={k}>{v}</option>)}
            </select>
          </label>
          {ps.snrDefinition === 'pharmacopoeial' && (
            <p className="hint">h is the range of {hasBlank ? 'the blank (processed by the same steps as the sample)' : 'the trace itself (no blank is loaded — a deviation from the pharmacopoeial method)'} over a window of {ps.pharmacopoeialMultiplier} × the peak’s half-height width centred on the peak.</p>
          )}
          <label className="param" htmlFor="measure-on">
            <span className="param-label">Measure peaks and noise on</span>
            <select id="measure-on" value={ps.measureOn} onChange={(e) => set({ measureOn: e.target.value as 'processed' | 'raw' })}>
              <option value="processed">the processed trace</option>
              <option value="raw">the raw trace</option>
            </select>
          </label>
          <div className="field-pairs">
            <NumberField label="Detection limit S/N" value={ps.detectionLimit} min={1} max={100} step={0.5} onChange={(v) => set({ detectionLimit: v })} />
            <NumberField label="Quantitation limit S/N" value={ps.quantitationLimit} min={1} max={1000} step={1} onChange={(v) => set({ quantitationLimit: v })} />
            <NumberField label="Smallest prominence" unit="× σ" value={ps.minProminenceSigma} min={0} max={1000} step={0.5} onChange={(v) => set({ minProminenceSigma: v })} />
            <NumberField label="Smallest S/N kept" value={ps.minSnr} min={0} max={1000} step={0.5} onChange={(v) => set({ minSnr: v })} />
            <NumberField label="Smallest half-height width" unit={xu ? `${xu}, 0 = 2.5 points` : '0 = 2.5 points'} value={ps.minWidth} min={0} max={1e9} step={0.001} onChange={(v) => set({ minWidth: v })} />
            <NumberField label="Smallest separation" unit={xu ? `${xu}, 0 = off` : '0 = off'} value={ps.minSeparation} min={0} max={1e9} step={0.01} onChange={(v) => set({ minSeparation: v })} />
            <NumberField label="Pharmacopoeial window" unit="× half-height width" value={ps.pharmacopoeialMultiplier} min={1} max={100} step={1} onChange={(v) => set({ pharmacopoeialMultiplier: v })} />
          </div>
          <label className="param" htmlFor="split-rule">
            <span className="param-label">Peaks sharing a valley are split by</span>
            <select id="split-rule" value={ps.split ?? 'perpendicular-drop'} onChange={(e) => set({ split: e.target.value as PeakSettings['split'] })}>
              <option value="perpendicular-drop">perpendicular drop (one baseline under the group)</option>
              <option value="valley-to-valley">valley to valley (each its own baseline)</option>
            </select>
          </label>
          <label className="param param-check">
            <input type="checkbox" checked={ps.negative} onChange={(e) => set({ negative: e.target.checked })} />
            <span className="param-label">Look for dips (troughs) instead of peaks</span>
          </label>
        </div>
      </div>
    </section>
  );
}
