/**
 * The command line's entry point (bin/tracewright.js loads the built copy
 * of this file). In a worker thread started for --jobs it serves jobs
 * instead. The exit status is set, never forced, so every file written is
 * flushed before the process ends.
 */
import { isMainThread, parentPort, workerData } from 'node:worker_threads';
import type { JobSetup } from './job.ts';
import { runCli, workerLoop } from './run.ts';

const job = (workerData as { tracewrightJob?: JobSetup } | null)?.tracewrightJob;
if (!isMainThread && parentPort && job) {
  workerLoop(parentPort, job);
} else {
  try {
    process.exitCode = await runCli(process.argv.slice(2), {
      stdout: (t) => process.stdout.write(t),
      stderr: (t) => process.stderr.write(t),
      stderrIsTTY: process.stderr.isTTY === true,
      columns: process.stderr.columns,
      cwd: process.cwd(),
      env: process.env,
      workerUrl: new URL(import.meta.url),
    });
  } catch (e) {
    // A fault in the tool, not in the user's files: one line, no stack trace unless asked for.
    process.stderr.write(`tracewright: an unexpected error stopped the run (${e instanceof Error ? e.message : String(e)}). Please report it.\n`);
    if (process.env.TRACEWRIGHT_DEBUG) process.stderr.write(`${e instanceof Error ? e.stack : ''}\n`);
    process.exitCode = 2;
  }
}
