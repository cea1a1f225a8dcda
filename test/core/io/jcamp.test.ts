import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { jcampLabelKey, looksLikeJcamp, parseJcamp } from '../../../src/core/io/jcamp.ts';
import type { LoadResult } from '../../../src/core/io/types.ts';
import type { Trace } from '../../../src/core/trace.ts';

// Source of every decoded value below: the compression table of McDonald & Wilks 1988
// (Appl. Spectrosc. 42:151), as copied in REFERENCES.md: SQZ @=0, A–I=1…9, a–i=−1…−9;
// DIF %=0, J–R=+1…+9, j–r=−1…−9; DUP S–Z=1…8, s=9 (count includes the first).
// The fixture files are hand-written; their values were worked out by hand from that table.

const SHA = '0'.repeat(64);
const fixture = (name: string) =>
  readFileSync(fileURLToPath(new URL(`../../fixtures/jcamp/${name}`, import.meta.url)), 'utf8');
const load = (name: string) => parseJcamp(fixture(name), name, SHA);

function traces(r: LoadResult): Trace[] {
  if (!r.ok) throw new Error(`expected ok, got: ${r.error.problem}`);
  return r.traces;
}
function problem(r: LoadResult) {
  if (r.ok) throw new Error('expected a problem, got traces');
  return r.error;
}
const arr = (a: Float64Array) => Array.from(a);

// y of affn/pac/sqz/dif.jdx (hand-decoded, see the fixture README); x = 400…409 nm.
const TEN_Y = [12, 15, 21, -3, 7, 100, 250, 1000, -25, 0];
const TEN_X = [400, 401, 402, 403, 404, 405, 406, 407, 408, 409];

describe('looksLikeJcamp', () => {
  it('recognises ##TITLE= first, or ##JCAMP-DX= near the start (McDonald & Wilks 1988: TITLE is the first label)', () => {
    expect(looksLikeJcamp('\n\n  ##TITLE=x\n##END=')).toBe(true);
    expect(looksLikeJcamp('##Title = x\n')).toBe(true);
    expect(looksLikeJcamp('$$ note\n##JCAMP-DX=4.24\n')).toBe(true);
    expect(looksLikeJcamp('time,signal\n1,2\n')).toBe(false);
    expect(looksLikeJcamp('')).toBe(false);
  });
  it('compares labels after removing spaces, dashes, slashes, underscores (JCAMP-DX label rule)', () => {
    expect(jcampLabelKey('Data Type')).toBe('DATATYPE');
    expect(jcampLabelKey('block_id')).toBe('BLOCKID');
    expect(jcampLabelKey('JCAMP-DX')).toBe('JCAMPDX');
    expect(jcampLabelKey('X/Units')).toBe('XUNITS');
  });
});

