/**
 * Reruns the reference scripts (scikit-learn and SciPy from Debian's python3-sklearn and
 * python3-scipy) and fails if their fresh output drifts from the committed fixtures. On a machine
 * without them the check is skipped, except in CI (CI=true), where their absence is a failure:
 * `.ci/run` installs them.
 */
import { execFileSync } from "node:child_process";
import { readdirSync } from "node:fs";
import { describe, expect, it } from "vitest";

const python = "/usr/bin/python3";
const scriptsDir = new URL("../../scripts/reference/", import.meta.url);
// Files starting with "_" are helper modules the scripts import, not scripts to rerun.
const scripts = readdirSync(scriptsDir).filter((name) => name.endsWith(".py") && !name.startsWith("_"));

function referenceLibrariesAvailable(): boolean {
  try {
    execFileSync(python, ["-c", "import sklearn, scipy"], { stdio: "ignore" });
    return true;
  } catch {
    return false;
  }
}

const available = referenceLibrariesAvailable();

describe("committed reference values", () => {
  it("has reference scripts to rerun", () => {
    expect(scripts.length).toBeGreaterThan(0);
  });

  it("can run scikit-learn and SciPy in CI", () => {
    if (process.env.CI) expect(available, "python3-sklearn and python3-scipy must be installed in CI").toBe(true);
  });

  // The longest script (sklearn_wide.py) fits scikit-learn on wide data, which can take minutes on a
  // shared, loaded machine; the limit guards against a hang and is not a speed check.
  it.skipIf(!available).each(scripts)(
    "%s --check agrees with its committed output",
    (script) => {
      // A script in --check mode exits non-zero (and execFileSync throws) when its fresh values drift.
      const output = execFileSync(python, [new URL(script, scriptsDir).pathname, "--check"], {
        cwd: new URL("../..", import.meta.url).pathname,
        encoding: "utf8",
        stdio: ["ignore", "pipe", "pipe"],
      });
      expect(output.trim()).not.toBe("");
    },
    600_000,
  );
});
