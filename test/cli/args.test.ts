/**
 * Reading the command line's arguments, and the README quoting the help
 * texts word for word (and its summary example validating against the schema).
 */
import { readFileSync } from 'node:fs';
import { describe, expect, test } from 'vitest';
import { parseArgs, parseQuietRange } from '../../src/cli/args.ts';
import { ANALYSE_HELP, MAIN_HELP } from '../../src/cli/help.ts';
import { schemaProblems } from '../export/json-schema.ts';

function options(argv: string[]) {
  const p = parseArgs(['analyse', ...argv]);
  if (p.kind !== 'analyse') throw new Error(JSON.stringify(p));
  return p.options;
}

describe('arguments', () => {
  test('defaults', () => {
    expect(options(['a.csv'])).toEqual({
      inputs: ['a.csv'], method: null, blank: null, scans: [], traceName: null, traceIndex: null, quietRange: null,
      dialect: {}, out: '.', jobs: 1, json: false, standards: [], amounts: null, namedPeaks: null,
    });
  });

  test('every option, --name value and --name=value; --scan repeats; a value may start with a dash', () => {
    const o = options(['--method', 'm.json', '--blank=b.csv', '--scan', 's1.csv', '--scan', 's2.csv', 'x.csv', '--trace', 'Signal 2', '--quiet-range', '-1.5:-0.25',
      '--delimiter', 'tab', '--decimal=comma', '--out', 'res', '--jobs', '3', '--json', 'folder', '--', '--odd-name.csv']);
    expect(o).toEqual({
      inputs: ['x.csv', 'folder', '--odd-name.csv'], method: 'm.json', blank: 'b.csv', scans: ['s1.csv', 's2.csv'], traceName: 'Signal 2', traceIndex: null,
      quietRange: [-1.5, -0.25], dialect: { delimiter: '\t', decimal: ',' }, out: 'res', jobs: 3, json: true, standards: [], amounts: null, namedPeaks: null,
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

  test('quotes both help texts word for word', () => {
    expect(readme).toContain(`\`\`\`\n${MAIN_HELP}\`\`\``);
    expect(readme).toContain(`\`\`\`\n${ANALYSE_HELP}\`\`\``);
  });

  test('its summary example validates against the published schema', () => {
    const section = readme.slice(readme.indexOf('### The summary file'));
    const json = /```json\n([\s\S]*?)```/.exec(section)![1];
    const schema = JSON.parse(readFileSync('src/core/export/summary.schema.json', 'utf8'));
    expect(schemaProblems(schema, JSON.parse(json), true)).toEqual([]);
  });
});
