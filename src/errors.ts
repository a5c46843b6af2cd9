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

/**
 * How a front end names an option of a library call, given the option's name in the call's options
 * object (`repeats`, `trainingSizes`): `--repeats` and `--sizes` on the command line,
 * `measure.repeats` and `measure.sizes` in a study file.
 */
export type OptionNamer = (option: string) => string;

/** The library's own naming: an option is called by its name in the options object. */
export const libraryNames: OptionNamer = (option) => option;

/**
 * An error's text: a string, or a function of the namer when the text mentions options, so that each
 * front end can name them its own way.
 */
export type ErrorText = string | ((name: OptionNamer) => string);

/** What an error is about, when it is an option of the library call. */
export interface ErrorSubject {
  option: string;
}

/**
 * Base class: an error a user can act on, with a one-line message. `message` names options as the
 * library does (`repeats: ...`); a front end says the same with its own names through `describe`.
 */
export class HeadroomError extends Error {
  readonly exitCode: ExitCodeValue;
  /** The option the error is about, if any; `describe` starts with its name. */
  readonly subject: ErrorSubject | undefined;
  private readonly text: ErrorText;
  constructor(text: ErrorText, exitCode: ExitCodeValue, subject?: ErrorSubject) {
    super(describeText(text, subject, libraryNames));
    this.name = new.target.name;
    this.exitCode = exitCode;
    this.subject = subject;
    this.text = text;
  }

  /** The one-line message, with options named by `name`. */
  describe(name: OptionNamer): string {
    return describeText(this.text, this.subject, name);
  }
}

function describeText(text: ErrorText, subject: ErrorSubject | undefined, name: OptionNamer): string {
  const body = typeof text === "string" ? text : text(name);
  return subject === undefined ? body : `${name(subject.option)}: ${body}`;
}

/** Wrong command-line use or option value. */
export class UsageError extends HeadroomError {
  constructor(text: ErrorText, subject?: ErrorSubject) {
    super(text, ExitCode.usage, subject);
  }
}

/** Bad content in an input file (CSV, JSON, plan). */
export class DataError extends HeadroomError {
  constructor(text: ErrorText, subject?: ErrorSubject) {
    super(text, ExitCode.data, subject);
  }
}

/** A curve could not be fitted or a forecast could not be made from the given points. */
export class FitError extends HeadroomError {
  constructor(text: ErrorText, subject?: ErrorSubject) {
    super(text, ExitCode.data, subject);
  }
}

/** An input file is missing or unreadable. */
export class InputError extends HeadroomError {
  constructor(text: ErrorText, subject?: ErrorSubject) {
    super(text, ExitCode.noInput, subject);
  }
}

/** An output could not be written. */
export class OutputError extends HeadroomError {
  constructor(text: ErrorText, subject?: ErrorSubject) {
    super(text, ExitCode.io, subject);
  }
}

/** The run was stopped (Ctrl-C) before it finished; work done so far may be resumed. */
export class InterruptedError extends HeadroomError {
  constructor(text: ErrorText, subject?: ErrorSubject) {
    super(text, ExitCode.interrupted, subject);
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
