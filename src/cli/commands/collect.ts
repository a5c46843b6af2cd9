import { Command } from "commander";
import { checkOutputPath, toJson, writeFileAtomic } from "../../io/files.js";
import type { CliIo } from "../io.js";

/** `headroom collect DIR --out curve.json`: the curve of a measurement run as a SLURM job array. */
export function collectCommand(io: CliIo): Command {
  return new Command("collect")
    .description("gather the results of headroom measure --on slurm into curve.json (exits non-zero until all are in)")
    .argument("<dir>", "the --tasks-dir of the measurement")
    .requiredOption("--out <file>", "where to write curve.json")
    .option("--quiet", "print nothing on success")
    .action(async (dir: string, options: { out: string; quiet?: boolean }) => {
      const { collectCurve } = await import("../../curve/measureFile.js");
      checkOutputPath(options.out);
      const { curve, dataFile } = await collectCurve(dir);
      writeFileAtomic(options.out, toJson(curve), [dataFile]);
      if (!options.quiet) {
        for (const warning of curve.warnings ?? []) io.stderr(`warning: ${warning}\n`);
        io.stderr(`wrote ${options.out} (${curve.points.length} training sizes, every task in)\n`);
      }
    });
}

/** `headroom run-task DIR --element N`: what each SLURM array element runs (not for users). */
export function runTaskCommand(): Command {
  return new Command("run-task")
    .description("run one job-array element's fit tasks from a tasks folder (used by --on slurm)")
    .argument("<dir>", "the tasks folder")
    .requiredOption("--element <n>", "the array element (SLURM_ARRAY_TASK_ID)")
    .action(async (dir: string, options: { element: string }) => {
      const { runTaskElement } = await import("../../cluster/slurm.js");
      await runTaskElement(dir, /^\d+$/.test(options.element.trim()) ? Number(options.element) : -1);
    });
}
