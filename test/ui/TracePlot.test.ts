/**
 * src/ui/TracePlot.tsx: what the main plot hands the figure (Plotly is
 * mocked; the figure component is not rendered: its props are read from the
 * element tree the plot returns). Checked: the curves are named raw,
 * processed and "residual (raw − processed)" and the residual really is
 * raw minus processed, on its own axis; axis titles carry the trace's
 * names and units (demo-truth.json: Time in min, Absorbance 520 nm in mAU);
 * peak markers are grouped by standing against S/N 3 and 10 (ICH Q2(R1),
 * common practice), capped at PLOT_MARKERS with hand-added peaks first and
 * then the highest S/N, removed peaks never drawn; features some choice
 * loses and features born of processing get their own markers. What needs
 * a browser is left to the e2e specs: the S/N labels placed in the drawn
 * figure's pixels (e2e/calibration.spec.ts reads the "peak labels (S/N)"
 * curve), zooming by dragging (e2e/bench-day.spec.ts), the worker's
 * drawings of long series (e2e/long-draw.spec.ts) and the born-of-
 * processing ring in a browser (e2e/peaks-born.spec.ts). Dragging a peak's
 * start and end (onShapeX) has no browser spec that I found.
 */
import { beforeEach, describe, expect, it, vi } from 'vitest';
import type { PlotData, PlotLayout } from 'plotly.js-strict-dist-min';
import type { Peak } from '../../src/core/measure/peak-types.ts';
import { useApp } from '../../src/state/store.ts';
import { PLOT_MARKERS, PLOT_MARKERS_BELOW } from '../../src/worker/peak-rank.ts';
import { PlotlyFigure } from '../../src/ui/PlotlyFigure.tsx';
import { TracePlot } from '../../src/ui/TracePlot.tsx';
import { elements, html, loadDemoSample, loadDemoSmoothed, resetStore, text, tree } from './harness.ts';

vi.mock('plotly.js-strict-dist-min', () => ({ default: {} }));
beforeEach(() => resetStore());

/** The figure's props as the plot passes them. */
function figure() {
  const f = elements(tree(TracePlot)).find((e) => e.type === PlotlyFigure);
  if (!f) throw new Error('no figure');
  return f.props as unknown as { data: PlotData[]; layout: PlotLayout; label: string; pictureName: string };
}
const named = (data: PlotData[], name: string) => data.find((t) => t.name === name);
const arr = (v: unknown) => Array.from(v as ArrayLike<number>);


