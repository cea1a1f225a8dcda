import { defineConfig } from 'vitest/config';
import react from '@vitejs/plugin-react';

// The built page is served with a strict Content-Security-Policy (see index.html):
// no eval, no remote scripts, workers only from this origin.
export default defineConfig({
  plugins: [react()],
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
