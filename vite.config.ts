import { defineConfig } from 'vitest/config';
import react from '@vitejs/plugin-react';
import type { Plugin, ResolvedConfig } from 'vite';
import { createHash } from 'node:crypto';
import { readdirSync, readFileSync, statSync, writeFileSync } from 'node:fs';
import { join, relative, resolve, sep } from 'node:path';

/** The Content-Security-Policy of the built page: no eval, no remote anything. */
export const CSP = [
  "default-src 'self'",
  "script-src 'self'",
  "worker-src 'self'",
  "style-src 'self' 'unsafe-inline'",
  "img-src 'self' data: blob:",
  "font-src 'self'",
  "connect-src 'self'",
  "object-src 'none'",
  "frame-src 'none'",
  "manifest-src 'self'",
  "base-uri 'none'",
  "form-action 'none'",
].join('; ');

// Only the built page gets the policy: the dev server injects inline scripts for hot reload.
const cspPlugin: Plugin = {
  name: 'tracewright-csp',
  apply: 'build',
  transformIndexHtml(html) {
    return html.replace('<meta charset="UTF-8" />', `<meta charset="UTF-8" />\n    <meta http-equiv="Content-Security-Policy" content="${CSP}" />`);
  },
};

/** Every file under `dir`, as paths relative to it with forward slashes. */
function filesUnder(dir: string): string[] {
  const out: string[] = [];
  const walk = (d: string) => {
    for (const name of readdirSync(d)) {
      const p = join(d, name);
      if (statSync(p).isDirectory()) walk(p);
      else out.push(relative(dir, p).split(sep).join('/'));
    }
  };
  walk(dir);
  return out.sort();
}

/**
 * The offline copy: after the build is written, sw.js is made from
 * src/offline/service-worker.js with the list of every file of the build
 * and a digest of their contents (so a new build replaces the old copy).
 */
function offlinePlugin(): Plugin {
  let config: ResolvedConfig;
  return {
    name: 'tracewright-offline',
    apply: 'build',
    configResolved(c) { config = c; },
    closeBundle() {
      if (config.build.ssr) return;
      const outDir = resolve(config.root, config.build.outDir);
      const files = filesUnder(outDir).filter((f) => f !== 'sw.js');
      const digest = createHash('sha256');
      for (const f of files) digest.update(f).update(readFileSync(join(outDir, f)));
      const source = readFileSync(resolve(config.root, 'src/offline/service-worker.js'), 'utf8')
        .replace("const VERSION = '__TRACEWRIGHT_VERSION__';", `const VERSION = '${digest.digest('hex').slice(0, 16)}';`)
        .replace('const FILES = __TRACEWRIGHT_FILES__;', `const FILES = ${JSON.stringify(['./', ...files], null, 2)};`);
      if (source.includes("'__TRACEWRIGHT_VERSION__'") || source.includes('= __TRACEWRIGHT_FILES__')) throw new Error('src/offline/service-worker.js: a placeholder was not filled in');
      writeFileSync(join(outDir, 'sw.js'), source);
    },
  };
}

// The built page is served with a strict Content-Security-Policy (see index.html):
// no eval, no remote scripts, workers only from this origin.
export default defineConfig({
  plugins: [react(), cspPlugin, offlinePlugin()],
  base: './',
  worker: { format: 'es' },
  build: { target: 'es2022', chunkSizeWarningLimit: 6000 },
  server: { port: 5173 },
  preview: { port: 4173, strictPort: true },
  test: {
    include: ['test/**/*.test.ts'],
    environment: 'node',
    testTimeout: 30000,
  },
});
