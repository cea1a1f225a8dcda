import { test } from '@playwright/test';
import { execFile } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { buildCli, type BuiltCli } from '../test/cli/build-cli.ts';

/**
 * For specs that compare the page with the command line: builds the command line once for the spec file,
 * gives a scratch folder, and removes both afterwards. Call at the top level of a spec file.
 */
export function useBuiltCli(prefix: string): { work: string; cli: (args: string[]) => Promise<{ code: number; stderr: string }> } {
  let built: BuiltCli | undefined;
  const work = mkdtempSync(join(tmpdir(), prefix));
  test.beforeAll(async () => {
    test.setTimeout(180_000);
    built = await buildCli();
  });
  test.afterAll(() => {
    rmSync(work, { recursive: true, force: true });
    if (built) rmSync(built.root, { recursive: true, force: true });
  });
  const cli = (args: string[]): Promise<{ code: number; stderr: string }> =>
    new Promise((done) => execFile(process.execPath, [built!.bin, ...args], { env: { ...process.env } }, (err, _out, stderr) => done({ code: err ? Number(err.code) : 0, stderr })));
  return { work, cli };
}
