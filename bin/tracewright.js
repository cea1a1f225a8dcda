#!/usr/bin/env node
// Tracewright's command line. The program is built from src/cli by the
// "prepare" script (npm install and npm ci run it) into dist-cli/.
import { existsSync } from 'node:fs';

const built = new URL('../dist-cli/main.js', import.meta.url);
if (!existsSync(built)) {
  process.stderr.write('tracewright: the command line is not built yet. Run "npm install" (or "npm run prepare") in the project folder first.\n');
  process.exitCode = 2;
} else {
  await import(built.href);
}
