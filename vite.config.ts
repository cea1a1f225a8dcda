import { defineConfig } from 'vitest/config';
import react from '@vitejs/plugin-react';
import type { Plugin } from 'vite';

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

// The built page is served with a strict Content-Security-Policy (see index.html):
// no eval, no remote scripts, workers only from this origin.
export default defineConfig({
  plugins: [react(), cspPlugin],
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
