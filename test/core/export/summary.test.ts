/**
 * The summary JSON: it validates against its published schema
 * (src/core/export/summary.schema.json, strictly: no field the schema does
 * not name), its numbers are the peak-table CSV's numbers exactly (the CSV
 * writes shortest round-trip text, ECMA-262 Number::toString), missing
 * numbers are null, and the settings it reports are the ones used.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, test } from 'vitest';
import { analyse, DEFAULT_NOISE_SETTINGS, DEFAULT_PEAK_SETTINGS, type NoiseSettings, type PeakSettings } from '../../../src/core/analysis/index.ts';
import { peakTableCsv } from '../../../src/core/export/peak-csv.ts';
import { loadFile } from '../../../src/core/io/load.ts';
import { analysisSummary, summaryJson, type Summary } from '../../../src/core/export/summary.ts';
import { makeRecipeStep, recipeWithAnalysis, type Recipe } from '../../../src/core/method.ts';
import { STEP_REGISTRY } from '../../../src/core/steps/registry.ts';
import type { Trace } from '../../../src/core/trace.ts';
import { inventedTrace, readCsv, recipeOf, stepById } from './helpers.ts';
import { schemaProblems } from './json-schema.ts';

const SCHEMA = JSON.parse(readFileSync('src/core/export/summary.schema.json', 'utf8')) as Record<string, unknown>;
const NOW = new Date(Date.UTC(2024, 6, 1, 12, 0, 0));

function run(trace: Trace, steps: Recipe, noise: NoiseSettings = DEFAULT_NOISE_SETTINGS, peaks: PeakSettings = DEFAULT_PEAK_SETTINGS, decisions?: { added: number[]; removed: number[] }) {
  const method = recipeWithAnalysis(steps, noise, peaks);
  const result = analyse({ sampleId: trace.id, scanIds: [], recipe: method, noise, peaks, decisions }, new Map([[trace.id, trace]]), STEP_REGISTRY);
  const summary = analysisSummary({ trace, result, method, registry: STEP_REGISTRY, inputFile: `runs/${trace.source.fileName}`, loadNotices: ['a notice from the loader'] });
  return { method, result, summary };
}

/** The summary as another program reads it: through JSON text. */
const reread = (s: Summary) => JSON.parse(summaryJson(s)) as Summary;

