import { describe, expect, it } from 'vitest';
import { jcampFromTrace } from '../../../src/core/io/jcamp-write.ts';
import type { JcampTraceLike } from '../../../src/core/io/jcamp-write.ts';
import { parseJcamp } from '../../../src/core/io/jcamp.ts';
import { makeRng } from '../../../src/core/numeric/random.ts';
import type { LoadResult } from '../../../src/core/io/types.ts';

const SHA = 'f'.repeat(64);

function only(r: LoadResult) {
  if (!r.ok) throw new Error(`expected ok, got: ${r.error.problem}`);
  expect(r.traces).toHaveLength(1);
  return { trace: r.traces[0], report: r.report };
}

/** Invented evenly spaced trace: a seeded Gaussian peak on noise. */
function evenTrace(n: number, seed: number): JcampTraceLike {
  const rng = makeRng(seed);
  const x = new Float64Array(n);
  const y = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    x[i] = 1.5 + i * 0.125;
    y[i] = 300 * Math.exp(-(((i - n / 2) / 9) ** 2)) + rng.normal() * 1.7e-3 - 4.2;
  }
  return { x, y, xName: 'Time', xUnit: 'min', yName: 'UV 254 nm', yUnit: 'mAU', name: 'run 7 cleaned' };
}

describe('jcampFromTrace', () => {
  it('evenly spaced x → ##XYDATA=(X++(Y..Y)) with FIRSTX/LASTX/DELTAX/NPOINTS, factors 1, required labels', () => {
    const text = jcampFromTrace(evenTrace(50, 1), { OWNER: 'Lab 3', 'sample id': 'S-12' });
    const lines = text.split('\n');
    // Labels named by JCAMP-DX 5.01 (McDonald & Wilks 1988; IUPAC): TITLE first, END last.
    expect(lines[0]).toBe('##TITLE=run 7 cleaned');
    expect(lines).toContain('##JCAMP-DX=5.01');
    expect(lines).toContain('##DATA TYPE=CHROMATOGRAM');
    expect(lines).toContain('##ORIGIN=Tracewright');
    expect(lines).toContain('##OWNER=Lab 3');
    expect(lines).toContain('##sample id=S-12');
    expect(lines).toContain('##XUNITS=MINUTES');
    expect(lines).toContain('##YUNITS=mAU');
    expect(lines).toContain('##XFACTOR=1');
    expect(lines).toContain('##YFACTOR=1');
    expect(lines).toContain('##FIRSTX=1.5');
    expect(lines).toContain('##LASTX=7.625');
    expect(lines).toContain('##DELTAX=0.125');
    expect(lines).toContain('##NPOINTS=50');
    expect(lines).toContain('##XYDATA=(X++(Y..Y))');
    expect(lines.filter((l) => l.startsWith('##OWNER='))).toHaveLength(1);
    expect(text.endsWith('##END=\n')).toBe(true);
    for (const l of lines) expect(l.length).toBeLessThanOrEqual(80);
  });

  it('uneven x → ##XYPOINTS=(XY..XY), one pair per line', () => {
    const t: JcampTraceLike = {
      x: [1, 2, 4, 8, 16, 32],
      y: [-1, 0.5, 1e-300, -2.5e21, 3, 4],
      xName: 'Wavelength',
      xUnit: 'nm',
      yName: 'Absorbance',
      yUnit: '',
      name: 'uneven',
    };
    const text = jcampFromTrace(t, { 'DATA TYPE': 'UV/VIS SPECTRUM' });
    expect(text).toMatch(/^##XYPOINTS=\(XY\.\.XY\)$/m);
    expect(text).not.toMatch(/##XYDATA=/);
    expect(text).toMatch(/^4, 1E-300$/m);
    expect(text).toMatch(/^8, -2\.5E\+21$/m);
    expect(text).toMatch(/^##DATA TYPE=UV\/VIS SPECTRUM$/m);
    expect(text).toMatch(/^##YUNITS=ABSORBANCE$/m);
    const { trace } = only(parseJcamp(text, 'u.jdx', SHA));
    expect(Array.from(trace.x)).toEqual([1, 2, 4, 8, 16, 32]);
    expect(Array.from(trace.y)).toEqual([-1, 0.5, 1e-300, -2.5e21, 3, 4]);
    expect(trace.xUnit).toBe('nm');
    expect(trace.yName).toBe('Absorbance');
  });

  it('round trip of an even trace: y identical (shortest round-trip digits), x equal to rounding of FIRSTX + i·ΔX', () => {
    const src = evenTrace(1000, 7);
    const xBefore = Float64Array.from(src.x);
    const yBefore = Float64Array.from(src.y);
    const text = jcampFromTrace(src, {});
    // The input arrays are unchanged.
    expect(Array.from(src.x)).toEqual(Array.from(xBefore));
    expect(Array.from(src.y)).toEqual(Array.from(yBefore));
    const { trace } = only(parseJcamp(text, 'rt.jdx', SHA));
    // y is printed with the shortest digits that read back to the same double (ECMAScript Number::toString).
    expect(Array.from(trace.y)).toEqual(Array.from(src.y));
    // x is rebuilt from FIRSTX/LASTX/NPOINTS: at most a few ulps of |x| ≤ 127 off (2^-52·128·4 ≈ 1.1e-13).
    for (let i = 0; i < 1000; i++) expect(Math.abs(trace.x[i] - src.x[i])).toBeLessThan(1.2e-13);
    expect(trace.xName).toBe('Time');
    expect(trace.xUnit).toBe('min');
    expect(trace.yName).toBe('UV 254 nm');
    expect(trace.yUnit).toBe('mAU');
    expect(trace.name).toBe('rt.jdx: run 7 cleaned');
  });

  it('round trip over seeded random doubles of every magnitude (XYPOINTS, exact)', () => {
    const rng = makeRng(99);
    const n = 400;
    const x = new Float64Array(n);
    const y = new Float64Array(n);
    let acc = -1e6;
    for (let i = 0; i < n; i++) {
      acc += rng.uniform() * 10 ** Math.floor(rng.uniform() * 8 - 2);
      x[i] = acc;
      y[i] = (rng.uniform() - 0.5) * 10 ** Math.floor(rng.uniform() * 600 - 300);
    }
    const text = jcampFromTrace({ x, y, xName: 'x', xUnit: '', yName: 'y', yUnit: '', name: 'r' }, {});
    for (const l of text.split('\n')) expect(l.length).toBeLessThanOrEqual(80);
    const { trace } = only(parseJcamp(text, 'r.jdx', SHA));
    expect(Array.from(trace.x)).toEqual(Array.from(x));
    expect(Array.from(trace.y)).toEqual(Array.from(y));
    expect(trace.xUnit).toBe('');
    expect(trace.yUnit).toBe('');
  });

  it('wavenumber units map to 1/CM and back; multi-line metadata cannot forge a label', () => {
    const t: JcampTraceLike = { x: [400, 402, 404, 406, 408], y: [1, 2, 3, 4, 5], xName: 'Wavenumber', xUnit: 'cm⁻¹', yName: 'Transmittance', yUnit: '', name: 'ir' };
    const text = jcampFromTrace(t, { NOTE: 'first\n##NPOINTS=3\nthird $$ not a comment' });
    expect(text).toMatch(/^##XUNITS=1\/CM$/m);
    expect(text.match(/^##NPOINTS=/gm)).toHaveLength(1);
    const { trace } = only(parseJcamp(text, 'ir.jdx', SHA));
    expect(trace.xUnit).toBe('cm⁻¹');
    expect(trace.metadata['NOTE']).toBe('first\n# #NPOINTS=3\nthird $ $ not a comment');
  });

  it('refuses unequal lengths, empty traces and non-finite values with a sentence', () => {
    const base = { xName: 'x', xUnit: '', yName: 'y', yUnit: '', name: 'n' };
    expect(() => jcampFromTrace({ ...base, x: [1, 2], y: [1] }, {})).toThrow(RangeError);
    expect(() => jcampFromTrace({ ...base, x: [], y: [] }, {})).toThrow(/no points/);
    expect(() => jcampFromTrace({ ...base, x: [1, 2, 3], y: [1, NaN, 3] }, {})).toThrow(/Point 2/);
  });
});
