/** A CliIo that keeps what a command prints, for tests that run the CLI in-process. */
import type { CliIo } from "../../src/cli/io.js";

export function capture(): { io: CliIo; stdout: () => string; stderr: () => string } {
  const out: string[] = [];
  const err: string[] = [];
  return {
    io: { stdout: (t: string) => void out.push(t), stderr: (t: string) => void err.push(t), stderrIsTerminal: false },
    stdout: () => out.join(""),
    stderr: () => err.join(""),
  };
}
