import { describe, expect, test } from 'vitest';
import { escapeHtml, reportHtml } from '../../../src/core/export/report-html.ts';
import { CAUTION } from '../../../src/core/export/version.ts';
import { recipeInWords, recipeToJson } from '../../../src/core/method.ts';
import { STEP_REGISTRY } from '../../../src/core/steps/registry.ts';
import { analyse } from '../../../src/core/analysis/index.ts';
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
    // One table row per peak in each part of the peak table (plus its header row); each part has at most 8 columns.
    const peakSection = html.slice(html.indexOf('<h2>Peaks</h2>'), html.indexOf('<h2>What the processing may have lost</h2>'));
    const parts = peakSection.split('<table data-role="peak-table">').slice(1).map((t) => t.slice(0, t.indexOf('</table>')));
    expect(parts.length).toBeGreaterThan(2);
    for (const t of parts) {
      expect((t.match(/<tr>/g) ?? []).length).toBe(result.peaks.length + 1);
      expect((t.slice(0, t.indexOf('</tr>')).match(/<th /g) ?? []).length).toBeLessThanOrEqual(8);
      expect(t).toContain('<th scope="col">peak #</th>');
    }
    // Every column of the peak table CSV is in one of the parts.
    expect(peakSection).toContain('reason for the hand change');
    expect(peakSection).toContain('area % of all peaks kept');
  });

  test('a one-page summary comes first: caution, hash, plot, processing method, σ with its method, a short peak table; the detail follows after a page break', () => {
    const { html, trace, result } = report();
    const summary = html.slice(html.indexOf('data-role="summary-page"'), html.indexOf('data-role="detail"'));
    expect(summary).toContain(CAUTION);
    expect(summary).toContain(trace.source.sha256);
    expect(summary).toContain('<svg class="plot"');
    expect(summary).toContain('<h2>Processing method</h2>');
    expect(summary).toContain(result.noise!.sigma.method);
    expect(summary).toMatch(/Noise σ = [\d.e-]+ mAU/);
    expect(summary).toContain('data-role="summary-peaks"');
    expect(summary).toContain('4 significant digits');
    expect(summary).not.toContain('recipe');
    // The page break: the detail section starts a new printed page.
    expect(html).toMatch(/\.detail\{break-before:page/);
    expect(html).toContain('@page{size:A4');
    // Summary rows are the detail's row numbers; ticks stay round (checked in plot-svg.test.ts).
    const rows = summary.slice(summary.indexOf('data-role="summary-peaks"'));
    expect((rows.slice(0, rows.indexOf('</table>')).match(/<tr>/g) ?? []).length).toBe(Math.min(result.peaks.length, 12) + 1);
  });

  test('report fields and hand-change reasons appear on the summary and in the detail, escaped; empty fields are left out', () => {
    const trace = inventedTrace();
    const recipe = recipeOf('savitzky-golay');
    const first = analysed(trace, recipe);
    const tall = first.peaks.reduce((a, b) => (b.height > a.height ? b : a));
    const result = analyse({ sampleId: trace.id, scanIds: [], recipe, decisions: { added: [], removed: [tall.x] } }, new Map([[trace.id, trace]]), STEP_REGISTRY);
    const html = reportHtml({
      trace, result, recipe, registry: STEP_REGISTRY, now: NOW,
      fields: { analyst: 'A. <Chemist>', sample: 'Lot 42', instrument: '', run: 'run 7' },
      reasons: [{ kind: 'removed', x: tall.x, reason: 'carry-over <from> the wash' }],
    });
    const summary = html.slice(0, html.indexOf('data-role="detail"'));
    expect(summary).toContain('<dt>Analyst</dt><dd>A. &lt;Chemist&gt;</dd>');
    expect(summary).toContain('<dt>Sample</dt><dd>Lot 42</dd>');
    expect(summary).toContain('<dt>Run</dt><dd>run 7</dd>');
    expect(summary).not.toContain('<dt>Instrument</dt>');
    expect(summary).toContain('removed by hand: carry-over &lt;from&gt; the wash');
    const detail = html.slice(html.indexOf('data-role="detail"'));
    expect(detail).toContain('<td>carry-over &lt;from&gt; the wash</td>');
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
