/** What a command may touch of the outside world; tests pass their own. */
export interface CliIo {
  stdout(text: string): void;
  stderr(text: string): void;
  /** Whether stderr is a terminal (progress bars are drawn only then). */
  stderrIsTerminal: boolean;
  /** Aborted when the user asks the run to stop (Ctrl-C); long measurements then stop between fits. */
  signal?: AbortSignal;
}
