import { Command } from "commander";
import { readForecast } from "../../forecast/readForecast.js";
import { toJson, writeFileAtomic } from "../../io/files.js";
import { readPlan } from "../../weigh/readPlan.js";
import { weighRuns } from "../../weigh/weigh.js";
import type { CliIo } from "../io.js";

export function weighCommand(io: CliIo): Command {
  return new Command("weigh")
    .description("weigh further runs: expected score, chance of the target, cost and net value for each number of runs")
    .argument("<forecast>", "forecast.json from headroom forecast")
    .requiredOption("--plan <file>", "plan.json: samplesPerRun, costPerRun, valuePerPoint, ...")
    .option("--json", "print decision.json to standard output")
    .option("--out <file>", "where to write decision.json")
    .action((forecastFile: string, options: Record<string, string | boolean | undefined>) => {
      const forecast = readForecast(forecastFile);
      const plan = readPlan(options.plan as string);
      const decision = weighRuns(forecast, plan, forecastFile);
      const json = toJson(decision);
      if (typeof options.out === "string") writeFileAtomic(options.out, json, [forecastFile, options.plan as string]);
      if (options.json) io.stdout(json);
      else {
        io.stdout("runs\ttraining size\texpected\tinterval\tP(target)\tcost\tnet value\n");
        for (const row of decision.table) {
          const p = row.probabilityOfTarget === null ? "-" : row.probabilityOfTarget.toFixed(2);
          io.stdout(
            `${row.runs}\t${row.trainingSize}\t${row.expected.toFixed(4)}\t[${row.lower.toFixed(4)}, ${row.upper.toFixed(4)}]\t${p}\t${row.cost}\t${Math.round(row.expectedNetValue)}\n`,
          );
        }
        io.stdout(`recommended: ${decision.recommendedRuns} further run(s). ${decision.reasons.recommendedRuns}\n`);
        if (decision.reasons.runsToTarget) io.stdout(`target: ${decision.reasons.runsToTarget}\n`);
      }
    });
}
