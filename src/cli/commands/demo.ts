import { Command } from "commander";
import { join } from "node:path";
import { packageRoot } from "../../packageRoot.js";
import type { CliIo } from "../io.js";
import { addRunOptions, runStudyFromCli } from "./study.js";

/** The bundled, invented demo study. */
export const demoStudyFile = join(packageRoot, "fixtures", "demo", "study.json");

export function demoCommand(io: CliIo, commandLine: string): Command {
  return addRunOptions(
    new Command("demo")
      .description("run the whole job on the bundled demo study (invented water-sample data)")
      .option("--out <dir>", "folder for the outputs", join("reports", "demo")),
  ).action(async (options: Record<string, string | boolean | undefined>) => {
    await runStudyFromCli(io, demoStudyFile, options.out as string, options, commandLine);
  });
}
