/**
 * The browser bundles of vega, vega-lite and vega-embed, read once at module load and made safe to
 * inline in a `<script>` element, so the report draws its charts offline with no outside request.
 *
 * The minified UMD builds set the globals `vega`, `vegaLite` and `vegaEmbed`; vega-embed's bundle
 * expects the other two, so they are inlined in that order. Each text is prepared by:
 * 1. dropping `//# sourceMappingURL=` comments (the maps are not shipped, and a browser's developer
 *    tools would try to fetch them);
 * 2. writing every `</script` as `<\/script`, which means the same inside a JavaScript string or
 *    regular expression but cannot end the HTML element early (HTML Living Standard, "Restrictions
 *    for contents of script elements").
 */
import { readFileSync } from "node:fs";
import { createRequire } from "node:module";
import { dirname, join } from "node:path";

const require = createRequire(import.meta.url);

/**
 * The path of `relativePath` inside the installed package `packageName`. The packages' `exports`
 * maps hide their build folders from `require.resolve`, so this resolves the package's entry point
 * and walks up to the folder holding its package.json.
 *
 * @throws Error when the package is not installed (a broken installation, not a user mistake)
 */
function packageFile(packageName: string, relativePath: string): string {
  let folder = dirname(require.resolve(packageName));
  for (;;) {
    try {
      const manifest = JSON.parse(readFileSync(join(folder, "package.json"), "utf8")) as { name?: string };
      if (manifest.name === packageName) return join(folder, relativePath);
    } catch {
      // No package.json here: keep walking up.
    }
    const parent = dirname(folder);
    if (parent === folder) throw new Error(`headroom: cannot find the folder of package ${packageName}`);
    folder = parent;
  }
}

/**
 * Makes a script's text safe to place between `<script>` and `</script>`: drops source-map comments
 * and escapes `</script` in any letter case.
 */
export function inlineScriptText(source: string): string {
  return source
    .replace(/^\s*\/\/[#@] sourceMappingURL=.*$/gm, "")
    .replace(/<\/(script)/gi, "<\\/$1")
    .trimEnd();
}

/** One inlined bundle: its package and the prepared text. */
export interface InlineBundle {
  packageName: string;
  text: string;
}

/** The three bundles in load order (vega, vega-lite, vega-embed), prepared for inlining. */
export const chartBundles: readonly InlineBundle[] = [
  ["vega", "build/vega.min.js"],
  ["vega-lite", "build/vega-lite.min.js"],
  ["vega-embed", "build/vega-embed.min.js"],
].map(([packageName, file]) => ({
  packageName,
  text: inlineScriptText(readFileSync(packageFile(packageName, file), "utf8")),
}));
