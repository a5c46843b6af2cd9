import { Command } from "commander";
import { readCurve } from "../../curve/readCurve.js";
import { forecastCurve } from "../../forecast/forecast.js";
import { toJson, writeFileAtomic } from "../../io/files.js";
import type { CliIo } from "../io.js";
import { optionalInteger, optionalProbability, optionalSizeList } from "../parseOptions.js";

export function forecastCommand(io: CliIo): Command {
  return new Command("forecast")
    .description("fit the learning curve and project the score at larger training sizes")
    .argument("<curve>", "curve.json from headroom measure, or a CSV with columns trainingSize,score[,repeat]")
    .option(
      "--at <sizes>",
      "training sizes to project, e.g. 200,400,800 (default: 1, 1.5, 2, 3 and 5 times the data set)",
    )
    .option("--level <p>", "probability held by each interval (default 0.8)")
    .option("--seed <s>", "random seed of the resampling (default: the curve's seed, else 0)")
    .option("--json", "print forecast.json to standard output")
    .option("--out <file>", "where to write forecast.json")
    .action((curveFile: string, options: Record<string, string | boolean | undefined>) => {
      const curve = readCurve(curveFile);
      const forecast = forecastCurve(curve, {
        at: optionalSizeList("--at", options.at as string | undefined),
        level: optionalProbability("--level", options.level as string | undefined),
        seed: optionalInteger("--seed", options.seed as string | undefined, 0) ?? curve.seed ?? 0,
      });
      const json = toJson(forecast);
      if (typeof options.out === "string") writeFileAtomic(options.out, json, [curveFile]);
      if (options.json) io.stdout(json);
      else
        for (const p of forecast.projections)
          io.stdout(`${p.trainingSize}\t${p.expected.toFixed(4)}\t[${p.lower.toFixed(4)}, ${p.upper.toFixed(4)}]\n`);
    });
}
