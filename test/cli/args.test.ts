/**
 * Reading the command line's arguments, and the README's summary example
 * validating against the schema. (The README quoting the help texts is in
 * help.test.ts.)
 */
import { readFileSync } from 'node:fs';
import { describe, expect, test } from 'vitest';
import { parseArgs, parseQuietRange } from '../../src/cli/args.ts';
import { schemaProblems } from '../core/export/json-schema.ts';

function options(argv: string[]) {
  const p = parseArgs(['analyse', ...argv]);
  if (p.kind !== 'analyse') throw new Error(JSON.stringify(p));
  return p.options;
}

describe('arguments', () => {
  test('defaults', () => {
    expect(options(['a.csv'])).toEqual({
      inputs: ['a.csv'], method: null, blank: null, scans: [], traceName: null, traceIndex: null, quietRange: null,
      dialect: {}, out: '.', jobs: 1, json: false, standards: [], amounts: null, namedPeaks: null, fit: null, figures: null, combine: null,
    });
  });

  test('every option, --name value and --name=value; --scan repeats; a value may start with a dash', () => {
    const o = options(['--method', 'm.json', '--blank=b.csv', '--scan', 's1.csv', '--scan', 's2.csv', 'x.csv', '--trace', 'Signal 2', '--quiet-range', '-1.5:-0.25',
      '--delimiter', 'tab', '--decimal=comma', '--out', 'res', '--jobs', '3', '--json', 'folder', '--', '--odd-name.csv']);
    expect(o).toEqual({
      inputs: ['x.csv', 'folder', '--odd-name.csv'], method: 'm.json', blank: 'b.csv', scans: ['s1.csv', 's2.csv'], traceName: 'Signal 2', traceIndex: null,
      quietRange: [-1.5, -0.25], dialect: { delimiter: '\t', decimal: ',' }, out: 'res', jobs: 3, json: true, standards: [], amounts: null, namedPeaks: null,
      fit: null, figures: null, combine: null,
    });
    expect(options(['x', '--trace-index', '0']).traceIndex).toBe(0);
    expect(options(['x', '--delimiter', ';', '--decimal', 'point']).dialect).toEqual({ delimiter: ';', decimal: '.' });
    expect(options(['x', '--delimiter', 'space']).dialect).toEqual({ delimiter: 'whitespace' });
  });

  test('usage errors name the option', () => {
    const cases: [string[], RegExp][] = [
      [['x', '--method', 'a', '--method', 'b'], /--method is given twice/],
      [['x', '--json=yes'], /--json takes no value/],
      [['x', '--out'], /--out needs a value/],
      [['x', '--trace-index', '-1'], /--trace-index takes a whole number from 0/],
      [['x', '--delimiter', '|'], /--delimiter takes , ; tab or space/],
      [['x', '-x'], /Unknown option "-x"/],
      [['x', '--jobs', '0'], /from 1 to 256/],
    ];
    for (const [argv, message] of cases) {
      const p = parseArgs(['analyse', ...argv]);
      expect(p.kind, argv.join(' ')).toBe('usage-error');
      if (p.kind === 'usage-error') expect(p.message).toMatch(message);
    }
  });

  test('fit, figure and combined-table options (issue 18): defaults as the page’s fit panel, regions repeat', () => {
    const o = options(['x', '--fit-region', '5.4:6.9', '--fit-region=-1:2', '--fit-shape', 'emg', '--fit-baseline', 'quadratic', '--fit-peaks', '2', '--fit-on', 'processed',
      '--figures', '--dead-time', '0.8', '--combine', '--match-window', '0.05']);
    expect(o.fit).toEqual({ regions: [[5.4, 6.9], [-1, 2]], shape: 'emg', baseline: 'quadratic', maxPeaks: 2, on: 'processed' });
    expect(o.figures).toEqual({ deadTime: 0.8 });
    expect(o.combine).toEqual({ window: 0.05 });
    expect(options(['x', '--fit-region', '1:2']).fit).toEqual({ regions: [[1, 2]], shape: 'gaussian', baseline: 'line', maxPeaks: 3, on: 'raw' });
    expect(options(['x', '--figures', '--combine'])).toMatchObject({ figures: { deadTime: null }, combine: { window: null } });
    const cases: [string[], RegExp][] = [
      [['x', '--fit-region', '2:1'], /--fit-region needs FROM smaller than TO/],
      [['x', '--fit-shape', 'emg'], /--fit-shape needs at least one --fit-region/],
      [['x', '--fit-region', '1:2', '--fit-shape', 'triangle'], /--fit-shape takes gaussian, lorentzian, pseudo-voigt, emg/],
      [['x', '--fit-region', '1:2', '--fit-peaks', '5'], /--fit-peaks takes a whole number from 1 to 4/],
      [['x', '--fit-region', '1:2', '--fit-on', 'smoothed'], /--fit-on takes raw or processed/],
      [['x', '--dead-time', '1'], /--dead-time needs --figures/],
      [['x', '--figures', '--dead-time', '-1'], /--dead-time takes a positive number/],
      [['x', '--match-window', '1'], /--match-window needs --combine/],
    ];
    for (const [argv, message] of cases) {
      const p = parseArgs(['analyse', ...argv]);
      expect(p.kind, argv.join(' ')).toBe('usage-error');
      if (p.kind === 'usage-error') expect(p.message).toMatch(message);
    }
  });

  test('quiet range: x-units with a decimal point, negative values, from < to', () => {
    expect(parseQuietRange('0.5:1.25')).toEqual([0.5, 1.25]);
    expect(parseQuietRange(' -2 : -1e-1 ')).toEqual([-2, -0.1]);
    expect(parseQuietRange('1,5:2')).toMatch(/decimal point/);
    expect(parseQuietRange('1:1')).toMatch(/FROM smaller than TO/);
    expect(parseQuietRange('1:2:3')).toMatch(/FROM:TO/);
    expect(parseQuietRange('1e999:2')).toMatch(/finite/);
  });
});

describe('the README', () => {
  const readme = readFileSync('README.md', 'utf8');

  test('its summary example validates against the published schema', () => {
    const section = readme.slice(readme.indexOf('### The summary file'));
    const json = /```json\n([\s\S]*?)```/.exec(section)![1];
    const schema = JSON.parse(readFileSync('src/core/export/summary.schema.json', 'utf8'));
    expect(schemaProblems(schema, JSON.parse(json), true)).toEqual([]);
  });
});
