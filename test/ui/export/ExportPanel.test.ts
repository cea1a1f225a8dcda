import Papa from 'papaparse';
import { beforeEach, describe, expect, it, vi } from 'vitest';
import { CAUTION } from '../../../src/core/export/version.ts';
import { emptyRecipe, makeRecipeStep } from '../../../src/core/method.ts';
import { stepDefinition } from '../../../src/core/steps/registry.ts';
import { currentResult } from '../../../src/state/selectors.ts';
import { useApp } from '../../../src/state/store.ts';
import { ExportPanel } from '../../../src/ui/export/ExportPanel.tsx';
import { analyseNow, button, html, loadDemoSample, press, resetStore, text, tree } from '../harness.ts';

// src/ui/export/ExportPanel.tsx: results out. Downloads are recorded
// instead of offered; the files are read back here.
vi.mock('plotly.js-strict-dist-min', () => ({ default: {} }));
const files: { name: string; text: string }[] = [];
vi.mock('../../../src/ui/export/download.ts', () => ({
  downloadText: (text: string, name: string) => { files.push({ name, text }); },
  downloadCsv: (text: string, name: string) => { files.push({ name, text }); },
  downloadBlob: () => {},
}));
beforeEach(() => { resetStore(); files.length = 0; });
const settle = () => new Promise((r) => setTimeout(r, 50));
const EXPORTS = ['Cleaned trace (CSV)', 'Peak table (CSV)', 'Report (HTML)', 'Print the report…', 'Summary (JSON)', 'Cleaned trace (JCAMP-DX)', 'Copy peak table'];

describe('ExportPanel', () => {
  it('every export is disabled until the sample’s analysis has fully landed', async () => {
    for (const b of EXPORTS) expect(button(tree(ExportPanel), b).props.disabled).toBe(true);
    await loadDemoSample();
    for (const b of EXPORTS) expect(button(tree(ExportPanel), b).props.disabled).toBe(false);
    useApp.getState().setPending(['loss']); // a newer analysis on its way: no mix of old and new figures
    for (const b of EXPORTS) expect(button(tree(ExportPanel), b).props.disabled).toBe(true);
  });
  it('says what every file carries and that nothing is uploaded', () => {
    expect(text(html(ExportPanel))).toContain('Every file carries the input’s SHA-256, the processing method, the tool version and the time. Files are made in this browser; nothing is uploaded.');
  });
  it('the report is named after the input file and carries the “not a validated system” caution', async () => {
    await loadDemoSample();
    press(tree(ExportPanel), 'Report (HTML)');
    await settle();
    expect(files.map((f) => f.name)).toEqual(['demo-sample-report.html']);
    expect(CAUTION).toContain('not a validated system');
    expect(files[0].text).toMatch(/not a validated system/);
    expect(files[0].text).toMatch(/regulators(’|'|&#39;|&#x27;)s? requirements govern/);
  });
  it('the peak table CSV has one row per peak with the S/N the page computed, each status worded against the limits 3 and 10, and the caution', async () => {
    await loadDemoSample();
    press(tree(ExportPanel), 'Peak table (CSV)');
    await settle();
    expect(files[0].name).toBe('demo-sample-peaks.csv');
    const csv = files[0].text;
    expect(csv).toMatch(/not a validated system/);
    const body = csv.split(/\r?\n/).filter((l) => l && !l.startsWith('#')).join('\n');
    const parsed = Papa.parse<string[]>(body, { skipEmptyLines: true }).data;
    const head = parsed[0];
    const sn = head.indexOf('S/N H/σ'), status = head.indexOf('status');
    expect(sn).toBeGreaterThanOrEqual(0);
    const peaks = currentResult(useApp.getState())!.peaks;
    const rows = parsed.slice(1);
    expect(rows).toHaveLength(peaks.length);
    rows.forEach((r, i) => expect(Number(r[sn])).toBe(peaks[i].snr)); // full precision: reads back to the same number
    // ICH Q2(R1) §6 (detection S/N 3, quantitation S/N 10; common practice), the page's default limits.
    for (const r of rows) {
      const v = Number(r[sn]);
      expect(r[status]).toBe(v >= 10 ? 'quantifiable' : v >= 3 ? 'detected, not quantifiable' : 'below detection limit');
    }
    expect(rows.map((r) => r[status])).toContain('below detection limit'); // the demo has one (S/N about 2.1 at 9.16 min)
  });
  it('when the processing lost or weakened features, an export waits for a confirmation: nothing is written at the first press', async () => {
    await loadDemoSample();
    useApp.setState({ recipe: { ...emptyRecipe(), steps: [makeRecipeStep(stepDefinition('moving-average')!, { window: 51 })] } });
    await analyseNow();
    expect(currentResult(useApp.getState())!.loss!.currentWarnings.length).toBeGreaterThan(0); // a 51-point average flattens the 1.2 min peak (FWHM 0.047 min = 5 points)
    press(tree(ExportPanel), 'Peak table (CSV)');
    await settle();
    expect(files).toEqual([]);
  });
  it('the processing method is saved as a method file', async () => {
    press(tree(ExportPanel), 'Save processing method');
    expect(files[0].name).toBe('tracewright-method.json');
    expect(JSON.parse(files[0].text).format).toBe('tracewright-recipe');
  });
});
