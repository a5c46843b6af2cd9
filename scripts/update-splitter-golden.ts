/**
 * Rewrites test/splitters/golden/splits.json, the seed → folds and orderings of every splitter on the
 * cases of test/splitters/splitterCases.ts. Run it only when a change to the splits is intended (it
 * changes every curve measured with the same seed), then read the diff:
 *
 *   npx tsx scripts/update-splitter-golden.ts
 *
 * The test module is loaded from its .ts path at run time (under tsx), which keeps test code out of
 * the compiled build.
 */
import { writeFileSync } from "node:fs";
import { fileURLToPath } from "node:url";
import * as prettier from "prettier";

const casesUrl = new URL("../test/splitters/splitterCases.ts", import.meta.url);
const target = new URL("../test/splitters/golden/splits.json", import.meta.url);

const { goldenContent } = (await import(casesUrl.href)) as { goldenContent: () => unknown };
const path = fileURLToPath(target);
const config = (await prettier.resolveConfig(path)) ?? {};
writeFileSync(target, await prettier.format(JSON.stringify(goldenContent()), { ...config, parser: "json" }));
console.log(`wrote ${path}`);
