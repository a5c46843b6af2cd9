import { Command } from "commander";
import { toJson, writeFileAtomic } from "../../io/files.js";
import type { DecisionFile } from "../../weigh/decisionFile.js";
import { beyondLimitsTag } from "../../weigh/decisionWords.js";
import type { CliIo } from "../io.js";

export function weighCommand(io: CliIo): Command {
  return new Command("weigh")
    .description("weigh further runs: expected score, chance of the target, cost and net value for each number of runs")
    .argument("<forecast>", "forecast.json from headroom forecast")
    .requiredOption("--plan <file>", "plan.json: samplesPerRun, costPerRun, valuePerPoint, ...")
    .option("--domain <field>", "what the model's decisions touch (e.g. clinical), when the plan does not say")
    .option("--json", "print decision.json to standard output")
    .option("--out <file>", "where to write decision.json")
    .option("--quiet", "print no summary (decision.json holds it)")
    .action(async (forecastFile: string, options: Record<string, string | boolean | undefined>) => {
      // Imported when the command runs, so that the other commands do not load them.
      const [{ readForecast }, { readPlan }, { weighRuns }] = await Promise.all([
        import("../../forecast/readForecast.js"),
        import("../../weigh/readPlan.js"),
        import("../../weigh/weigh.js"),
      ]);
      const forecast = readForecast(forecastFile);
      const plan = readPlan(options.plan as string);
      const decision = weighRuns(forecast, plan, forecastFile, {
        domain: typeof options.domain === "string" ? options.domain : undefined,
        planKey: (key) => `${options.plan as string}: ${key}`,
      });
      const json = toJson(decision);
      if (typeof options.out === "string") writeFileAtomic(options.out, json, [forecastFile, options.plan as string]);
      if (options.json) io.stdout(json);
      else if (!options.quiet) io.stdout(decisionText(decision));
    });
}

/** The decision table and the recommendation lines, as printed by `headroom weigh`. */
export function decisionText(decision: DecisionFile): string {
  const lines = [
    "runs\ttraining size\texpected\tinterval\tP(target)\tgain\tcost\tmonths\tnet value\tnet interval\tP(net>0)",
  ];
  for (const row of decision.table) {
    const p = row.probabilityOfTarget === null ? "-" : row.probabilityOfTarget.toFixed(2);
    const netInterval =
      row.netValueLower === undefined || row.netValueUpper === undefined
        ? "-"
        : `[${Math.round(row.netValueLower)}, ${Math.round(row.netValueUpper)}]`;
    lines.push(
      [
        row.runs,
        row.trainingSize,
        row.expected.toFixed(4),
        `[${row.lower.toFixed(4)}, ${row.upper.toFixed(4)}]`,
        p,
        row.marginalGain === undefined ? "-" : row.marginalGain.toFixed(4),
        Math.round(row.cost),
        row.months,
        Math.round(row.expectedNetValue),
        netInterval,
        row.probabilityNetPositive === undefined ? "-" : row.probabilityNetPositive.toFixed(2),
      ].join("\t") + (row.affordable ? "" : `\t(${beyondLimitsTag(row)})`),
    );
  }
  const { reasons } = decision;
  lines.push(`recommended: ${decision.recommendedRuns} further run(s). ${reasons.recommendedRuns}`);
  if (reasons.runsToTarget) lines.push(`target: ${reasons.runsToTarget}`);
  if (reasons.stopAfterRuns) lines.push(`stop: ${reasons.stopAfterRuns}`);
  if (reasons.valueOfInformation) lines.push(`pilot: ${reasons.valueOfInformation}`);
  if (reasons.validation) lines.push(`validation: ${reasons.validation}`);
  if (reasons.clinical) lines.push(`clinical: ${reasons.clinical}`);
  for (const caution of decision.cautions ?? []) lines.push(`caution: ${caution}`);
  return lines.join("\n") + "\n";
}
