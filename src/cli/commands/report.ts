import { Command } from "commander";
import { readCurve } from "../../curve/readCurve.js";
import { readForecast } from "../../forecast/readForecast.js";
import { writeFileAtomic } from "../../io/files.js";
import { renderReportHtml } from "../../report/html.js";
import { toolVersion } from "../../version.js";
import { readDecision } from "../../weigh/readDecision.js";
import type { CliIo } from "../io.js";

export function reportCommand(io: CliIo, commandLine: string): Command {
  return new Command("report")
    .description("write a self-contained HTML report from a curve, a forecast and, optionally, a decision")
    .requiredOption("--curve <file>", "curve.json from headroom measure")
    .requiredOption("--forecast <file>", "forecast.json from headroom forecast")
    .option("--decision <file>", "decision.json from headroom weigh")
    .option("--title <text>", "title shown at the top of the report")
    .option("--domain <name>", "what the model's decisions touch (clinical, public-health, safety, ...): adds cautions")
    .option("--quiet", "print nothing on success")
    .requiredOption("--out <file>", "where to write report.html")
    .action((options: Record<string, string | boolean | undefined>) => {
      const curve = readCurve(options.curve as string);
      const forecast = readForecast(options.forecast as string);
      const decision = typeof options.decision === "string" ? readDecision(options.decision) : undefined;
      const html = renderReportHtml({
        curve,
        forecast,
        decision,
        title: options.title as string | undefined,
        domain: options.domain as string | undefined,
        reproducibility: { toolVersion, seed: curve.seed, inputSha256: curve.source?.sha256, command: commandLine },
      });
      const inputs = [options.curve, options.forecast, options.decision].filter(
        (f): f is string => typeof f === "string",
      );
      writeFileAtomic(options.out as string, html, inputs);
      if (!options.quiet) io.stderr(`wrote ${options.out}\n`);
    });
}
