/**
 * `--on slurm` on a real one-node SLURM cluster (Debian's slurm-wlm and munge, started by
 * scripts/ci/start-slurm.sh, which `.ci/run` calls): the curve gathered from a job array is byte for
 * byte the local run's, with a built-in learner and with a trainer; `--submit-only` and
 * `headroom collect` gather later, listing failed tasks with the sbatch line that reruns them.
 *
 * The command line runs as the built program (dist/, as installed), so that the job array's elements
 * run the same build; `npm test` builds before the tests. Without SLURM the cluster tests are
 * skipped, except in CI (CI=true), where the cluster must be up.
 * Data: Fisher's iris (fixtures/open-data/iris.csv, see its README).
 */
import { execFile, execFileSync, spawnSync } from "node:child_process";
import { copyFileSync, existsSync, mkdtempSync, readFileSync, writeFileSync, rmSync, chmodSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { afterAll, describe, expect, it } from "vitest";
import { run } from "../../src/cli/program.js";
import { elementList } from "../../src/cluster/slurm.js";
import { ExitCode } from "../../src/errors.js";
import { capture } from "../helpers/captureIo.js";

const root = fileURLToPath(new URL("../../", import.meta.url));
const built = join(root, "dist/src/bin/headroom.js");
// A folder the node shares with this process: on a one-node cluster, any local folder.
const dir = mkdtempSync(join(tmpdir(), "headroom-slurm-"));
const iris = join(dir, "iris.csv");
copyFileSync(join(root, "fixtures/open-data/iris.csv"), iris);

function clusterUp(): boolean {
  const result = spawnSync("sinfo", ["-h", "-o", "%t"], { encoding: "utf8" });
  return result.status === 0 && /\b(idle|mix|alloc)\b/.test(result.stdout);
}
const up = clusterUp();
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function headroom(
  argv: string[],
  env: NodeJS.ProcessEnv = process.env,
): Promise<{ code: number; stdout: string; stderr: string }> {
  return new Promise((resolve) => {
    execFile(process.execPath, [built, ...argv], { cwd: dir, env }, (error, stdout, stderr) =>
      resolve({ code: error ? Number((error as { code?: number }).code ?? 1) : 0, stdout, stderr }),
    );
  });
}

/** 1 repeat × 5 folds: 5 tasks, 5 array elements. */
const design = ["iris.csv", "--label", "class", "--repeats", "1", "--sizes", "15,40", "--seed", "5", "--quiet"];

async function measureBoth(name: string, extra: string[]): Promise<void> {
  const local = await headroom(["measure", ...design, ...extra, "--out", `${name}-local.json`]);
  expect(local.code, local.stderr).toBe(0);
  const tasks = join(dir, `${name}-tasks`);
  const slurm = await headroom([
    "measure",
    ...design,
    ...extra,
    "--on",
    "slurm",
    "--tasks-dir",
    tasks,
    "--out",
    `${name}-slurm.json`,
  ]);
  expect(slurm.code, slurm.stderr).toBe(0);
  expect(readFileSync(join(dir, `${name}-slurm.json`), "utf8")).toBe(
    readFileSync(join(dir, `${name}-local.json`), "utf8"),
  );
}

function waitForJob(jobId: string): void {
  for (;;) {
    const result = spawnSync("squeue", ["-h", "-j", jobId, "-o", "%i"], { encoding: "utf8" });
    if (result.status !== 0 || result.stdout.trim() === "") return;
    execFileSync("sleep", ["0.5"]);
  }
}

describe("fits as a SLURM job array", () => {
  it("has a cluster in CI", () => {
    if (process.env.CI) expect(up, "scripts/ci/start-slurm.sh must have started the cluster").toBe(true);
  });

  it.skipIf(!up)("needs the built program", () => {
    expect(existsSync(built), "run npm run build first").toBe(true);
  });

  it.skipIf(!up)("gives the local curve byte for byte with the built-in learner", async () => {
    await measureBoth("builtin", []);
  });

  it.skipIf(!up)("gives the local curve byte for byte with a trainer", async () => {
    await measureBoth("trainer", ["--trainer", `sh ${join(root, "examples/majority.sh")}`]);
  });

  it.skipIf(!up)("--submit-only, failed tasks, the rerun line, and collect", async () => {
    const broken = join(dir, "broken");
    writeFileSync(broken, "");
    const trainer = join(dir, "fragile.sh");
    writeFileSync(
      trainer,
      `if [ -f ${broken} ]; then echo "cannot fit today" >&2; exit 2; fi\nexec sh ${join(root, "examples/majority.sh")}\n`,
    );
    chmodSync(trainer, 0o755);
    const extra = ["--trainer", `sh ${trainer}`];
    const tasks = join(dir, "manual-tasks");
    const submitted = await headroom([
      "measure",
      ...design,
      ...extra,
      "--on",
      "slurm",
      "--tasks-dir",
      tasks,
      "--submit-only",
      "--slurm-options",
      "--time=10 --job-name=headroom-test",
      "--out",
      "manual.json",
    ]);
    expect(submitted.code, submitted.stderr).toBe(0);
    const jobId = submitted.stdout.trim();
    expect(jobId).toMatch(/^\d+$/);
    waitForJob(jobId);

    const incomplete = await headroom(["collect", tasks, "--out", "manual.json"]);
    expect(incomplete.code).toBe(ExitCode.incomplete);
    const rerun = `sbatch --array=0-4 --time=10 --job-name=headroom-test ${join(tasks, "job.sh")}`;
    expect(incomplete.stderr).toBe(
      `headroom: ${tasks}: 0 of 5 tasks are in; failed: ` +
        Array.from(
          { length: 5 },
          (_, t) =>
            `task ${t}: --trainer failed on fit (repeat 1, fold ${t + 1}, size 15): the trainer exited with code 2; its stderr ended: cannot fit today`,
        ).join("; ") +
        `; when the job has ended, rerun the rest with: ${rerun}\n`,
    );
    expect(existsSync(join(dir, "manual.json"))).toBe(false);

    // After the fix, the printed line reruns the tasks; collect then writes the local run's curve.
    rmSync(broken);
    const again = spawnSync("/bin/sh", ["-c", rerun.replace("sbatch ", "sbatch --parsable ")], {
      encoding: "utf8",
      cwd: dir,
    });
    expect(again.status, again.stderr).toBe(0);
    waitForJob(again.stdout.trim().split(";")[0]);
    const collected = await headroom(["collect", tasks, "--out", "manual.json"]);
    expect(collected.code, collected.stderr).toBe(0);
    const local = await headroom(["measure", ...design, ...extra, "--out", "manual-local.json"]);
    expect(local.code, local.stderr).toBe(0);
    expect(readFileSync(join(dir, "manual.json"), "utf8")).toBe(readFileSync(join(dir, "manual-local.json"), "utf8"));
  });
});

describe("--on slurm without a cluster", () => {
  it("says so when sbatch is not on PATH", async () => {
    const c = capture();
    const saved = process.env.PATH;
    process.env.PATH = "/nonexistent";
    try {
      const argv = [
        "measure",
        iris,
        "--label",
        "class",
        "--on",
        "slurm",
        "--tasks-dir",
        join(dir, "none"),
        "--out",
        join(dir, "x.json"),
      ];
      expect(await run(argv, c.io)).toBe(ExitCode.usage);
    } finally {
      process.env.PATH = saved;
    }
    expect(c.stderr()).toBe(
      "headroom: --on slurm: sbatch is not on PATH; run headroom on a SLURM login node (or load the slurm module) first\n",
    );
  });

  it("checks the placement options", async () => {
    const cases: [string[], string][] = [
      [["--on", "cloud"], "headroom: --on: unknown place 'cloud' (known: local, slurm)\n"],
      [
        ["--on", "slurm"],
        "headroom: --on slurm needs --tasks-dir naming a folder on a file system the cluster's nodes share\n",
      ],
      [["--tasks-dir", "t"], "headroom: --tasks-dir is only used with --on slurm\n"],
      [["--submit-only"], "headroom: --submit-only is only used with --on slurm\n"],
    ];
    for (const [extra, expected] of cases) {
      const c = capture();
      expect(await run(["measure", iris, "--label", "class", "--out", join(dir, "y.json"), ...extra], c.io)).toBe(
        ExitCode.usage,
      );
      expect(c.stderr()).toBe(expected);
    }
  });

  it("collect names a folder without tasks", async () => {
    const c = capture();
    expect(await run(["collect", dir, "--out", join(dir, "z.json")], c.io)).toBe(ExitCode.usage);
    expect(c.stderr()).toBe(
      `headroom: ${dir}: no tasks of a measurement here (no job.json written by headroom measure --on slurm)\n`,
    );
  });

  it("writes array element lists as sbatch reads them", () => {
    expect(elementList([0, 1, 2, 3])).toBe("0-3");
    expect(elementList([7, 0, 2, 3, 4, 9])).toBe("0,2-4,7,9");
  });
});
