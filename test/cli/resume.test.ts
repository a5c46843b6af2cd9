/**
 * Interruption and resume, end to end: the command line runs as a child process (from source, under
 * tsx), is killed or sent Ctrl-C once its checkpoint holds some finished fits, and is rerun with
 * --resume; the curve must equal an uninterrupted run's byte for byte. Also checks that the JSON
 * outputs do not depend on the number of worker threads.
 *
 * Data: scikit-learn's digits (fixtures/open-data/digits.csv, see its README): ten classes, so one
 * fit takes long enough (about a second for a (repeat, fold) task) to interrupt between fits.
 */
import { spawn, type ChildProcess } from "node:child_process";
import { copyFileSync, existsSync, mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";
import { run } from "../../src/cli/program.js";
import { ExitCode } from "../../src/errors.js";
import { capture } from "../helpers/captureIo.js";

const root = fileURLToPath(new URL("../../", import.meta.url));
const dir = mkdtempSync(join(tmpdir(), "headroom-resume-"));
const digits = join(dir, "digits.csv");
copyFileSync(join(root, "fixtures/open-data/digits.csv"), digits);

/** 2 repeats × 5 folds = 10 fit tasks of 3 sizes each. */
const design = ["--label", "class", "--repeats", "2", "--sizes", "50,100,200", "--seed", "7", "--quiet"];

async function runInProcess(argv: string[]): Promise<void> {
  const c = capture();
  expect(await run(argv, c.io), c.stderr()).toBe(ExitCode.ok);
}

/** Starts `headroom <argv>` as a child process from the TypeScript source. */
function startCli(argv: string[]): { child: ChildProcess; exit: Promise<{ code: number | null; stderr: string }> } {
  const child = spawn(process.execPath, ["--import", "tsx", "src/bin/headroom.ts", ...argv], {
    cwd: root,
    stdio: ["ignore", "ignore", "pipe"],
  });
  let stderr = "";
  child.stderr!.on("data", (chunk: Buffer) => (stderr += chunk.toString()));
  const exit = new Promise<{ code: number | null; stderr: string }>((resolve) =>
    child.on("close", (code) => resolve({ code, stderr })),
  );
  return { child, exit };
}

/** Finished fits in a checkpoint (whole lines after the header). */
function fitsIn(checkpoint: string): number {
  if (!existsSync(checkpoint)) return 0;
  const lines = readFileSync(checkpoint, "utf8").split("\n").slice(0, -1);
  return Math.max(0, lines.length - 1);
}

/** Waits until the checkpoint holds at least `fits` finished fits (or the child ends). */
async function waitForFits(checkpoint: string, fits: number, exit: Promise<unknown>): Promise<void> {
  let ended = false;
  void exit.then(() => (ended = true));
  while (!ended && fitsIn(checkpoint) < fits) await new Promise((resolve) => setTimeout(resolve, 25));
}

describe("an interrupted measurement resumes to the same bytes", () => {
  let reference: Buffer | undefined;
  async function uninterrupted(): Promise<Buffer> {
    if (reference === undefined) {
      const out = join(dir, "reference.json");
      await runInProcess(["measure", digits, ...design, "--workers", "1", "--out", out]);
      reference = readFileSync(out);
    }
    return reference;
  }

  it("after the process is killed (SIGKILL) with 2 worker threads, resumed on the main thread", async () => {
    const out = join(dir, "killed.json");
    const checkpoint = `${out}.checkpoint.jsonl`;
    const { child, exit } = startCli(["measure", digits, ...design, "--workers", "2", "--out", out]);
    await waitForFits(checkpoint, 2, exit);
    child.kill("SIGKILL");
    const { code } = await exit;
    expect(code).toBeNull(); // killed, not finished
    const kept = fitsIn(checkpoint);
    expect(kept).toBeGreaterThanOrEqual(2);
    expect(kept).toBeLessThan(10);
    expect(existsSync(out)).toBe(false);

    // Without --resume the checkpoint is not thrown away.
    const c = capture();
    expect(await run(["measure", digits, ...design, "--workers", "1", "--out", out], c.io)).toBe(ExitCode.usage);
    expect(c.stderr()).toBe(
      `headroom: ${checkpoint}: a checkpoint of an interrupted run is here; add --resume to continue it, or delete the file to start over\n`,
    );
    // With other options it is refused.
    const other = capture();
    const otherSeed = design.map((a) => (a === "7" ? "8" : a));
    expect(await run(["measure", digits, ...otherSeed, "--resume", "--out", out], other.io)).toBe(ExitCode.usage);
    expect(other.stderr()).toBe(
      `headroom: ${checkpoint}: the checkpoint was written for other data or options (changed: seed); delete it to start over\n`,
    );

    await runInProcess(["measure", digits, ...design, "--workers", "1", "--resume", "--out", out]);
    expect(readFileSync(out).equals(await uninterrupted())).toBe(true);
    expect(existsSync(checkpoint)).toBe(false);
  });

  it.each([
    { signal: "SIGINT" as const, exitCode: ExitCode.interrupted, resumeWorkers: "2" },
    { signal: "SIGTERM" as const, exitCode: ExitCode.terminated, resumeWorkers: "1" },
  ])(
    "after $signal (Ctrl-C; SIGTERM, a scheduler's stop): exit code $exitCode and one line saying how to resume",
    async ({ signal, exitCode, resumeWorkers }) => {
      const out = join(dir, `interrupted-${signal}.json`);
      const checkpoint = `${out}.checkpoint.jsonl`;
      const { child, exit } = startCli(["measure", digits, ...design, "--workers", "1", "--out", out]);
      await waitForFits(checkpoint, 2, exit);
      child.kill(signal);
      const { code, stderr } = await exit;
      expect(code).toBe(exitCode);
      const kept = fitsIn(checkpoint);
      expect(stderr).toBe(
        `headroom: interrupted after ${kept} of 10 fits (kept in ${checkpoint}); rerun the same command with --resume to continue\n`,
      );
      expect(existsSync(out)).toBe(false);

      await runInProcess(["measure", digits, ...design, "--workers", resumeWorkers, "--resume", "--out", out]);
      expect(readFileSync(out).equals(await uninterrupted())).toBe(true);
      expect(existsSync(checkpoint)).toBe(false);
    },
  );
});

describe("determinism", () => {
  it("gives byte-identical curve, forecast and decision JSON with 1 and 2 worker threads", async () => {
    const plan = join(dir, "plan.json");
    writeFileSync(plan, JSON.stringify({ samplesPerRun: 300, costPerRun: 800, maxRuns: 3, valuePerPoint: 500 }));
    const outputs: string[][] = [];
    for (const workers of ["1", "2"]) {
      const curve = join(dir, `curve-${workers}.json`);
      const forecast = join(dir, `forecast-${workers}.json`);
      const decision = join(dir, `decision-${workers}.json`);
      await runInProcess(["measure", digits, ...design, "--workers", workers, "--out", curve]);
      await runInProcess(["forecast", curve, "--at", "1797,2097,2397,2697", "--out", forecast]);
      await runInProcess(["weigh", forecast, "--plan", plan, "--out", decision]);
      outputs.push([curve, forecast, decision].map((f) => readFileSync(f, "utf8")));
    }
    expect(outputs[1][0]).toBe(outputs[0][0]);
    expect(outputs[1][1]).toBe(outputs[0][1]);
    expect(outputs[1][2]).toBe(outputs[0][2]);
    // And the numbers are not trivially equal: the curve rises.
    const points = (JSON.parse(outputs[0][0]) as { points: { scores: number[] }[] }).points;
    const mean = (s: number[]) => s.reduce((a, b) => a + b, 0) / s.length;
    expect(mean(points[2].scores)).toBeGreaterThan(mean(points[0].scores));
  });

  it("gives byte-identical study outputs with 1 and 2 worker threads, and when resumed", async () => {
    const study = join(dir, "study.json");
    writeFileSync(
      study,
      JSON.stringify({
        data: "digits.csv",
        label: "class",
        measure: { repeats: 2, sizes: [50, 100, 200], seed: 3 },
        plan: { samplesPerRun: 300, costPerRun: 800, maxRuns: 2, valuePerPoint: 500 },
      }),
    );
    const names = ["curve.json", "forecast.json", "decision.json"];
    const read = (folder: string) => names.map((name) => readFileSync(join(folder, name), "utf8"));
    await runInProcess(["study", study, "--workers", "1", "--quiet", "--out", join(dir, "study-1")]);
    await runInProcess(["study", study, "--workers", "2", "--quiet", "--out", join(dir, "study-2")]);
    expect(read(join(dir, "study-2"))).toEqual(read(join(dir, "study-1")));

    // A study killed mid-measurement and resumed.
    const folder = join(dir, "study-resumed");
    const checkpoint = join(folder, "curve.json.checkpoint.jsonl");
    const { child, exit } = startCli(["study", study, "--workers", "1", "--quiet", "--out", folder]);
    await waitForFits(checkpoint, 1, exit);
    child.kill("SIGKILL");
    await exit;
    expect(fitsIn(checkpoint)).toBeGreaterThanOrEqual(1);
    await runInProcess(["study", study, "--workers", "2", "--quiet", "--resume", "--out", folder]);
    expect(read(folder)).toEqual(read(join(dir, "study-1")));
    expect(existsSync(checkpoint)).toBe(false);
  });
});
