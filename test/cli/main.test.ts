/**
 * src/cli/main.ts, the command line's entry point, imported as a module
 * with its arguments and streams in place (each import runs it once). Its
 * promises: it hands the process's arguments after the program name to
 * runCli and sets process.exitCode to the status (never calls
 * process.exit, so written files are flushed); an unexpected error becomes
 * one line on standard error and status 2, with the stack only when
 * TRACEWRIGHT_DEBUG is set. The worker-thread branch (--jobs) is run by the
 * built program in process.test.ts.
 */
import { afterEach, beforeEach, describe, expect, test, vi } from 'vitest';

const runCli = vi.fn<(argv: readonly string[], io: unknown) => Promise<number>>();
vi.mock('../../src/cli/run.ts', () => ({ runCli: (argv: readonly string[], io: unknown) => runCli(argv, io), workerLoop: vi.fn() }));

let stderr: string[];
let exitSpy: ReturnType<typeof vi.spyOn>;
const argv = process.argv;
const exitCode = process.exitCode;

beforeEach(() => {
  vi.resetModules();
  runCli.mockReset();
  stderr = [];
  vi.spyOn(process.stderr, 'write').mockImplementation((t: string | Uint8Array) => { stderr.push(String(t)); return true; });
  exitSpy = vi.spyOn(process, 'exit').mockImplementation((() => { throw new Error('process.exit was called'); }) as never);
});

afterEach(() => {
  vi.restoreAllMocks();
  vi.unstubAllEnvs();
  process.argv = argv;
  process.exitCode = exitCode;
});

async function runMain(args: string[]): Promise<number | string | null | undefined> {
  process.argv = ['/usr/bin/node', '/x/bin/tracewright.js', ...args];
  process.exitCode = undefined;
  await import('../../src/cli/main.ts');
  const code = process.exitCode;
  process.exitCode = exitCode;
  return code;
}

describe('the entry point', () => {
  test('passes the arguments after the program name and the process’s streams, and sets the exit status without exiting', async () => {
    runCli.mockResolvedValue(1);
    const code = await runMain(['analyse', 'a.csv', '--json']);
    expect(code).toBe(1);
    expect(exitSpy).not.toHaveBeenCalled();
    expect(runCli).toHaveBeenCalledTimes(1);
    const [args, io] = runCli.mock.calls[0] as [string[], { cwd: string; env: unknown; stderrIsTTY: boolean; workerUrl: URL; stdout: unknown }];
    expect(args).toEqual(['analyse', 'a.csv', '--json']);
    expect(io.cwd).toBe(process.cwd());
    expect(io.env).toBe(process.env);
    expect(typeof io.stderrIsTTY).toBe('boolean');
    expect(io.workerUrl.href).toMatch(/\/src\/cli\/main\.ts$/);
    expect(stderr).toEqual([]);
  });

  test('an unexpected error: one line naming it, status 2, no stack trace', async () => {
    runCli.mockRejectedValue(new TypeError('x is undefined'));
    const code = await runMain(['analyse', 'a.csv']);
    expect(code).toBe(2);
    expect(stderr).toEqual(['tracewright: an unexpected error stopped the run (x is undefined). Please report it.\n']);
  });

  test('with TRACEWRIGHT_DEBUG set, the stack follows the line', async () => {
    vi.stubEnv('TRACEWRIGHT_DEBUG', '1');
    runCli.mockRejectedValue(new Error('boom'));
    const code = await runMain(['analyse', 'a.csv']);
    expect(code).toBe(2);
    expect(stderr[0]).toBe('tracewright: an unexpected error stopped the run (boom). Please report it.\n');
    expect(stderr[1]).toMatch(/^Error: boom\n\s+at /);
  });
});
