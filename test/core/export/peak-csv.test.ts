import { describe, expect, test } from 'vitest';
import { analyse } from '../../../src/core/analysis/index.ts';
import { BOUND_TEXT, peakMarksText, peakTableCsv, peakTableTsv } from '../../../src/core/export/peak-csv.ts';
import { CAUTION } from '../../../src/core/export/version.ts';
import { STEP_REGISTRY } from '../../../src/core/steps/registry.ts';
import { inventedTrace, looksLikeFormula, readCsv, recipeOf, splitCsvLine } from './helpers.ts';

const NOW = new Date(Date.UTC(2024, 0, 2, 3, 4, 5));

describe('peak table CSV', () => {
  test('every measure reads back exactly; units, S/N definition, noise and hand decisions are stated', () => {
    const trace = inventedTrace();
    const recipe = recipeOf('savitzky-golay');
    // One peak added by hand at x = 3 (a quiet place) and the tall peak at x = 2 removed by hand.
    const first = analyse({ sampleId: trace.id, scanIds: [], recipe }, new Map([[trace.id, trace]]), STEP_REGISTRY);
    const tall = first.peaks.reduce((a, b) => (b.height > a.height ? b : a));
    const result = analyse({ sampleId: trace.id, scanIds: [], recipe, decisions: { added: [3], removed: [tall.x] } }, new Map([[trace.id, trace]]), STEP_REGISTRY);
    const text = peakTableCsv({ trace, result, options: { delimiter: ';', decimal: ',' }, now: NOW, recipe, registry: STEP_REGISTRY });
    const { comments, header, body, num } = readCsv(text, ';', ',');
    expect(header.slice(0, 10)).toEqual(['peak #', 'apex (min)', 'height (mAU)', 'prominence (mAU)', 'FWHM (min)', 'FWHM (points)', 'area (mAU × min)', 'area % of all peaks kept', 'start (min)', 'end (min)']);
    expect(header).toContain('status');
    expect(header).toContain('decision');
    expect(body.length).toBe(result.peaks.length);
    const col = (name: string) => { const k = header.findIndex((h) => h.startsWith(name)); expect(k, name).toBeGreaterThanOrEqual(0); return k; };
    result.peaks.forEach((p, i) => {
      const row = body[i];
      expect(num(row[0])).toBe(i + 1);
      expect(num(row[1])).toBe(p.x);
      expect(num(row[2])).toBe(p.height);
      expect(num(row[3])).toBe(p.prominence);
      expect(num(row[4])).toBe(p.fwhm);
      expect(num(row[6])).toBe(p.area);
      expect(num(row[col('S/N (H/σ, definition in use)')])).toBe(p.snr);
      expect(num(row[col('S/N H/σ')])).toBe(p.snrRms);
      // The local baseline under each peak, why each bound lies where it does, the σ used and the marks.
      expect(num(row[col('baseline at start')])).toBe(p.baselineStart);
      expect(num(row[col('baseline at end')])).toBe(p.baselineEnd);
      expect(row[col('start: why there')]).toBe(BOUND_TEXT[p.startKind]);
      expect(row[col('end: why there')]).toBe(BOUND_TEXT[p.endKind]);
      expect(num(row[col('noise σ at the peak')])).toBe(p.noiseSigma);
      expect(row[col('marks')]).toBe(peakMarksText(p));
    });
    const decisions = body.map((r) => r[header.indexOf('decision')]);
    expect(decisions).toContain('added by hand');
    expect(decisions).toContain('removed by hand');
    expect(comments.some((c) => c.startsWith('# S/N definition in use: S/N = H/σ'))).toBe(true);
    const noiseLine = comments.find((c) => c.startsWith('# Noise σ on the measured trace:'))!;
    expect(noiseLine).toContain(`${result.noise!.sigma.points} points`);
    expect(noiseLine).toContain(result.noise!.sigma.method);
    expect(comments).toContain('# Limits: detection S/N 3; quantitation S/N 10.'.replace(';', ','));
    expect(comments.some((c) => c.startsWith('# Added by hand: peak ') && c.includes(' at '))).toBe(true);
    expect(comments.some((c) => c.startsWith('# Removed by hand (kept in the table, marked, and not counted): peak '))).toBe(true);
    expect(comments).toContain(`# Caution: ${CAUTION}`);
    expect(comments).toContain(`# Input SHA-256: ${trace.source.sha256}`);
    // How many rows pure noise would give, and how that was worked out.
    expect(comments.some((c) => c.startsWith('# Noise-only peaks: Pure noise of this length') && c.includes('Simulated:'))).toBe(true);
    expect(comments.some((c) => c.startsWith('# Start and end: '))).toBe(true);
  });

  test('hostile file name and metadata are neutralised; negative heights stay numbers (troughs)', () => {
    const trace = inventedTrace({ fileName: '@SUM(1+1),=cmd|calc,+x,-y,\tz.csv', metadata: { Note: '=2+5,@x' } });
    const neg = { ...trace, y: trace.y.map((v) => -v) };
    const recipe = recipeOf('moving-average');
    const result = analyse({ sampleId: trace.id, scanIds: [], recipe, peaks: { measureOn: 'processed', minProminenceSigma: 2, minSnr: 2, minWidth: 0, minSeparation: 0, snrDefinition: 'rms', pharmacopoeialMultiplier: 5, negative: true, detectionLimit: 3, quantitationLimit: 10 } },
      new Map([[trace.id, neg]]), STEP_REGISTRY);
    expect(result.peaks.length).toBeGreaterThan(0);
    const text = peakTableCsv({ trace: neg, result, options: { delimiter: ',', decimal: '.' }, now: NOW });
    for (const line of text.split('\r\n')) for (const cell of splitCsvLine(line, ',')) expect(looksLikeFormula(cell.replace(/^[ "]+/, '')), cell).toBe(false);
    const { body, num } = readCsv(text, ',', '.');
    expect(num(body[0][2])).toBeLessThan(0);
    expect(body[0][2].startsWith('-')).toBe(true);
  });

  test('tab-separated copy has the same header and rows, no comment lines', () => {
    const trace = inventedTrace();
    const result = analyse({ sampleId: trace.id, scanIds: [], recipe: recipeOf() }, new Map([[trace.id, trace]]), STEP_REGISTRY);
    const tsv = peakTableTsv(trace, result);
    const lines = tsv.trimEnd().split('\n');
    expect(lines.some((l) => l.startsWith('#'))).toBe(false);
    expect(lines.length).toBe(result.peaks.length + 1);
    expect(Number(lines[1].split('\t')[1])).toBe(result.peaks[0].x);
  });
});