describe('TracePlot', () => {
  it('nothing loaded: says how to load a trace, no figure', () => {
    expect(text(html(TracePlot))).toBe('No trace yet. Drop a file here or choose one with “Open file”.');
    expect(elements(tree(TracePlot)).some((e) => e.type === PlotlyFigure)).toBe(false);
  });

  it('curves named raw, processed and residual (raw − processed); the residual is raw minus processed, on the lower axis', async () => {
    await loadDemoSmoothed(5);
    const s = useApp.getState();
    const sample = s.traces.find((t) => t.id === s.sampleId)!;
    const { data } = figure();
    const raw = named(data, 'raw')!, processed = named(data, 'processed')!, residual = named(data, 'residual (raw − processed)')!;
    expect([raw, processed, residual].every(Boolean)).toBe(true);
    // 1,201 points (demo-truth.json) fit the default 880 columns × 2 of the decimation: every point is drawn as it is.
    expect(arr(raw.x)).toEqual(Array.from(sample.x));
    expect(arr(raw.y)).toEqual(Array.from(sample.y));
    expect(arr(processed.y)).toEqual(Array.from(s.result!.processed.y));
    const ry = arr(residual.y);
    expect(ry).toHaveLength(sample.y.length);
    for (let i = 0; i < ry.length; i++) expect(ry[i]).toBeCloseTo(sample.y[i] - s.result!.processed.y[i], 12);
    expect(residual.yaxis).toBe('y2');
    expect(raw.yaxis).toBe('y');
    expect(processed.yaxis).toBe('y');
  });

  it('the raw curve can be hidden (the processed one stays)', async () => {
    await loadDemoSmoothed(5);
    useApp.setState({ showRaw: false });
    const { data } = figure();
    expect(named(data, 'raw')).toBeUndefined();
    expect(named(data, 'processed')).toBeDefined();
  });

  it('axis titles carry the trace’s names and units; the residual axis its unit; the picture and label name the file', async () => {
    await loadDemoSample();
    const { layout, label, pictureName } = figure();
    const l = layout as unknown as { xaxis: { title: { text: string } }; yaxis: { title: { text: string } }; yaxis2: { title: { text: string } } };
    expect(l.xaxis.title.text).toBe('Time (min)');
    expect(l.yaxis.title.text).toBe('Absorbance 520 nm (mAU)');
    expect(l.yaxis2.title.text).toBe('residual (mAU)');
    expect(pictureName).toBe('demo-sample-plot');
    const s = useApp.getState();
    expect(label).toBe(`Plot of ${s.traces.find((t) => t.id === s.sampleId)!.name}: raw and processed trace with the residual below`);
  });

  it('peak markers are grouped by standing against S/N 3 and 10, each peak in exactly one group', async () => {
    await loadDemoSample();
    const peaks = useApp.getState().result!.peaks;
    const { data } = figure();
    const groups: [string, (p: Peak) => boolean][] = [
      ['quantifiable peak (S/N ≥ 10)', (p) => p.snr! >= 10],
      ['detected peak (S/N 3–10)', (p) => p.snr! >= 3 && p.snr! < 10],
      ['below the detection limit (S/N < 3)', (p) => p.snr! < 3],
    ];
    let total = 0;
    for (const [name, keep] of groups) {
      const want = peaks.filter(keep).map((p) => p.x).sort((a, b) => a - b);
      expect(want.length, name).toBeGreaterThan(0); // the demo has peaks of each standing (demo-truth.json)
      const t = named(data, name)!;
      expect(arr(t.x).sort((a, b) => a - b), name).toEqual(want);
      total += arr(t.x).length;
    }
    expect(total).toBe(peaks.length);
  });

  it('at most PLOT_MARKERS markers: hand-added peaks always, then the highest S/N; removed peaks never', async () => {
    await loadDemoSample();
    const r = useApp.getState().result!;
    const base = r.peaks[0];
    const N = PLOT_MARKERS + 400;
    const peaks: Peak[] = Array.from({ length: N }, (_, i) => {
      const snr = ((i * 7919) % 1000) / 10; // distinct, no ties
      return { ...base, index: i, x: 0.01 * i, snr, flag: snr >= 10 ? 'quantifiable' : snr >= 3 ? 'detectable' : 'below-detection', marks: [], origin: 'detected', removedByUser: false };
    });
    peaks[3] = { ...peaks[3], origin: 'added-by-user', snr: 0.1, flag: 'below-detection' };
    const top = [...peaks].filter((p) => p.origin === 'detected').sort((a, b) => b.snr! - a.snr!)[0];
    const topIndex = peaks.indexOf(top);
    peaks[topIndex] = { ...top, removedByUser: true };
    useApp.setState({ result: { ...r, peaks } });
    const { data } = figure();
    const markerNames = ['quantifiable peak (S/N ≥ 10)', 'detected peak (S/N 3–10)', 'below the detection limit (S/N < 3)', 'S/N not measured', 'peak added by hand'];
    const drawn = data.filter((t) => markerNames.includes(String(t.name))).flatMap((t) => arr(t.x));
    expect(drawn).toHaveLength(PLOT_MARKERS);
    expect(arr(named(data, 'peak added by hand')!.x)).toEqual([peaks[3].x]);
    expect(drawn).not.toContain(peaks[topIndex].x);
    const others = peaks.filter((p) => p.origin === 'detected' && !p.removedByUser).sort((a, b) => b.snr! - a.snr!);
    const want = [peaks[3].x, ...others.slice(0, PLOT_MARKERS - 1).map((p) => p.x)].sort((a, b) => a - b);
    expect([...drawn].sort((a, b) => a - b)).toEqual(want);
  });

  it('issue 16: at most PLOT_MARKERS_BELOW markers below the detection limit (highest S/N), and the page says how many of how many', async () => {
    await loadDemoSample();
    const r = useApp.getState().result!;
    const base = r.peaks[0];
    // 10 quantifiable peaks and 250 noise bumps below S/N 3, one of them added by hand (always drawn, with its own marker).
    const peaks: Peak[] = Array.from({ length: 260 }, (_, i) => {
      const snr = i < 10 ? 20 + i : 0.01 * (i - 10);
      return { ...base, index: i, x: 0.01 * i, snr, flag: snr >= 10 ? 'quantifiable' : 'below-detection', marks: [], origin: 'detected', removedByUser: false };
    });
    peaks[12] = { ...peaks[12], origin: 'added-by-user' };
    useApp.setState({ result: { ...r, peaks } });
    const { data } = figure();
    const below = arr(named(data, 'below the detection limit (S/N < 3)')!.x);
    expect(below).toHaveLength(PLOT_MARKERS_BELOW);
    // The highest S/N among the 249 detected bumps: S/N 2.49 down to 2.10 (x = 0.01 · (snr/0.01 + 10)).
    const want = peaks.filter((p) => p.origin === 'detected' && p.flag === 'below-detection').sort((a, b) => b.snr! - a.snr!).slice(0, PLOT_MARKERS_BELOW).map((p) => p.x);
    expect([...below].sort((a, b) => a - b)).toEqual([...want].sort((a, b) => a - b));
    expect(arr(named(data, 'quantifiable peak (S/N ≥ 10)')!.x)).toHaveLength(10);
    expect(arr(named(data, 'peak added by hand')!.x)).toEqual([peaks[12].x]);
    expect(text(html(TracePlot))).toContain(`Markers on ${PLOT_MARKERS_BELOW} of the 249 candidates below the detection limit (those with the highest S/N); the peak table and its CSV list every one.`);
  });

  it('issue 16: when the higher S/N fill every marker, the note says none below the detection limit has one', async () => {
    await loadDemoSample();
    const r = useApp.getState().result!;
    const base = r.peaks[0];
    const peaks: Peak[] = Array.from({ length: PLOT_MARKERS + 25 }, (_, i) => {
      const snr = i < PLOT_MARKERS ? 5 + i : 1;
      return { ...base, index: i, x: 0.01 * i, snr, flag: snr >= 10 ? 'quantifiable' : snr >= 3 ? 'detectable' : 'below-detection', marks: [], origin: 'detected', removedByUser: false };
    });
    useApp.setState({ result: { ...r, peaks } });
    expect(named(figure().data, 'below the detection limit (S/N < 3)')).toBeUndefined();
    expect(text(html(TracePlot))).toContain(`No markers on the 25 candidates below the detection limit: the plot's ${PLOT_MARKERS} markers go to the highest S/N. The peak table and its CSV list every one.`);
  });

  it('no note on markers while every candidate below the detection limit has one (the demo)', async () => {
    await loadDemoSample();
    expect(text(html(TracePlot))).not.toContain('candidates below the detection limit');
  });

  it('a 41-point average: the lost sharp peak at 1.2 min is ringed as lost', async () => {
    await loadDemoSmoothed(41);
    const { data } = figure();
    const lost = named(data, 'features lost by some choice')!;
    expect(arr(lost.x).some((x) => Math.abs(x - 1.2) < 0.01)).toBe(true); // demo-truth.json: the 0.047-min peak at 1.2 min
    expect((lost.text as string[]).every((t) => t.startsWith('lost with: the current stack'))).toBe(true);
  });

  it('a 3-point average: features at or above the detection limit that only the processed trace has are ringed apart; those below are not', async () => {
    await loadDemoSmoothed(3);
    const { data } = figure();
    const marked = useApp.getState().result!.peaks.filter((p) => p.marks.includes('appears-only-after-processing'));
    const born = marked.filter((p) => p.flag !== 'below-detection');
    expect(born.length).toBeGreaterThan(0); // on the demo, S/N 7.4 at 6.34 min and S/N 24 at 10.0 min (this analysis's own warnings)
    expect(arr(named(data, 'appears only after processing')!.x).sort((a, b) => a - b)).toEqual(born.map((p) => p.x).sort((a, b) => a - b));
  });
});
