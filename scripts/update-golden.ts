/**
 * Rewrites the golden chart specs in test/report/golden/ from the cases in
 * test/report/sampleInputs.ts. Run it only when a change to the charts is intended:
 *
 *   npx tsx scripts/update-golden.ts
 *
 * then read the diff of test/report/golden/*.json before committing. The test
 * (test/report/charts.test.ts) compares freshly built specs with these files and never writes them.
 *
 * The files are formatted with the project's prettier settings so that `prettier --check` passes.
 * The test module is loaded from its .ts path at run time (under tsx), which keeps test code out of
 * the compiled build.
 */
import { mkdirSync, writeFileSync } from "node:fs";
import { fileURLToPath } from "node:url";
import type { TopLevelSpec } from "vega-lite";
import * as prettier from "prettier";

const samplesUrl = new URL("../test/report/sampleInputs.ts", import.meta.url);
const goldenFolder = new URL("../test/report/golden/", import.meta.url);

const { goldenCases } = (await import(samplesUrl.href)) as {
  goldenCases: ReadonlyArray<{ name: string; build: () => TopLevelSpec }>;
};

mkdirSync(goldenFolder, { recursive: true });
for (const { name, build } of goldenCases) {
  const target = new URL(`${name}.json`, goldenFolder);
  const path = fileURLToPath(target);
  const config = (await prettier.resolveConfig(path)) ?? {};
  const text = await prettier.format(JSON.stringify(build()), { ...config, parser: "json" });
  writeFileSync(target, text);
  console.log(`wrote ${path}`);
}