describe('compressed forms (McDonald & Wilks 1988)', () => {
  it('decodes the published example 1A000JT%Tkj to 1000, 1001, 1002, 1002, 1002, 1000, 999', () => {
    // Published example (REFERENCES.md, from McDonald & Wilks 1988).
    const text = [
      '##TITLE=published example',
      '##JCAMP-DX=4.24',
      '##XUNITS=ARBITRARY UNITS',
      '##YUNITS=ARBITRARY UNITS',
      '##FIRSTX=1',
      '##LASTX=7',
      '##NPOINTS=7',
      '##XYDATA=(X++(Y..Y))',
      '1A000JT%Tkj',
      '##END=',
    ].join('\n');
    const [t] = traces(parseJcamp(text, 'example.jdx', SHA));
    expect(arr(t.y)).toEqual([1000, 1001, 1002, 1002, 1002, 1000, 999]);
    expect(arr(t.x)).toEqual([1, 2, 3, 4, 5, 6, 7]);
  });

  it.each(['affn.jdx', 'pac.jdx', 'sqz.jdx', 'dif.jdx'])('%s decodes to the hand-worked values', (name) => {
    const r = load(name);
    const [t] = traces(r);
    expect(arr(t.y)).toEqual(TEN_Y);
    expect(arr(t.x)).toEqual(TEN_X);
    expect(t.xName).toBe('Wavelength');
    expect(t.xUnit).toBe('nm');
    expect(t.yName).toBe('Absorbance');
    expect(t.yUnit).toBe('');
    if (r.ok) expect(r.report.notices).toEqual([]);
  });

  it('dup.jdx: E V H T b U @ = 5×4, 8×2, −2×3, 0', () => {
    const [t] = traces(load('dup.jdx'));
    expect(arr(t.y)).toEqual([5, 5, 5, 5, 8, 8, -2, -2, -2, 0]);
  });

  it('difdup.jdx: the published line, then the y-check and a repeated zero difference', () => {
    const r = load('difdup.jdx');
    const [t] = traces(r);
    expect(arr(t.y)).toEqual([1000, 1001, 1002, 1002, 1002, 1000, 999, 999, 999, 999]);
    expect(arr(t.x)).toEqual([1, 2, 3, 4, 5, 6, 7, 8, 9, 10]);
    if (r.ok) {
      expect(r.report.format).toMatch(/JCAMP-DX 4\.24/);
      expect(r.report.format).toMatch(/DIF/);
      expect(r.report.format).toMatch(/DUP/);
      expect(r.report.rowsRead).toBe(3);
    }
  });

  it('affn.jdx: comments ($$) are stripped and labels kept as metadata', () => {
    const r = load('affn.jdx');
    const [t] = traces(r);
    expect(t.metadata['TITLE']).toBe('plain numbers');
    expect(t.metadata['DATA TYPE']).toBe('UV/VIS SPECTRUM');
    expect(t.metadata['OWNER']).toBe('public domain');
    expect(t.name).toBe('affn.jdx: plain numbers');
    expect(t.source).toMatchObject({ fileName: 'affn.jdx', sha256: SHA, rowsRead: 10, rowsSkipped: 0 });
    if (r.ok) expect(r.report.metadata['ORIGIN']).toBe('invented for tests');
  });

  it('an AFFN exponent is read as an exponent, a bare E as the SQZ digit 5', () => {
    const text = ['##TITLE=e', '##FIRSTX=0', '##LASTX=5', '##NPOINTS=6', '##XYDATA=(X++(Y..Y))', '0 1.5E-1 2e+2 1E 5 e', '##END='].join('\n');
    // "1E 5 e": AFFN 1, SQZ E = 5, AFFN 5, SQZ e = −5 (table above)
    const [t] = traces(parseJcamp(text, 'e.jdx', SHA));
    expect(arr(t.y)).toEqual([0.15, 200, 1, 5, 5, -5]);
  });
});

