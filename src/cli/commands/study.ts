import { Command } from "commander";
import { availableParallelism } from "node:os";
import { basename, extname, join } from "node:path";
import type { CliIo } from "../io.js";
import { progressBar } from "../progress.js";
import { optionalInteger } from "../parseOptions.js";

/** Options shared by `study` and `demo`. */
export function addRunOptions(command: Command): Command {
  return command
    .option("--workers <w>", "most threads to fit on, started when worth it (default: the number of cores)")
    .option("--resume", "continue an interrupted run from its checkpoint (<out>/curve.json.checkpoint.jsonl)")
    .option("--quiet", "draw no progress bar and print nothing on success");
}

/** Runs a study file with progress on a terminal and a summary at the end. */
export async function runStudyFromCli(
  io: CliIo,
  studyFile: string,
  outDir: string,
  options: Record<string, string | boolean | undefined>,
  commandLine: string,
): Promise<void> {
  const progress = progressBar(io, options.quiet === true);
  // Imported here, not at the top: a study loads every stage, the report's vega modules included.
  const { runStudy } = await import("../../study/runStudy.js");
  const result = await runStudy(studyFile, {
    outDir,
    workers: optionalInteger("--workers", options.workers as string | undefined, 1) ?? availableParallelism(),
    command: commandLine,
    onProgress: progress.onProgress,
    resume: options.resume === true,
    signal: io.signal,
  }).finally(() => progress.stop());
  if (!options.quiet) {
    const { decision } = result;
    io.stdout(`recommended: ${decision.recommendedRuns} further run(s). ${decision.reasons.recommendedRuns}\n`);
    if (decision.reasons.runsToTarget) io.stdout(`target: ${decision.reasons.runsToTarget}\n`);
    for (const warning of result.curve.warnings ?? []) io.stderr(`warning: ${warning}\n`);
    io.stderr(`wrote ${result.written.join(", ")}\n`);
  }
}

export function studyCommand(io: CliIo, commandLine: string): Command {
  return addRunOptions(
    new Command("study")
      .description("run the whole job from one study file: measure, forecast, weigh and report")
      .argument("<study>", "study.json naming the data, label, options and plan")
      .option("--out <dir>", "folder for the outputs (default: reports/<study name>)"),
  ).action(async (studyFile: string, options: Record<string, string | boolean | undefined>) => {
    const outDir =
      typeof options.out === "string" ? options.out : join("reports", basename(studyFile, extname(studyFile)));
    await runStudyFromCli(io, studyFile, outDir, options, commandLine);
  });
}
