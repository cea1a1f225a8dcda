import { defineConfig } from '@playwright/test';

// End-to-end tests drive the system Chromium (Debian's `chromium` package);
// no browser is downloaded. Point elsewhere with TRACEWRIGHT_CHROMIUM=/path/to/chrome.
const executablePath = process.env.TRACEWRIGHT_CHROMIUM ?? '/usr/bin/chromium';
// Several checkouts may test side by side on one machine: TRACEWRIGHT_E2E_PORT moves the preview server.
const port = Number(process.env.TRACEWRIGHT_E2E_PORT ?? 4173);

export default defineConfig({
  testDir: 'e2e',
  timeout: 60_000,
  workers: 1,
  retries: 0,
  reporter: process.env.CI ? 'list' : 'line',
  use: {
    baseURL: `http://127.0.0.1:${port}`,
    launchOptions: {
      executablePath,
      args: [
        '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run',
        '--disable-background-networking', '--disable-component-update', '--disable-sync',
      ],
    },
    viewport: { width: 1400, height: 900 },
  },
  webServer: {
    command: `npx vite preview --host 127.0.0.1 --port ${port} --strictPort`,
    url: `http://127.0.0.1:${port}`,
    reuseExistingServer: !process.env.CI,
    timeout: 60_000,
  },
});
