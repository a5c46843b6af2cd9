import { Command } from "commander";
import { SingleBar } from "cli-progress";
import { basename } from "node:path";
import { measureFile } from "../../pipeline.js";
import { toJson, writeFileAtomic } from "../../io/files.js";
import type { CliIo } from "../io.js";
import { optionalInteger, optionalSizeList } from "../parseOptions.js";
import { availableParallelism } from "node:os";

export function measureCommand(io: CliIo): Command {
  return new Command("measure")
    .description("measure the learning curve of a labelled CSV by repeated cross-validated subsampling")
    .argument("<data>", "CSV file with a header row")
    .requiredOption("--label <column>", "column holding the class label")
    .option("--group <column>", "column naming the run (batch) each row came from")
    .option("--ignore <columns>", "comma-separated columns to leave out of the features")
    .option("--folds <k>", "cross-validation folds (default 5)")
    .option("--repeats <r>", "repeats of the k-fold with fresh folds (default 10)")
    .option("--sizes <list>", "training sizes, e.g. 20,40,80 (default: 8 geometric sizes up to the whole pool)")
    .option("--seed <s>", "random seed (default 0)")
    .option("--workers <w>", "worker threads (default: the number of cores)")
    .option("--quiet", "draw no progress bar")
    .requiredOption("--out <file>", "where to write curve.json")
    .action(async (data: string, options: Record<string, string | boolean | undefined>) => {
      const bar =
        !options.quiet && io.stderrIsTerminal
          ? new SingleBar({ format: "fits {bar} {value}/{total} | {eta}s left" })
          : undefined;
      const curve = await measureFile(data, {
        label: options.label as string,
        group: options.group as string | undefined,
        ignore: typeof options.ignore === "string" ? options.ignore.split(",").map((c) => c.trim()) : undefined,
        folds: optionalInteger("--folds", options.folds as string | undefined, 2),
        repeats: optionalInteger("--repeats", options.repeats as string | undefined, 1),
        trainingSizes: optionalSizeList("--sizes", options.sizes as string | undefined),
        seed: optionalInteger("--seed", options.seed as string | undefined, 0),
        workers: optionalInteger("--workers", options.workers as string | undefined, 1) ?? availableParallelism(),
        onProgress: bar
          ? (done, total) => {
              if (done === 1) bar.start(total, 0);
              bar.update(done);
              if (done === total) bar.stop();
            }
          : undefined,
      });
      writeFileAtomic(options.out as string, toJson(curve), [data]);
      if (!options.quiet)
        io.stderr(`wrote ${options.out} (${curve.points.length} training sizes from ${basename(data)})\n`);
    });
}
