/**
 * Error classes that carry their exit code. Library code throws these; only the bin file turns them
 * into a line on stderr and `process.exitCode`. Exit codes follow the BSD sysexits convention so a
 * calling script can tell a usage mistake from bad data from a bug.
 */

export const ExitCode = {
  ok: 0,
  /** The command line was wrong: unknown option, bad value, missing argument. */
  usage: 64,
  /** The input data or a file's content was wrong. */
  data: 65,
  /** An input file does not exist or cannot be read. */
  noInput: 66,
  /** A bug in headroom. */
  internal: 70,
  /** An output could not be written. */
  io: 74,
  /** Work handed elsewhere (a SLURM job array) is not all back yet: collect again later. */
  incomplete: 75,
  /** The user's own trainer (`--trainer`) failed a fit or broke the file protocol. */
  trainer: 76,
  /** Stopped by Ctrl-C (SIGINT): 128 + the signal's number, as shells report it. */
  interrupted: 130,
  /** Stopped by SIGTERM (a scheduler's or service manager's stop): 128 + 15. */
  terminated: 143,
} as const;

export type ExitCodeValue = (typeof ExitCode)[keyof typeof ExitCode];

/** Base class: an error a user can act on, with a one-line message. */
export class HeadroomError extends Error {
  readonly exitCode: ExitCodeValue;
  constructor(message: string, exitCode: ExitCodeValue) {
    super(message);
    this.name = new.target.name;
    this.exitCode = exitCode;
  }
}

/** Wrong command-line use or option value. */
export class UsageError extends HeadroomError {
  constructor(message: string) {
    super(message, ExitCode.usage);
  }
}

/** Bad content in an input file (CSV, JSON, plan). */
export class DataError extends HeadroomError {
  constructor(message: string) {
    super(message, ExitCode.data);
  }
}

/** A curve could not be fitted or a forecast could not be made from the given points. */
export class FitError extends HeadroomError {
  constructor(message: string) {
    super(message, ExitCode.data);
  }
}

/** An input file is missing or unreadable. */
export class InputError extends HeadroomError {
  constructor(message: string) {
    super(message, ExitCode.noInput);
  }
}

/** An output could not be written. */
export class OutputError extends HeadroomError {
  constructor(message: string) {
    super(message, ExitCode.io);
  }
}

/** The run was stopped (Ctrl-C) before it finished; work done so far may be resumed. */
export class InterruptedError extends HeadroomError {
  constructor(message: string) {
    super(message, ExitCode.interrupted);
  }
}

/** A fit run by the user's own trainer program failed (exit code, missing or malformed predictions). */
export class TrainerError extends HeadroomError {
  constructor(message: string) {
    super(message, ExitCode.trainer);
  }
}

/** Some tasks handed to a cluster have no result yet (still running, failed or never run). */
export class IncompleteError extends HeadroomError {
  constructor(message: string) {
    super(message, ExitCode.incomplete);
  }
}
