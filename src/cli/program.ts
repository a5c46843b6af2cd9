/**
 * The command line: a thin shell over the library. One small file per command under commands/;
 * this file assembles them and turns every failure into one line on stderr and an exit code.
 */
import { Command, CommanderError } from "commander";
import { ExitCode, HeadroomError, type ExitCodeValue, type OptionNamer } from "../errors.js";
import { toolVersion } from "../version.js";
import { collectCommand, runTaskCommand } from "./commands/collect.js";
import { demoCommand } from "./commands/demo.js";
import { forecastCommand } from "./commands/forecast.js";
import { measureCommand } from "./commands/measure.js";
import { reportCommand } from "./commands/report.js";
import { studyCommand } from "./commands/study.js";
import { weighCommand } from "./commands/weigh.js";
import type { CliIo } from "./io.js";

export function buildProgram(io: CliIo, argv: readonly string[]): Command {
  const commandLine = ["headroom", ...argv].map(quoteArgument).join(" ");
  const program = new Command("headroom")
    .description("Is another costly run of data worth it? Measure the learning curve, forecast it, weigh the cost.")
    .version(toolVersion)
    .option("--debug", "print the full error with its stack trace on failure")
    .showHelpAfterError(false)
    .exitOverride()
    .configureOutput({
      writeOut: (text) => io.stdout(text),
      // Commander's own error lines are replaced by ours in run().
      writeErr: () => {},
    });
  for (const command of [
    measureCommand(io),
    collectCommand(io),
    forecastCommand(io),
    weighCommand(io),
    reportCommand(io, commandLine),
    studyCommand(io, commandLine),
    demoCommand(io, commandLine),
  ]) {
    program.addCommand(command.exitOverride().configureOutput({ writeOut: (t) => io.stdout(t), writeErr: () => {} }));
  }
  program.addCommand(
    runTaskCommand()
      .exitOverride()
      .configureOutput({ writeOut: (t) => io.stdout(t), writeErr: () => {} }),
    { hidden: true },
  );
  return program;
}

/** Options whose flag is not the library option's name in kebab case. */
const flagOfOption: Readonly<Record<string, string>> = { trainingSizes: "--sizes" };

/** The command line's name of a library option: `repeats` → `--repeats`, `byRuns` → `--by-runs`. */
export const commandLineNames: OptionNamer = (option) =>
  flagOfOption[option] ?? `--${option.replace(/[A-Z]/g, (c) => `-${c.toLowerCase()}`)}`;

/**
 * Runs headroom with `argv` (without node and script) and returns the exit code. Never throws.
 */
export async function run(argv: readonly string[], io: CliIo): Promise<ExitCodeValue> {
  const debug = argv.includes("--debug");
  const program = buildProgram(io, argv);
  try {
    await program.parseAsync([...argv], { from: "user" });
    return ExitCode.ok;
  } catch (error) {
    if (error instanceof CommanderError) {
      if (error.code === "commander.helpDisplayed" || error.code === "commander.version" || error.exitCode === 0) {
        return ExitCode.ok;
      }
      if (error.code === "commander.help") return ExitCode.usage;
      io.stderr(`headroom: ${error.message.replace(/^error: /, "").split("\n")[0]}\n`);
      return ExitCode.usage;
    }
    if (error instanceof HeadroomError) {
      io.stderr(`headroom: ${error.describe(commandLineNames)}\n`);
      if (debug) io.stderr(`${error.stack}\n`);
      return error.exitCode;
    }
    const detail = error instanceof Error ? error.message : String(error);
    io.stderr(`headroom: internal error: ${detail.split("\n")[0]} (rerun with --debug for details)\n`);
    if (debug) io.stderr(`${(error as Error)?.stack ?? detail}\n`);
    return ExitCode.internal;
  }
}

function quoteArgument(argument: string): string {
  return /^[\w@%+=:,./-]+$/.test(argument) ? argument : `'${argument.replace(/'/g, `'\\''`)}'`;
}
