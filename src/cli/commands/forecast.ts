import { Command } from "commander";
import { UsageError } from "../../errors.js";
import type { ForecastFile } from "../../forecast/forecastFile.js";
import { toJson, writeFileAtomic } from "../../io/files.js";
import { message } from "../../messages.js";
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
    .option(
      "--family <name>",
      "use only this curve family: pow3, pow4, mmf4, wbl4, exp3, ilog2 or last (default: all, weighted by their backtest)",
    )
    .option("--target <score>", "a score to reach: also report the smallest training size reaching it")
    .option("--confidence <p>", "probability with which --target should be reached (default 0.8)")
    .option("--test-size <rows>", "test rows behind the single-model interval (default: the data set's rows)")
    .option(
      "--classes <k>",
      "classes of a classification curve read from CSV (curve.json records them); the forecast counts more of the distance left to the best score as winnable with more classes",
    )
    .option("--json", "print forecast.json to standard output")
    .option("--out <file>", "where to write forecast.json")
    .option("--quiet", "print no summary and no warnings (they stay in forecast.json)")
    .action(async (curveFile: string, options: Record<string, string | boolean | undefined>) => {
      // Imported when the command runs, so that the other commands do not load them.
      const [{ readCurve }, { forecastCurve }] = await Promise.all([
        import("../../curve/readCurve.js"),
        import("../../forecast/forecast.js"),
      ]);
      const curve = readCurve(curveFile);
      const forecast = forecastCurve(curve, {
        at: optionalSizeList("--at", options.at as string | undefined),
        level: optionalProbability("--level", options.level as string | undefined),
        seed: optionalInteger("--seed", options.seed as string | undefined, 0) ?? curve.seed ?? 0,
        family: options.family as string | undefined,
        target: optionalNumber("--target", options.target as string | undefined),
        confidence: optionalProbability("--confidence", options.confidence as string | undefined),
        testSize: optionalInteger("--test-size", options.testSize as string | undefined, 1),
        classes: optionalInteger("--classes", options.classes as string | undefined, 2),
      });
      const json = toJson(forecast);
      if (typeof options.out === "string") writeFileAtomic(options.out, json, [curveFile]);
      if (options.json) io.stdout(json);
      else if (!options.quiet) io.stdout(forecastSummary(forecast));
      if (!options.quiet) for (const warning of forecast.warnings) io.stderr(`warning: ${warning}\n`);
    });
}

/** A number, or undefined when the option was not given. */
function optionalNumber(option: string, text: string | undefined): number | undefined {
  if (text === undefined) return undefined;
  const value = Number(text.trim());
  if (text.trim() === "" || !Number.isFinite(value))
    throw new UsageError(message.optionProblem(option, message.badNumber(text)));
  return value;
}

/** The forecast as a short text table: one line per projection, then the families and any target. */
export function forecastSummary(forecast: ForecastFile): string {
  const percent = Math.round(100 * forecast.level);
  const lines = [
    `training size\t× measured\texpected\t${percent}% interval (expected score)\t${percent}% interval (one model, ${forecast.testSize ?? "?"} test rows)`,
  ];
  const score = (value: number) => value.toFixed(4);
  for (const p of forecast.projections) {
    const single =
      p.singleModelLower === undefined || p.singleModelUpper === undefined
        ? ""
        : `[${score(p.singleModelLower)}, ${score(p.singleModelUpper)}]`;
    const ratio = p.trainingSize / forecast.largestMeasuredSize;
    lines.push(
      `${p.trainingSize}\t${ratio.toFixed(1)}\t${score(p.expected)}\t[${score(p.lower)}, ${score(p.upper)}]\t${single}`,
    );
  }
  if (forecast.familyWeights !== undefined) {
    const weights = Object.entries(forecast.familyWeights)
      .sort((a, b) => b[1] - a[1])
      .map(([name, weight]) => `${name} ${Math.round(100 * weight)}%`);
    lines.push(`families: ${weights.join(", ")}`);
  }
  const answer = forecast.targetSize;
  if (answer !== undefined) {
    const size = (value: number | null) => (value === null ? `not within ${answer.searchedUpTo}` : String(value));
    lines.push(
      `target ${answer.target}: expected score reaches it at training size ${size(answer.expected)}; ` +
        `with ${Math.round(100 * answer.confidence)}% probability at ${size(answer.withConfidence)}`,
    );
  }
  return `${lines.join("\n")}\n`;
}