describe('factors, order, pairs, blocks', () => {
  it('factors.jdx: y × YFACTOR; line x × XFACTOR agrees with FIRSTX/LASTX (no notice)', () => {
    const r = load('factors.jdx');
    const [t] = traces(r);
    // raw 4 8 −12 16 20 × 0.25 (exact in binary)
    expect(arr(t.y)).toEqual([1, 2, -3, 4, 5]);
    expect(arr(t.x)).toEqual([10, 11, 12, 13, 14]);
    expect(t.xName).toBe('Time');
    expect(t.xUnit).toBe('min');
    expect(t.yUnit).toBe('mAU');
    if (r.ok) expect(r.report.notices).toEqual([]);
  });

  it('a line x that is off the FIRSTX/LASTX grid gives a notice naming the line', () => {
    const text = fixture('factors.jdx').replace('\n26 16 20', '\n40 16 20');
    const r = parseJcamp(text, 'f.jdx', SHA);
    expect(r.ok).toBe(true);
    if (r.ok) expect(r.report.notices.join(' ')).toMatch(/line 15/);
  });

  it('descending.jdx: infrared x high→low is put ascending with a notice', () => {
    const r = load('descending.jdx');
    const [t] = traces(r);
    expect(arr(t.x)).toEqual([3992, 3994, 3996, 3998, 4000]);
    expect(arr(t.y)).toEqual([60, 70, 80, 85, 90]);
    expect(t.xName).toBe('Wavenumber');
    expect(t.xUnit).toBe('cm⁻¹');
    expect(t.yName).toBe('Transmittance');
    if (r.ok) expect(r.report.notices.join(' ')).toMatch(/descending/);
  });

  it('xypoints.jdx: pairs separated by commas, semicolons and spaces', () => {
    const r = load('xypoints.jdx');
    const [t] = traces(r);
    expect(arr(t.x)).toEqual([0.5, 0.75, 1.5, 2.25, 3.0, 4.5]);
    expect(arr(t.y)).toEqual([1.25, -2.5, 3.125, 0.004, 1500, 0]);
    expect(t.xUnit).toBe('min');
    expect(t.yUnit).toBe('mV');
    if (r.ok) expect(r.report.format).toMatch(/pairs/);
  });

  it('link.jdx: a LINK block with two data blocks gives two traces, each with its own labels', () => {
    const r = load('link.jdx');
    const ts = traces(r);
    expect(ts).toHaveLength(2);
    expect(ts[0].name).toBe('link.jdx: run A');
    expect(arr(ts[0].x)).toEqual([200, 202, 204, 206, 208]);
    expect(arr(ts[0].y)).toEqual([1, 2, 3, 4, 5]);
    expect(ts[0].xUnit).toBe('nm');
    expect(ts[0].metadata['DATA TYPE']).toBe('UV/VIS SPECTRUM');
    expect(ts[0].metadata['BLOCKS']).toBe('2'); // inherited from the LINK block
    expect(ts[1].name).toBe('link.jdx: run B');
    expect(arr(ts[1].x)).toEqual([1, 2, 4, 8, 16]);
    expect(arr(ts[1].y)).toEqual([10, 20, 30, 40, 50]);
    expect(ts[1].xUnit).toBe('s');
    expect(ts[1].metadata['DATA TYPE']).toBe('CHROMATOGRAM');
    if (r.ok) {
      expect(r.report.metadata['DATA TYPE']).toBe('LINK');
      expect(r.report.notices).toEqual([]);
    }
  });

  it('two blocks one after the other (no LINK) give two traces', () => {
    const block = (title: string, k: number) =>
      [`##TITLE=${title}`, '##FIRSTX=0', '##LASTX=4', '##NPOINTS=5', '##XYDATA=(X++(Y..Y))', `0 ${k} ${k} ${k} ${k} ${k}`, '##END='].join('\n');
    const ts = traces(parseJcamp(`${block('one', 1)}\n${block('two', 2)}\n`, 'two.jdx', SHA));
    expect(ts.map((t) => t.y[0])).toEqual([1, 2]);
  });
});

