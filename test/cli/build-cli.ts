/**
 * Build the command line the way "npm run prepare" does (vite.cli.config.ts)
 * into a fresh folder under node_modules/.cache (so the built file finds the
 * project's packages), laid out like the project: dist-cli/main.js and a
 * copy of bin/tracewright.js beside it. Tests run what a user runs (plain
 * JavaScript in Node, no TypeScript at run time) without relying on a
 * dist-cli/ that may be older than the source.
 */
import { copyFileSync, mkdirSync, mkdtempSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { build } from 'vite';

export interface BuiltCli {
  /** The folder holding bin/ and dist-cli/. */
  root: string;
  /** bin/tracewright.js: what npm links and npx runs. */
  bin: string;
}

export async function buildCli(): Promise<BuiltCli> {
  const base = resolve('node_modules/.cache');
  mkdirSync(base, { recursive: true });
  const root = mkdtempSync(join(base, 'tracewright-cli-'));
  await build({ configFile: resolve('vite.cli.config.ts'), logLevel: 'silent', build: { outDir: join(root, 'dist-cli'), emptyOutDir: true } });
  mkdirSync(join(root, 'bin'));
  const bin = join(root, 'bin', 'tracewright.js');
  copyFileSync(resolve('bin/tracewright.js'), bin);
  return { root, bin };
}
