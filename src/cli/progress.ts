/**
 * The progress bar of long measurements, drawn on stderr only when it is a terminal. A resumed run
 * starts the bar at the fits its checkpoint already holds.
 */
import type * as CliProgress from "cli-progress";
import { createRequire } from "node:module";
import type { CliIo } from "./io.js";

export interface Progress {
  /** Hand to the library's `onProgress`; undefined when no bar is drawn. */
  onProgress?: (done: number, total: number) => void;
  /** Ends the bar's line (after success or failure), so that messages start on a line of their own. */
  stop(): void;
}

export function progressBar(io: CliIo, quiet: boolean): Progress {
  if (quiet || !io.stderrIsTerminal) return { stop: () => {} };
  // Loaded only when a bar is drawn, and with `require` (a CommonJS module; see data/csv.ts).
  const { SingleBar } = createRequire(import.meta.url)("cli-progress") as typeof CliProgress;
  const bar = new SingleBar({ format: "fits {bar} {value}/{total} | {eta}s left" });
  let active = false;
  return {
    onProgress: (done, total) => {
      if (!active) bar.start(total, done - 1);
      active = true;
      bar.update(done);
      if (done === total) {
        bar.stop();
        active = false;
      }
    },
    stop: () => {
      if (active) bar.stop();
      active = false;
    },
  };
}
