import { Command } from "commander";
import { dirname, join } from "node:path";
import { DataError } from "../../errors.js";
import { writeFileAtomic } from "../../io/files.js";
import { message } from "../../messages.js";
import { toolVersion } from "../../version.js";
import type { CliIo } from "../io.js";

/**
 * `headroom report`: the HTML report from curve.json, forecast.json and, optionally, decision.json,
 * written to --out; next to it, in the same folder, each chart as SVG and PNG and (with a decision)
 * decision.csv, unless --no-chart-files.
 */
export function reportCommand(io: CliIo, commandLine: string): Command {
  return new Command("report")
    .description(
      "write a self-contained HTML report from a curve, a forecast and, optionally, a decision; " +
        "each chart as SVG and PNG and the decision table as CSV go next to it",
    )
    .requiredOption("--curve <file>", "curve.json from headroom measure")
    .requiredOption("--forecast <file>", "forecast.json from headroom forecast")
    .option("--decision <file>", "decision.json from headroom weigh")
    .option("--title <text>", "title shown at the top of the report")
    .option("--domain <name>", "what the model's decisions touch (clinical, public-health, safety, ...): adds cautions")
    .option("--currency <code>", "currency of costs and values, shown with every amount (EUR, USD, ...)")
    .option("--no-chart-files", "write only the HTML report, without the chart SVG/PNG files and decision.csv")
    .option("--quiet", "print nothing on success")
    .requiredOption("--out <file>", "where to write report.html (the other files go to the same folder)")
    .action(async (options: Record<string, string | boolean | undefined>) => {
      // Imported here, not at the top: the report modules (vega, vega-lite and their inlined bundles)
      // are heavy, and the other commands need not load them.
      const [{ readCurve }, { readForecast }, { readDecision }, { reportFiles }, { forecastCurveDifference }] =
        await Promise.all([
          import("../../curve/readCurve.js"),
          import("../../forecast/readForecast.js"),
          import("../../weigh/readDecision.js"),
          import("../../report/reportFiles.js"),
          import("../../report/sameCurve.js"),
        ]);
      const curve = readCurve(options.curve as string);
      const forecast = readForecast(options.forecast as string);
      const difference = forecastCurveDifference(curve, forecast);
      if (difference !== null) {
        throw new DataError(
          message.forecastOfAnotherCurve(options.forecast as string, options.curve as string, difference),
        );
      }
      const decision = typeof options.decision === "string" ? readDecision(options.decision) : undefined;
      const files = await reportFiles(
        {
          curve,
          forecast,
          decision,
          title: options.title as string | undefined,
          domain: options.domain as string | undefined,
          currency: options.currency as string | undefined,
          reproducibility: { toolVersion, seed: curve.seed, inputSha256: curve.source?.sha256, command: commandLine },
        },
        { chartFiles: options.chartFiles !== false },
      );
      const inputs = [options.curve, options.forecast, options.decision].filter(
        (f): f is string => typeof f === "string",
      );
      const out = options.out as string;
      const written: string[] = [];
      for (const file of files) {
        // The page goes where --out says; everything else beside it.
        const path = file.fileName === "report.html" ? out : join(dirname(out), file.fileName);
        if (file.fileName !== "report.html" && options.chartFiles === false) continue;
        writeFileAtomic(path, file.content, inputs);
        written.push(path);
      }
      if (!options.quiet) io.stderr(`wrote ${written.join(", ")}\n`);
    });
}
