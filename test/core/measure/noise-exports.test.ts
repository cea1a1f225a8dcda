/**
 * Every σ says how it was made and whether its assumptions held, in the peak
 * CSV header and in the report; a fallback is never silent.
 */
import { describe, expect, test } from 'vitest';
import { analyse } from '../../../src/core/analysis/index.ts';
import { peakTableCsv } from '../../../src/core/export/peak-csv.ts';
import { reportHtml } from '../../../src/core/export/report-html.ts';
import { STEP_REGISTRY } from '../../../src/core/steps/registry.ts';
import { inventedTrace, recipeOf } from '../export/helpers.ts';

const NOW = new Date(Date.UTC(2024, 0, 2, 3, 4, 5));

describe('noise lines in the exports', () => {
  test('the automatic σ, carried through a smoother: method, route, every check', () => {
    const trace = inventedTrace();
    const recipe = recipeOf('moving-average');
    const result = analyse({ sampleId: trace.id, scanIds: [], recipe }, new Map([[trace.id, trace]]), STEP_REGISTRY);
    const csv = peakTableCsv({ trace, result, options: { delimiter: ',', decimal: '.' }, now: NOW, recipe, registry: STEP_REGISTRY });
    expect(csv).toMatch(/# Noise σ on the measured trace: .*finest-scale-mad, carried-linear/);
    expect(csv).toContain('Carried exactly through the linear stack');
    expect(csv).toMatch(/# Noise assumptions: /);
    for (const c of result.noise!.checks) expect(csv).toContain(c.text);
    const html = reportHtml({ trace, result, recipe, registry: STEP_REGISTRY, now: NOW });
    expect(html).toContain('Noise check (');
  });

  test('a quiet range asked for but not marked: the fallback is a note and a failed check, in the CSV and the report', () => {
    const trace = inventedTrace();
    const recipe = recipeOf('savitzky-golay');
    const result = analyse({ sampleId: trace.id, scanIds: [], recipe, noise: { method: 'rms', quietRange: null } }, new Map([[trace.id, trace]]), STEP_REGISTRY);
    expect(result.noise!.assumptionsHeld).toBe(false);
    const csv = peakTableCsv({ trace, result, options: { delimiter: ',', decimal: '.' }, now: NOW, recipe, registry: STEP_REGISTRY });
    expect(csv).toContain('Noise check (DID NOT HOLD): A quiet range was asked for, but none is marked');
    expect(csv).toMatch(/# Noise note: No quiet baseline range is marked/);
    expect(csv).toMatch(/# Noise assumptions: AT LEAST ONE DID NOT HOLD/);
    const html = reportHtml({ trace, result, recipe, registry: STEP_REGISTRY, now: NOW });
    expect(html).toContain('A quiet range was asked for, but none is marked');
  });

  test('a quiet range on the raw trace is carried like the automatic σ', () => {
    const trace = inventedTrace();
    const recipe = recipeOf('moving-average');
    const result = analyse({ sampleId: trace.id, scanIds: [], recipe, noise: { method: 'rms', quietRange: [2.6, 3.8] } }, new Map([[trace.id, trace]]), STEP_REGISTRY);
    expect(result.noise!.rawSigma!.method).toBe('rms-about-line');
    expect(result.noise!.carried!.route).toBe('linear');
    // 5-point average (the step's default window), noise treated as white or as measured: about 1/√5 of the raw σ.
    expect(result.noise!.sigma.sigma / result.noise!.rawSigma!.sigma).toBeGreaterThan(0.4);
    expect(result.noise!.sigma.sigma / result.noise!.rawSigma!.sigma).toBeLessThan(0.6);
  });
});
