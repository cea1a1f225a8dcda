/**
 * The report's SVG plot: ticks at round values (1, 2 or 5 times a power of
 * ten, the "nice numbers" of Heckbert, Graphics Gems 1990), labels with the
 * decimals the step needs, peaks marked, user text escaped.
 */
import fc from 'fast-check';
import { describe, expect, test } from 'vitest';
import { niceTicks, PLOT_MAX_MARKER_LABELS, svgLinePlot, tickText } from '../../../src/core/export/plot-svg.ts';

function isNiceStep(step: number): boolean {
  const p = 10 ** Math.floor(Math.log10(step) + 1e-12);
  return [1, 2, 5, 10].some((m) => Math.abs(step / p - m) < 1e-9);
}

describe('axis ticks', () => {
  test('worked examples (by hand): the demo run 0–12.01 min, a negative span, a tiny one', () => {
    expect(niceTicks(0, 12.01, 6)).toEqual({ step: 2, ticks: [0, 2, 4, 6, 8, 10, 12] });
    expect(niceTicks(-0.3, 2.7, 4)).toEqual({ step: 1, ticks: [0, 1, 2] });
    const t = niceTicks(0.0012, 0.0019, 4);
    expect(t.step).toBeCloseTo(0.0002, 15);
    expect(t.ticks.map((v) => tickText(v, t.step))).toEqual(['0.0012', '0.0014', '0.0016', '0.0018']);
    expect(niceTicks(5, 5).ticks).toEqual([]);
    expect(niceTicks(0, Infinity).ticks).toEqual([]);
    // Too narrow for its magnitude: every label would read the same.
    expect(niceTicks(-1e9, -1e9 + 2.4e-7, 8).ticks).toEqual([]);
  });

  test('any range: round steps, ticks inside the range on multiples of the step, a readable count', () => {
    fc.assert(fc.property(fc.double({ min: -1e9, max: 1e9, noNaN: true }), fc.double({ min: 1e-9, max: 1e9, noNaN: true }), fc.integer({ min: 3, max: 8 }), (lo, span, target) => {
      const hi = lo + span;
      fc.pre(hi > lo);
      const { step, ticks } = niceTicks(lo, hi, target);
      expect(isNiceStep(step)).toBe(true);
      // Spans below a millionth of the magnitude are not labelled (see niceTicks).
      if (span < 1e-6 * Math.max(Math.abs(lo), Math.abs(hi))) return;
      for (const v of ticks) {
        expect(v).toBeGreaterThanOrEqual(lo - step * 1e-9);
        expect(v).toBeLessThanOrEqual(hi + step * 1e-9);
        expect(Math.abs(v / step - Math.round(v / step))).toBeLessThan(1e-6);
      }
      // Steps of 1, 2, 5: between about target/2.5 and 2.5·target intervals fit.
      expect(ticks.length).toBeGreaterThanOrEqual(Math.floor(target / 2.5));
      expect(ticks.length).toBeLessThanOrEqual(Math.ceil(target * 2.5) + 1);
    }), { numRuns: 300, seed: 20261202 });
  });

  test('tick labels carry the decimals of the step (the same on one axis), no binary noise, exponents only for extreme steps', () => {
    expect(tickText(0.30000000000000004, 0.1)).toBe('0.3');
    expect(tickText(-0.5, 0.5)).toBe('-0.5');
    expect(tickText(1200, 200)).toBe('1200');
    expect(tickText(0, 0.05)).toBe('0.00');
    expect(tickText(-0, 0.5)).toBe('0.0');
    expect(tickText(1, 0.2)).toBe('1.0');
    expect(tickText(3e-7, 1e-7)).toBe('3e-7');
    expect(tickText(2.5e7, 5e6)).toBe('2.5e+7');
  });
});

describe('svgLinePlot', () => {
  const x = Float64Array.from({ length: 101 }, (_, i) => i * 0.1);
  const y = Float64Array.from(x, (v) => Math.exp(-((v - 5) ** 2)));

  test('tick labels on the axes are round values; peaks are marked and numbered', () => {
    const svg = svgLinePlot([{ x, y, colour: '#123456', label: 'processed' }], 'Time (min)', 'Signal (mAU)', 'plot', [{ x: 5, y: 1, label: '1' }]);
    const labels = [...svg.matchAll(/text-anchor="middle">([^<]+)<\/text>/g)].map((m) => m[1]);
    expect(labels).toEqual(expect.arrayContaining(['0', '2', '4', '6', '8', '10']));
    const yLabels = [...svg.matchAll(/text-anchor="end">([^<]+)<\/text>/g)].map((m) => m[1]);
    // y from 0 to 1 padded by 5 % each side: four intervals wanted, steps of 0.2.
    expect(yLabels).toEqual(['0.0', '0.2', '0.4', '0.6', '0.8', '1.0']);
    expect(svg).toContain('<path d="M');
    expect(svg).toContain('>1</text>');
    expect(svg).toContain('number = row of the peak table');
  });

  test('numbers that would overlap: the heavier peak keeps its number, the key says some were left out', () => {
    const svg = svgLinePlot([{ x, y, colour: '#123456', label: 'processed' }], 'x', 'y', 't', [
      { x: 5, y: 0.5, label: '1', weight: 2 }, { x: 5.02, y: 0.5, label: '2', weight: 30 }, { x: 8, y: 0.5, label: '3', weight: 1 },
    ]);
    expect((svg.match(/<path /g) ?? []).length).toBe(3);
    expect(svg).toContain('>2</text>');
    expect(svg).toContain('>3</text>');
    expect(svg).not.toContain('>1</text>');
    expect(svg).toContain('crowded numbers left out');
  });

  test('many peaks: marked without numbers; text from files is escaped', () => {
    const many = Array.from({ length: PLOT_MAX_MARKER_LABELS + 1 }, (_, i) => ({ x: i * 0.2, y: 0.5, label: String(i + 1) }));
    const svg = svgLinePlot([{ x, y, colour: '#123456', label: '<b>raw</b>' }], '<x>', 'y & z', 't"t', many);
    expect((svg.match(/<path /g) ?? []).length).toBe(many.length);
    expect(svg).not.toContain('number = row');
    expect(svg).not.toMatch(/<b>|<x>/);
    expect(svg).toContain('&lt;b&gt;raw&lt;/b&gt;');
    expect(svg).toContain('aria-label="t&quot;t"');
  });

  test('nothing finite to draw gives a sentence, not an empty picture', () => {
    expect(svgLinePlot([{ x: Float64Array.of(NaN), y: Float64Array.of(1), colour: '#000', label: 'a' }], 'x', 'y', 't')).toBe('<p>No finite values to draw.</p>');
  });

  test('values near the largest double: the axis is drawn in units of 10^k, every coordinate finite', () => {
    // 1.7e308 − (−1.7e308) overflows to Infinity in double precision (IEEE 754), so without scaling every y would be NaN.
    const x = Float64Array.of(0, 1, 2, 3);
    const y = Float64Array.of(1.7e308, -1.7e308, 1e300, 0);
    const svg = svgLinePlot([{ x, y, colour: '#000', label: 'raw' }], 'Time (min)', 'Signal', 't', [{ x: 0, y: 1.7e308, label: '1' }]);
    expect(svg).toContain('Signal (axis in units of 1e308)');
    expect(svg).not.toContain('Time (min) (axis');
    expect(svg).not.toMatch(/NaN|Infinity/);
    const pts = /points="([^"]+)"/.exec(svg)![1].split(' ');
    expect(pts).toHaveLength(4);
  });
});