describe('summary JSON', () => {
  test('validates against the published schema, strictly, for a processed trace with hand decisions', () => {
    const trace = inventedTrace({ fileName: 'run-7.csv' });
    const first = run(trace, recipeOf('savitzky-golay'));
    const detected = first.result.peaks.find((p) => p.flag === 'quantifiable')!;
    const { summary } = run(trace, recipeOf('savitzky-golay'), DEFAULT_NOISE_SETTINGS, DEFAULT_PEAK_SETTINGS, { added: [3.1], removed: [detected.x] });
    const json = reread(summary);
    expect(schemaProblems(SCHEMA, json, true)).toEqual([]);
    expect(json.input).toEqual({ file: 'runs/run-7.csv', sha256: 'ab'.repeat(32), trace: 'Signal' });
    expect(json.units).toEqual({ x: 'min', y: 'mAU' });
    expect(json.points).toEqual({ in: 600, out: 600 });
    expect(json.tool.name).toBe('tracewright');
    // Removed by hand: listed and marked; added by hand: marked.
    expect(json.peaks.filter((p) => p.hand === 'removed').map((p) => p.x)).toEqual([detected.x]);
    expect(json.peaks.filter((p) => p.hand === 'added')).toHaveLength(1);
    expect(json.warnings[0]).toBe('a notice from the loader');
    expect(json.residual.verdict.length).toBeGreaterThan(10);
  });

  test('issue 17, added fields: the report fields and each hand change\'s reason validate strictly; without them the summary is unchanged', () => {
    const trace = inventedTrace({ fileName: 'run-7.csv' });
    const method = recipeWithAnalysis(recipeOf('savitzky-golay'), DEFAULT_NOISE_SETTINGS, DEFAULT_PEAK_SETTINGS);
    const first = run(trace, recipeOf('savitzky-golay'));
    const detected = first.result.peaks.find((p) => p.flag === 'quantifiable')!;
    const result = analyse({ sampleId: trace.id, scanIds: [], recipe: method, decisions: { added: [], removed: [detected.x] } }, new Map([[trace.id, trace]]), STEP_REGISTRY);
    const plain = reread(analysisSummary({ trace, result, method, registry: STEP_REGISTRY, inputFile: 'x.csv' }));
    expect('report' in plain).toBe(false);
    expect(plain.peaks.every((p) => !('reason' in p))).toBe(true);
    const json = reread(analysisSummary({
      trace, result, method, registry: STEP_REGISTRY, inputFile: 'x.csv',
      fields: { analyst: 'A. Chemist', sample: 'Lot 42', instrument: '', run: '7' },
      reasons: [{ kind: 'removed', x: detected.x, reason: 'carry-over' }],
    }));
    expect(schemaProblems(SCHEMA, json, true)).toEqual([]);
    expect(json.report).toEqual({ analyst: 'A. Chemist', sample: 'Lot 42', instrument: '', run: '7' });
    expect(json.peaks.filter((p) => p.hand === 'removed').map((p) => p.reason)).toEqual(['carry-over']);
    expect(json.peaks.filter((p) => p.hand === null).every((p) => p.reason === '')).toBe(true);
    // Everything else is as before: only fields were added.
    const { report: _r, ...rest } = json;
    expect({ ...rest, peaks: rest.peaks.map(({ reason: _x, ...p }) => p) }).toEqual(plain);
  });

  test('the checker itself refuses what breaks the schema (so the check above can fail)', () => {
    const { summary } = run(inventedTrace(), recipeOf());
    const bad = reread(summary) as unknown as Record<string, unknown>;
    expect(schemaProblems(SCHEMA, { ...bad, schema: 2 })).not.toEqual([]);
    expect(schemaProblems(SCHEMA, { ...bad, peaks: [{ ...(bad.peaks as object[])[0], status: 'detectable' }] })).not.toEqual([]);
    expect(schemaProblems(SCHEMA, { ...bad, noise: { ...(bad.noise as object), sigma: 'small' } })).not.toEqual([]);
    const { warnings: _w, ...missing } = bad;
    expect(schemaProblems(SCHEMA, missing)).toEqual(['$: "warnings" is missing']);
    expect(schemaProblems(SCHEMA, { ...bad, extra: 1 }, true)).toEqual(['$: "extra" is not in the schema']);
    expect(schemaProblems(SCHEMA, { ...bad, extra: 1 }, false)).toEqual([]);
  });

  test('every peak number equals the peak CSV cell, which carries full precision', () => {
    const trace = inventedTrace({ seed: 11 });
    const { result, method, summary } = run(trace, recipeOf('moving-average'));
    const csv = peakTableCsv({ trace, result, recipe: method, registry: STEP_REGISTRY, options: { delimiter: ',', decimal: '.' }, now: NOW });
    const { header, body } = readCsv(csv, ',', '.');
    const col = (name: string) => header.findIndex((h) => h.startsWith(name));
    const cells = { x: col('apex'), height: col('height'), area: col('area'), fwhm: col('FWHM ('), start: col('start'), end: col('end'), snr: col('S/N (') };
    expect(Object.values(cells).every((c) => c >= 0)).toBe(true);
    const json = reread(summary);
    expect(json.peaks.length).toBe(body.length);
    expect(body.length).toBeGreaterThan(1);
    json.peaks.forEach((p, i) => {
      for (const [key, c] of Object.entries(cells)) {
        const cell = body[i][c];
        const v = p[key as keyof typeof cells];
        if (cell === '') expect(v).toBeNull();
        else expect(v, `${key} of peak ${i + 1}`).toBe(Number(cell));
      }
    });
  });

  test('settings are reported as used: definition names, limits, method object; dips have negative heights', () => {
    const trace = inventedTrace({ seed: 3 });
    const dipped: Trace = { ...trace, y: trace.y.map((v) => -v) };
    const peaks: PeakSettings = { ...DEFAULT_PEAK_SETTINGS, snrDefinition: 'pharmacopoeial', negative: true, detectionLimit: 2, quantitationLimit: 12 };
    const { summary, method, result } = run(dipped, recipeOf(), DEFAULT_NOISE_SETTINGS, peaks);
    const json = reread(summary);
    // The expected noise-only count is the analysis's own (measure/noise-bumps.ts), for the limits in use.
    expect(result.noiseBumps!.limits.detection).toBe(2);
    expect(json.snr).toEqual({ definition: '2H/h', detectionLimit: 2, quantitationLimit: 12, expectedNoisePeaksAboveDetection: result.noiseBumps!.aboveDetection });
    expect(json.method).toEqual(JSON.parse(JSON.stringify({ ...method, steps: [] })));
    expect((json.method as { analysis: { peaks: PeakSettings } }).analysis.peaks.negative).toBe(true);
    expect(json.peaks.length).toBeGreaterThan(0);
    for (const p of json.peaks) expect(p.height!).toBeLessThan(0);
    for (const [def, name] of [['rms', 'H/sigma'], ['region', 'mean/SD']] as const) {
      expect(reread(run(trace, recipeOf(), DEFAULT_NOISE_SETTINGS, { ...DEFAULT_PEAK_SETTINGS, snrDefinition: def }).summary).snr.definition).toBe(name);
    }
  });

  test('a noise method that could not run is reported as a fallback, with its assumptions not held', () => {
    const trace = inventedTrace();
    // RMS about a line needs a quiet range; without one the automatic estimate is used.
    const { summary } = run(trace, recipeOf(), { method: 'rms', quietRange: null });
    const json = reread(summary);
    expect(json.noise.method).toBe('finest-scale-mad');
    expect(json.noise.fallback).toMatch(/A quiet range was asked for, but none is marked/);
    expect(json.noise.assumptionsHeld).toBe(false);
    expect(json.warnings.some((w) => /No quiet baseline range is marked/.test(w))).toBe(true);
    const ok = reread(run(trace, recipeOf(), { method: 'rms', quietRange: [0.5, 1.5] }).summary);
    // No fallback; whether the assumptions held is the noise report's own verdict (here the short quiet range
    // cannot show the noise correlation, a check that does not hold), copied as it is.
    const okRun = run(trace, recipeOf(), { method: 'rms', quietRange: [0.5, 1.5] });
    expect(ok.noise).toMatchObject({ method: 'rms-about-line', fallback: null, assumptionsHeld: okRun.result.noise!.assumptionsHeld });
    // σ from the blank asked for without a blank: the automatic estimate, said as a fallback.
    const noBlank = reread(run(trace, recipeOf(), { method: 'blank', quietRange: null }).summary);
    expect(noBlank.noise.method).toBe('finest-scale-mad');
    expect(noBlank.noise.fallback).toMatch(/there is no blank/);
    expect(noBlank.noise.assumptionsHeld).toBe(false);
  });

  test('missing and non-finite numbers are null in the JSON text, never NaN or Infinity', () => {
    const trace = inventedTrace();
    const { summary } = run(trace, recipeOf());
    const broken: Summary = { ...summary, noise: { ...summary.noise, sigma: NaN as unknown as number }, peaks: summary.peaks.map((p, i) => (i === 0 ? { ...p, snr: Infinity, area: -Infinity } : p)) };
    const text = summaryJson(broken);
    expect(text).not.toMatch(/NaN|Infinity/);
    const back = JSON.parse(text) as Summary;
    expect([back.noise.sigma, back.peaks[0].snr, back.peaks[0].area]).toEqual([null, null, null]);
    // The builder itself turns a non-finite measure into null (a peak whose S/N or area could not be formed).
    const { result, method } = run(trace, recipeOf());
    const odd = { ...result, peaks: result.peaks.map((p, i) => (i === 0 ? { ...p, snr: NaN, area: Infinity } : p)) };
    const built = analysisSummary({ trace, result: odd, method, registry: STEP_REGISTRY, inputFile: 'x.csv' });
    expect([built.peaks[0].snr, built.peaks[0].area]).toEqual([null, null]);
    expect(schemaProblems(SCHEMA, reread(built), true)).toEqual([]);
  });

  test('a step that could not run is a warning; one line per summary with the one-line form', () => {
    const trace = inventedTrace();
    const steps = recipeOf('blank-subtraction');
    const { summary } = run(trace, steps);
    expect(summary.warnings.some((w) => /^Step "Subtract blank" was not applied: /.test(w))).toBe(true);
    const line = summaryJson(summary, true);
    expect(line.includes('\n')).toBe(false);
    expect(JSON.parse(line)).toEqual(JSON.parse(summaryJson(summary)));
  });

  test('afterProcessingOnly follows the peak\'s mark: the demo spike spread by a 3-point average is marked, the real peaks are not', () => {
    const loaded = loadFile(new Uint8Array(readFileSync('public/demo/demo-sample.csv')), 'demo-sample.csv');
    if (!loaded.ok) throw new Error('the demo sample did not load');
    const trace = loaded.traces[0];
    const steps = recipeOf();
    steps.steps.push(makeRecipeStep(stepById('moving-average'), { window: 3 } as never));
    const { summary, result } = run(trace, steps);
    const json = reread(summary);
    const marked = result.peaks.map((p) => p.marks.includes('appears-only-after-processing'));
    expect(json.peaks.map((p) => p.afterProcessingOnly)).toEqual(marked);
    // The demo's spike (demo-truth.json: at x = spike.x) is the one quantifiable marked row; the other marked rows
    // are noise bumps below the quantitation limit.
    const truth = JSON.parse(readFileSync('public/demo/demo-truth.json', 'utf8')) as { spike: { x: number } };
    const flagged = json.peaks.filter((p) => p.afterProcessingOnly && p.status === 'quantifiable');
    expect(flagged).toHaveLength(1);
    expect(Math.abs(flagged[0].x! - truth.spike.x)).toBeLessThan(0.02);
  });
});
