import { Command } from "commander";
import { basename } from "node:path";
import { checkOutputPath, toJson, writeFileAtomic } from "../../io/files.js";
import { checkpointFileFor, removeCheckpoint } from "../../curve/checkpoint.js";
import type { CliIo } from "../io.js";
import { progressBar } from "../progress.js";
import { optionalFolds, optionalInteger, optionalSeconds, optionalSizeList } from "../parseOptions.js";
import { availableParallelism } from "node:os";

export function measureCommand(io: CliIo): Command {
  return new Command("measure")
    .description("measure the learning curve of a labeled CSV by repeated cross-validated subsampling")
    .argument("<data>", "CSV file with a header row")
    .requiredOption(
      "--label <column>",
      "column holding the class label (or the numeric target, with --task regression)",
    )
    .option("--group <column>", "column naming the run (batch) each row came from")
    .option("--ignore <columns>", "comma-separated columns to leave out of the features")
    .option("--task <kind>", "classification or regression (default: from --learner or --metric, else classification)")
    .option("--learner <name>", "learner (default: logistic; ridge for regression)")
    .option("--metric <name>", "score of each fit (default: accuracy; rmse for regression)")
    .option("--tune", "tune the learner's settings by inner 3-fold cross-validation at every training size")
    .option("--by-runs", "measure against whole runs of --group: training sets of whole runs, sizes in runs")
    .option("--folds <k>", "cross-validation folds, or loo for leave-one-out (default 5)")
    .option("--repeats <r>", "repeats of the k-fold with fresh folds (default 10)")
    .option("--sizes <list>", "training sizes, e.g. 20,40,80 (default: 8 geometric sizes up to the whole pool)")
    .option("--seed <s>", "random seed (default 0)")
    .option("--workers <w>", "most threads (or trainer processes) to fit on at once (default: the number of cores)")
    .option("--trainer <command>", "shell command of your own program that fits and predicts (see examples/README.md)")
    .option("--trainer-timeout <seconds>", "stop a trainer's fit that runs longer, as a failure")
    .option("--on <place>", "where the fits run: local (default) or slurm (one job array)")
    .option("--tasks-dir <dir>", "with --on slurm: folder the cluster's nodes share, for the tasks and results")
    .option("--slurm-options <options>", "with --on slurm: sbatch options, e.g. '--partition=short --time=1:00:00'")
    .option("--submit-only", "with --on slurm: print the job id and exit; gather later with headroom collect")
    .option("--quiet", "draw no progress bar")
    .option("--resume", "continue an interrupted run from its checkpoint (<out>.checkpoint.jsonl)")
    .requiredOption("--out <file>", "where to write curve.json")
    .action(async (data: string, options: Record<string, string | boolean | undefined>) => {
      // Imported when the command runs, so that the other commands do not load the learners.
      const { measureFile } = await import("../../curve/measureFile.js");
      const progress = progressBar(io, options.quiet === true);
      const out = options.out as string;
      checkOutputPath(out, [data]);
      const checkpoint = checkpointFileFor(out);
      const on = options.on as string | undefined;
      const curve = await measureFile(data, {
        on,
        tasksDir: options.tasksDir as string | undefined,
        slurmOptions: options.slurmOptions as string | undefined,
        submitOnly: options.submitOnly === true,
        out,
        trainer: options.trainer as string | undefined,
        trainerTimeout: optionalSeconds(options.trainerTimeout as string | undefined),
        onProgress: progress.onProgress,
        label: options.label as string,
        group: options.group as string | undefined,
        ignore: typeof options.ignore === "string" ? options.ignore.split(",").map((c) => c.trim()) : undefined,
        folds: optionalFolds(options.folds as string | undefined),
        task: options.task as "classification" | "regression" | undefined,
        learner: options.learner as string | undefined,
        metric: options.metric as string | undefined,
        tune: options.tune === true,
        byRuns: options.byRuns === true,
        repeats: optionalInteger("--repeats", options.repeats as string | undefined, 1),
        trainingSizes: optionalSizeList("--sizes", options.sizes as string | undefined),
        seed: optionalInteger("--seed", options.seed as string | undefined, 0),
        workers: optionalInteger("--workers", options.workers as string | undefined, 1) ?? availableParallelism(),
        checkpoint: { file: checkpoint, resume: options.resume === true },
        signal: io.signal,
      })
        .catch((error: unknown) => {
          if (!(error instanceof Error) || error.name !== "JobSubmitted") throw error;
          const jobId = (error as Error & { jobId: string }).jobId;
          io.stdout(`${jobId}\n`);
          if (!options.quiet)
            io.stderr(
              `submitted job ${jobId}; once it has ended, gather the curve with: headroom collect ${options.tasksDir as string} --out ${out}\n`,
            );
          return undefined;
        })
        .finally(() => progress.stop());
      if (curve === undefined) return;
      writeFileAtomic(out, toJson(curve), [data]);
      removeCheckpoint(checkpoint);
      if (!options.quiet) {
        for (const warning of curve.warnings ?? []) io.stderr(`warning: ${warning}\n`);
        io.stderr(`wrote ${options.out} (${curve.points.length} training sizes from ${basename(data)})\n`);
      }
    });
}
