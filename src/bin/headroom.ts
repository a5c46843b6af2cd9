#!/usr/bin/env node
/**
 * The headroom executable: the only file that touches `process`.
 *
 * Ctrl-C (SIGINT) aborts the run's signal: a measurement stops after the fits under way, keeps the
 * finished ones in its checkpoint, and the run ends with one line saying how to resume and exit code
 * 130. A second Ctrl-C stops at once (the checkpoint is written a whole line at a time, so it stays
 * readable). SIGTERM (what `kill`, a batch scheduler or a service manager sends) stops the same
 * orderly way, with exit code 143.
 */
import { run } from "../cli/program.js";
import { ExitCode } from "../errors.js";

const interruption = new AbortController();
process.on("SIGINT", () => {
  if (!interruption.signal.aborted) {
    interruption.abort();
    return;
  }
  process.stderr.write("headroom: interrupted again; stopping now (finished fits stay in the checkpoint)\n");
  process.exit(ExitCode.interrupted);
});

let terminated = false;
process.on("SIGTERM", () => {
  terminated = true;
  interruption.abort();
});

const code = await run(process.argv.slice(2), {
  stdout: (text) => process.stdout.write(text),
  stderr: (text) => process.stderr.write(text),
  stderrIsTerminal: process.stderr.isTTY === true,
  signal: interruption.signal,
});
process.exitCode = terminated && code === ExitCode.interrupted ? ExitCode.terminated : code;
