#!/usr/bin/env node
/** The headroom executable: the only file that touches `process`. */
import { run } from "../cli/program.js";

process.exitCode = await run(process.argv.slice(2), {
  stdout: (text) => process.stdout.write(text),
  stderr: (text) => process.stderr.write(text),
  stderrIsTerminal: process.stderr.isTTY === true,
});