describe('problems are values naming the line or label', () => {
  it('dif-check-bad.jdx: the DIF y-check mismatch is reported with its line', () => {
    const e = problem(load('dif-check-bad.jdx'));
    expect(e.line).toBe(13);
    expect(e.problem).toMatch(/y-check/);
    expect(e.problem).toMatch(/line 13/);
    expect(e.problem).toMatch(/8/);
    expect(e.problem).toMatch(/7/);
    expect(e.fileName).toBe('dif-check-bad.jdx');
    expect(e.advice.length).toBeGreaterThan(10);
  });

  it('npoints-wrong.jdx: NPOINTS disagreeing with the data is an error naming NPOINTS and its line', () => {
    const e = problem(load('npoints-wrong.jdx'));
    expect(e.problem).toMatch(/##NPOINTS=/);
    expect(e.problem).toMatch(/12/);
    expect(e.problem).toMatch(/10/);
    expect(e.line).toBe(10);
  });

  it('no-data.jdx: missing ##XYDATA= is named', () => {
    const e = problem(load('no-data.jdx'));
    expect(e.problem).toMatch(/##XYDATA=/);
  });

  it('truncated.jdx: a file cut in the data says so', () => {
    const e = problem(load('truncated.jdx'));
    expect(e.problem).toMatch(/cut short/);
    expect(e.problem).toMatch(/##NPOINTS=/);
  });

  it('every cut of a good file is a problem, or the complete data with a notice, never an exception', () => {
    const text = fixture('difdup.jdx');
    const full = arr(traces(parseJcamp(text, 'full.jdx', SHA))[0].y);
    let complete = 0;
    for (let cut = 0; cut < text.indexOf('##END='); cut++) {
      const r = parseJcamp(text.slice(0, cut), 'cut.jdx', SHA);
      if (r.ok) {
        // Only a cut after the last data value can pass (the final y-check line is redundant).
        expect(arr(r.traces[0].y)).toEqual(full);
        expect(r.report.notices.join(' ')).toMatch(/##END=/);
        complete++;
      } else {
        expect(r.error.problem.length).toBeGreaterThan(10);
      }
    }
    // "7I99%U\n" already holds all 10 points; cuts inside "10I99" break the y-check or add nothing.
    expect(complete).toBeGreaterThan(0);
    expect(complete).toBeLessThan(10);
  });

  it('missing FIRSTX, bad number label, "?" value, stray character, DIF with nothing before it', () => {
    const base = ['##TITLE=t', '##FIRSTX=0', '##LASTX=4', '##NPOINTS=5', '##XYDATA=(X++(Y..Y))', '0 1 2 3 4 5', '##END='];
    const withLine = (i: number, s: string | null) => {
      const lines = base.slice();
      if (s === null) lines.splice(i, 1);
      else lines[i] = s;
      return problem(parseJcamp(lines.join('\n'), 't.jdx', SHA));
    };
    expect(withLine(1, null).problem).toMatch(/##FIRSTX=/);
    const bad = withLine(2, '##LASTX=four');
    expect(bad.problem).toMatch(/##LASTX=/);
    expect(bad.line).toBe(3);
    expect(withLine(5, '0 1 2 ? 4 5').line).toBe(6);
    expect(withLine(5, '0 1 2 # 4 5').problem).toMatch(/"#"/);
    expect(withLine(5, '0 J 2 3 4 5').problem).toMatch(/DIF/);
    expect(withLine(4, '##XYDATA=(X++(Y..Y)').problem).toMatch(/form/);
    expect(withLine(3, '##NPOINTS=5\n##XYPOINTS=(XY..XY)\n1,2').problem).toMatch(/second data table/);
  });

  it('a block of only a peak table is refused with a clear sentence', () => {
    const text = ['##TITLE=sticks', '##PEAK TABLE=(XY..XY)', '1,2 3,4', '##END='].join('\n');
    expect(problem(parseJcamp(text, 'p.jdx', SHA)).problem).toMatch(/peak table/);
  });

  it('fewer than 5 points, also after averaging repeated x, are problems, not exceptions', () => {
    const few = ['##TITLE=few', '##XYPOINTS=(XY..XY)', '1,2 3,4', '##END='].join('\n');
    expect(problem(parseJcamp(few, 'few.jdx', SHA)).problem).toMatch(/at least 5/);
    const rep = ['##TITLE=rep', '##XYPOINTS=(XY..XY)', '1,2 1,3 2,4 3,5 4,6', '##END='].join('\n');
    expect(problem(parseJcamp(rep, 'rep.jdx', SHA)).problem).toMatch(/at least 5/);
  });

  it('repeated x in pairs is averaged, as in delimited text (issue 19)', () => {
    const rep = ['##TITLE=rep', '##XYPOINTS=(XY..XY)', '1,2 1,3 2,4 3,5 4,6 5,7', '##END='].join('\n');
    const r = parseJcamp(rep, 'rep.jdx', SHA);
    const t = traces(r)[0];
    expect(arr(t.x)).toEqual([1, 2, 3, 4, 5]);
    expect(arr(t.y)).toEqual([2.5, 4, 5, 6, 7]);
    if (r.ok) expect(r.report.notices).toContain('1 point repeats an x value already present, in 1 set (first: x = 1 at points 1 and 2 as read); y was averaged over each set of equal x, since a trace needs x strictly rising.');
  });

  it('a file without ##END= but with complete data loads with a notice', () => {
    const text = fixture('dup.jdx').replace('##END=', '');
    const r = parseJcamp(text, 'dup.jdx', SHA);
    expect(r.ok).toBe(true);
    if (r.ok) expect(r.report.notices.join(' ')).toMatch(/##END=/);
  });

  it('two reads of the same text give equal values in separate arrays', () => {
    const text = fixture('dif.jdx');
    const a = traces(parseJcamp(text, 'dif.jdx', SHA))[0];
    const b = traces(parseJcamp(text, 'dif.jdx', SHA))[0];
    expect(a.x).not.toBe(b.x);
    expect(arr(a.y)).toEqual(arr(b.y));
  });
});
