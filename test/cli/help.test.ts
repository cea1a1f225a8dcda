/**
 * src/cli/help.ts: the command line's help texts. Checks: the README quotes
 * both word for word; every option the parser accepts (read from
 * src/cli/args.ts, each one confirmed by parseArgs itself) is listed in the
 * analyse help, and every option the help lists is accepted; the exit
 * statuses the help states are the ones runCli returns; the caution the
 * exports carry is in the main help; lines fit an 80-column terminal
 * (common practice for terminal help).
 */
import { readFileSync } from 'node:fs';
import { describe, expect, test } from 'vitest';
import { parseArgs } from '../../src/cli/args.ts';
import { ANALYSE_HELP, MAIN_HELP } from '../../src/cli/help.ts';
import { EXIT_INPUT_FAILED, EXIT_OK, EXIT_USAGE } from '../../src/cli/run.ts';

/** The long options the parser knows, read from its source: the keys of VALUE_OPTIONS and the members of FLAG_OPTIONS. */
function parserOptions(): { values: string[]; flags: string[] } {
  const src = readFileSync('src/cli/args.ts', 'utf8');
  const valueBlock = /const VALUE_OPTIONS[^=]*=\s*\{([\s\S]*?)\n\};/.exec(src)![1];
  const values = [...valueBlock.matchAll(/'?([a-z][a-z-]*)'?\s*:\s*\{\s*repeat/g)].map((m) => m[1]);
  const flagBlock = /const FLAG_OPTIONS = new Set\(\[([^\]]*)\]\)/.exec(src)![1];
  const flags = [...flagBlock.matchAll(/'([a-z-]+)'/g)].map((m) => m[1]);
  return { values, flags };
}

/** What parseArgs says of `analyse x --name [value]`: the usage error, or null when it took the option. */
function unknown(name: string, value: string | null): boolean {
  const p = parseArgs(['analyse', 'x.csv', `--${name}`, ...(value === null ? [] : [value])]);
  return p.kind === 'usage-error' && /Unknown option/.test(p.message);
}

describe('help texts', () => {
  test('the README quotes both help texts word for word', () => {
    const readme = readFileSync('README.md', 'utf8');
    expect(readme).toContain(`\`\`\`\n${MAIN_HELP}\`\`\``);
    expect(readme).toContain(`\`\`\`\n${ANALYSE_HELP}\`\`\``);
  });

  test('every option the parser accepts is listed in the analyse help, with a value where it takes one', () => {
    const { values, flags } = parserOptions();
    expect(values.length).toBeGreaterThanOrEqual(20);
    expect(flags).toEqual(expect.arrayContaining(['json', 'help']));
    for (const name of values) {
      expect(unknown(name, 'v'), `parser takes --${name}`).toBe(false);
      // Listed at the start of a line, followed by its value's name in capitals or its choices.
      expect(ANALYSE_HELP, `--${name} in the help`).toMatch(new RegExp(`^  --${name} [A-Za-z:|]+`, 'm'));
    }
    for (const name of flags) {
      expect(unknown(name, null), `parser takes --${name}`).toBe(false);
      expect(ANALYSE_HELP, `--${name} in the help`).toMatch(new RegExp(`^  (-h, )?--${name} {2,}`, 'm'));
    }
  });

  test('every option the analyse help lists is accepted by the parser; one it does not list is refused', () => {
    const listed = [...ANALYSE_HELP.matchAll(/^ {2}(?:-h, )?--([a-z-]+)(?: ([A-Za-z:|]+))?/gm)].map((m) => ({ name: m[1], value: m[2] ?? null }));
    expect(listed.length).toBe(parserOptions().values.length + parserOptions().flags.length);
    for (const o of listed) expect(unknown(o.name, o.value === null ? null : 'v'), `--${o.name}`).toBe(false);
    expect(unknown('not-an-option', null)).toBe(true);
  });

  test('the main help’s options and command are what the parser takes', () => {
    expect(MAIN_HELP).toMatch(/^ {2}-h, --help /m);
    expect(MAIN_HELP).toMatch(/^ {2}--version /m);
    expect(MAIN_HELP).toMatch(/^ {2}analyse <file\|folder>\.\.\. /m);
    expect(parseArgs(['-h'])).toEqual({ kind: 'help', topic: 'main' });
    expect(parseArgs(['--help'])).toEqual({ kind: 'help', topic: 'main' });
    expect(parseArgs(['--version'])).toEqual({ kind: 'version' });
    expect(parseArgs(['analyse', '--help'])).toEqual({ kind: 'help', topic: 'analyse' });
  });

  test('the exit statuses the help states are runCli’s', () => {
    for (const text of [MAIN_HELP, ANALYSE_HELP]) {
      const flat = text.replace(/\s+/g, ' ');
      expect(flat).toContain(`Exit status: ${EXIT_OK} every input was analysed`);
      expect(flat).toContain(`; ${EXIT_INPUT_FAILED} an input could not be read or analysed`);
      expect(flat).toContain(`; ${EXIT_USAGE} usage error`);
    }
  });

  test('the main help carries the caution that the tool is not a validated system', () => {
    expect(MAIN_HELP.replace(/\s+/g, ' ')).toContain("Tracewright is not a validated system; the laboratory's own procedures, validated methods and regulators' requirements govern.");
  });

  test('every line fits an 80-column terminal and the texts end with one line break', () => {
    for (const text of [MAIN_HELP, ANALYSE_HELP]) {
      for (const line of text.split('\n')) expect(line.length, line).toBeLessThanOrEqual(80);
      expect(text.endsWith('\n') && !text.endsWith('\n\n')).toBe(true);
    }
  });
});
