import { describe, expect, test } from 'vitest';
import { escapeHtml, reportHtml } from '../../src/core/export/report-html.ts';
import { CAUTION } from '../../src/core/export/version.ts';
import { recipeInWords, recipeToJson } from '../../src/core/recipe.ts';
import { STEP_REGISTRY } from '../../src/core/steps/registry.ts';
import { analysed, HOSTILE_NAME, inventedTrace, recipeOf } from './helpers.ts';

const NOW = new Date(Date.UTC(2024, 6, 1, 12, 0, 0));

function report(extra: Partial<Parameters<typeof reportHtml>[0]> = {}, metadata: Record<string, string> = {}) {
  const trace = inventedTrace({ fileName: HOSTILE_NAME, metadata: { '<b>owner</b>': '"><script>alert(2)</script>', ...metadata } });
  const recipe = recipeOf('despike', 'savitzky-golay', 'baseline');
  const result = analysed(trace, recipe);
  return { trace, recipe, result, html: reportHtml({ trace, result, recipe, registry: STEP_REGISTRY, now: NOW, ...extra }) };
}

describe('HTML report', () => {
  test('holds the caution, SHA-256, recipe (JSON and words), noise method, peaks, residual verdict and tool version', () => {
    const { html, trace, recipe, result } = report();
    expect(html.startsWith('<!DOCTYPE html>')).toBe(true);
    expect(html).toContain(CAUTION);
    expect(html).toContain(trace.source.sha256);
    expect(html).toContain(recipeToJson(recipe));
    for (const w of recipeInWords(recipe, STEP_REGISTRY)) expect(html).toContain(w.replace(/^\d+\.\s*/, ''));
    expect(html).toContain(result.noise!.sigma.description);
    expect(html).toContain(result.diagnostics!.verdict);
    expect(html).toContain('Tracewright 0.1.0');
    expect(html).toContain('2024-07-01T12:00:00.000Z');
    expect(html).toContain('@media print');
    // One table row per peak in the peak table (plus its header row).
    const peakSection = html.slice(html.indexOf('<h2>Peaks</h2>'), html.indexOf('<h2>What the processing may have lost</h2>'));
    expect((peakSection.match(/<tr>/g) ?? []).length).toBe(result.peaks.length + 1);
  });

  test('no scripts, no external addresses, user text escaped (hostile file name and metadata)', () => {
    const { html } = report();
    expect(html).not.toMatch(/<script/i);
    expect(html).not.toMatch(/https?:\/\//i);
    expect(html).not.toContain('<img src=x');
    expect(html).toContain('&lt;img src=x onerror=alert(1)&gt;.csv');
    expect(html).not.toContain('<b>owner</b>');
    expect(html).toContain('&lt;b&gt;owner&lt;/b&gt;');
    // The plots are inline SVG drawn by the core; no picture is embedded.
    expect(html).not.toMatch(/<img\b/i);
    expect((html.match(/<svg class="plot"/g) ?? []).length).toBe(2);
    // The Content-Security-Policy forbids scripts and outside requests in any case.
    expect(html).toContain("default-src 'none'");
  });

  test('an address in the metadata of the file stays inert text: no attribute and no style points anywhere', () => {
    const { html } = report({}, { Site: 'https://example.org/x', Logo: 'url(http://example.org/a.png)' });
    expect(html).toContain('https://example.org/x');
    expect(html).not.toMatch(/\b(src|href|action|xlink:href)\s*=\s*["']?\s*https?:/i);
    expect(html).not.toMatch(/<(a|link|iframe|object|embed|base)\b/i);
    const css = html.slice(html.indexOf('<style>'), html.indexOf('</style>'));
    expect(css).not.toMatch(/url\(|@import/);
  });

  test('loss ledger sentences and the export confirmation are written, escaped', () => {
    const { html } = report({
      ledger: { sentences: ['The shoulder at 4.1 min <weakened> from S/N 12 to 4.'], rows: [] },
      confirmation: { at: new Date(Date.UTC(2024, 6, 1, 11, 59, 0)), sentences: ['The shoulder at 4.1 min <weakened> from S/N 12 to 4.'] },
    });
    expect(html).toContain('The shoulder at 4.1 min &lt;weakened&gt; from S/N 12 to 4.');
    expect(html).toContain('Export confirmed at 2024-07-01T11:59:00.000Z');
    expect(html.split('&lt;weakened&gt;').length - 1).toBe(2);
  });

  test('the despike events are listed', () => {
    const trace = inventedTrace();
    const y = Float64Array.from(trace.y);
    y[100] += 5; y[300] -= 4;
    const spiky = { ...trace, y };
    const recipe = recipeOf('despike');
    const result = analysed(spiky, recipe);
    expect(result.events.length).toBeGreaterThanOrEqual(2);
    const html = reportHtml({ trace: spiky, result, recipe, registry: STEP_REGISTRY, now: NOW });
    expect(html).toContain(`${result.events.length} point(s) were replaced`);
    const section = html.slice(html.indexOf('<h2>Replaced points</h2>'));
    expect((section.match(/<tr>/g) ?? []).length).toBe(result.events.length + 1);
  });

  test('escapeHtml turns every character that could end an attribute or start markup into a reference', () => {
    expect(escapeHtml(`"'<>&`)).toBe('&quot;&#39;&lt;&gt;&amp;');
  });
});
