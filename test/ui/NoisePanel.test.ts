import { beforeEach, describe, expect, it } from 'vitest';
import { DEFAULT_PEAK_SETTINGS } from '../../src/core/analysis/request.ts';
import { SNR_NAME } from '../../src/core/measure/snr-words.ts';
import { currentResult } from '../../src/state/selectors.ts';
import { useApp } from '../../src/state/store.ts';
import { num } from '../../src/ui/format.ts';
import { NoisePanel } from '../../src/ui/NoisePanel.tsx';
import { button, elements, html, loadDemoSample, press, resetStore, text, tree } from './harness.ts';

// src/ui/NoisePanel.tsx: noise method, quiet range and peak thresholds; σ as measured.
beforeEach(() => resetStore());

/** The number field labelled `label`, rendered (a nested component), and its input's change handler. */
function field(label: string) {
  const el = elements(tree(NoisePanel)).find((e) => e.props.label === label)!;
  const input = elements(tree(el.type as (p: object) => ReturnType<typeof tree>, el.props)).find((e) => e.type === 'input')!;
  return { input, type: (v: string) => (input.props.onChange as (e: unknown) => void)({ target: { value: v } }) };
}

describe('NoisePanel', () => {
  it('before a result: the settings only, the quiet-range button disabled until a range is marked', () => {
    const h = html(NoisePanel);
    expect(text(h)).toContain('Noise and peak finding');
    expect(h).not.toContain('data-testid="noise-figures"');
    expect(button(tree(NoisePanel), 'Use the marked range as quiet baseline').props.disabled).toBe(true);
  });
  it('with the demo: σ as the result gives it, how it was estimated, and whether the assumptions held', async () => {
    await loadDemoSample();
    const n = currentResult(useApp.getState())!.noise!;
    const t = text(html(NoisePanel));
    expect(t).toContain(`σ for S/N, ${DEFAULT_PEAK_SETTINGS.measureOn} trace ${num(n.sigma.sigma)}`);
    expect(t).toContain(n.sigma.description);
    expect(t).toContain(n.assumptionsHeld ? 'held, where they could be tested' : 'not all held — see below');
    // The demo's noise SD is 0.05 mAU (demo-truth.json noiseSd); the page shows it within 20 %.
    expect(Math.abs(n.sigma.sigma - 0.05) / 0.05).toBeLessThan(0.2);
  });
  it('the limits are the S/N thresholds of the table; a typed value outside the field’s bounds is not applied', () => {
    const det = field('Detection limit S/N');
    expect(det.input.props.value).toBe(3);
    det.type('0.5');
    det.type('150');
    expect(useApp.getState().peakSettings.detectionLimit).toBe(3);
    det.type('2.5');
    expect(useApp.getState().peakSettings.detectionLimit).toBe(2.5);
    const loq = field('Quantitation limit S/N');
    expect(loq.input.props.value).toBe(10);
  });
  it('every S/N definition offered by its one name; the pharmacopoeial one without a blank says it deviates from the method', () => {
    const h = html(NoisePanel);
    for (const v of Object.values(SNR_NAME)) expect(h).toContain(`>${v}</option>`);
    useApp.getState().setPeakSettings({ snrDefinition: 'pharmacopoeial' });
    expect(text(html(NoisePanel))).toContain('the trace itself (no blank is loaded — a deviation from the pharmacopoeial method)');
  });
  it('a marked range becomes the quiet baseline (RMS method); clearing goes back to automatic', () => {
    useApp.getState().setMarkedRange([0.1, 0.8]);
    press(tree(NoisePanel), 'Use the marked range as quiet baseline');
    expect(useApp.getState().noiseSettings).toMatchObject({ quietRange: [0.1, 0.8], method: 'rms' });
    expect(text(html(NoisePanel))).toContain('Quiet range: 0.1 – 0.8');
    press(tree(NoisePanel), 'clear quiet range');
    expect(useApp.getState().noiseSettings).toMatchObject({ quietRange: null, method: 'auto' });
  });
  it('σ waiting on the latest change is marked provisional', async () => {
    await loadDemoSample();
    useApp.getState().setPending(['noise']);
    expect(text(html(NoisePanel))).toContain('S/N provisional: σ from before the latest change');
  });
});
