#!/usr/bin/env node
/**
 * `npm start` (issue 17): the dev server, opening a browser only where one
 * can be opened. On a machine without a desktop (no DISPLAY or
 * WAYLAND_DISPLAY, or no xdg-open) it prints the address to open instead of
 * letting the opener fail with a stack trace.
 */
import { spawn } from 'node:child_process';
import { accessSync, constants } from 'node:fs';
import { delimiter, join } from 'node:path';

function onPath(cmd) {
  for (const dir of (process.env.PATH ?? '').split(delimiter)) {
    try { accessSync(join(dir, cmd), constants.X_OK); return true; } catch { /* not here */ }
  }
  return false;
}

/** Why no browser can be opened here, or null when one can. */
export function whyNoBrowser(env = process.env, platform = process.platform, has = onPath) {
  if (env.BROWSER === 'none') return 'BROWSER=none is set';
  if (platform === 'darwin' || platform === 'win32') return null;
  if (!env.DISPLAY && !env.WAYLAND_DISPLAY) return 'there is no desktop here (neither DISPLAY nor WAYLAND_DISPLAY is set)';
  if (!has('xdg-open')) return 'xdg-open, which opens the browser on Linux, is not installed';
  return null;
}

const isMain = import.meta.url === `file://${process.argv[1]}`;
if (isMain) {
  const why = whyNoBrowser();
  const args = ['vite', ...(why ? [] : ['--open']), ...process.argv.slice(2)];
  if (why) console.log(`Tracewright: not opening a browser because ${why}. Open the "Local" address below in a browser on this machine.`);
  const child = spawn('npx', ['--no-install', ...args], { stdio: 'inherit', shell: process.platform === 'win32' });
  child.on('exit', (code) => process.exit(code ?? 0));
}
