/**
 * Large-input benchmark: can headroom read and measure 100,000 rows × 50 features on a small
 * machine, and how much time and memory does it take?
 *
 *     npx tsx scripts/bench-large.ts [--rows 100000] [--features 50] [--workers 2]
 *     node dist/scripts/bench-large.js ...        (after npm run build)
 *
 * Steps, each in a fresh process so that its peak resident memory (the kernel's maxRSS, worker
 * threads included) is its own:
 * 1. write a seeded CSV with scripts/make-large-csv.ts (two classes, 5-decimal features);
 * 2. read: parse the CSV into the data set as `headroom measure` does (readDataset, each row converted
 *    as it is parsed);
 * 3. measure: `headroom measure --repeats 1 --sizes 1000,5000,20000` (5 folds, so 5 fit tasks of 3
 *    fits each, every fit scored on 20,000 held-out rows), the whole command as a user runs it.
 * Prints wall time, CPU time and peak memory of each. Times on a shared machine vary; CPU time and
 * peak memory vary less.
 */
import { spawnSync } from "node:child_process";
import { mkdtempSync, rmSync, statSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { readDataset } from "../src/data/readDataset.js";
import { packageRoot } from "../src/packageRoot.js";
import { writeLargeCsv } from "./make-large-csv.js";

interface Step {
  wallSeconds: number;
  cpuSeconds: number;
  peakMiB: number;
  detail?: string;
}

const fromSource = import.meta.url.endsWith(".ts");
const thisScript = fileURLToPath(import.meta.url);
/** Reports the process's peak memory and CPU time on stderr at exit, for the parent to read. */
const reportAtExit = `data:text/javascript,process.on("exit",()=>{const u=process.cpuUsage();process.stderr.write("\\nbench:"+JSON.stringify({peakKiB:process.resourceUsage().maxRSS,cpuMs:(u.user+u.system)/1000})+"\\n")})`;

function option(name: string, fallback: number): number {
  const index = process.argv.indexOf(name);
  return index < 0 ? fallback : Number(process.argv[index + 1]);
}

/** Runs node with the same loader as this process (tsx from source) and returns its step. */
function timed(args: string[]): Step & { stdout: string } {
  const started = process.hrtime.bigint();
  const result = spawnSync(process.execPath, [...process.execArgv, "--import", reportAtExit, ...args], {
    encoding: "utf8",
    maxBuffer: 1 << 26,
  });
  const wallSeconds = Number(process.hrtime.bigint() - started) / 1e9;
  if (result.status !== 0) throw new Error(`step failed (${args.join(" ")}):\n${result.stderr}`);
  const report = /bench:(\{.*\})/.exec(result.stderr);
  const { peakKiB, cpuMs } = JSON.parse(report ? report[1] : "{}") as { peakKiB: number; cpuMs: number };
  return { wallSeconds, cpuSeconds: cpuMs / 1000, peakMiB: peakKiB / 1024, stdout: result.stdout };
}

/** Child step 2: read only, printing its wall time as JSON. */
function readStep(file: string): void {
  const started = performance.now();
  const data = readDataset(file, { label: "class" });
  const readMs = performance.now() - started;
  process.stdout.write(JSON.stringify({ readMs, rows: data.rows, features: data.featureNames.length }));
}

function main(): void {
  const rows = option("--rows", 100_000);
  const features = option("--features", 50);
  const workers = option("--workers", 2);
  const work = mkdtempSync(join(tmpdir(), "headroom-bench-large-"));
  try {
    const csv = join(work, "large.csv");
    const started = process.hrtime.bigint();
    writeLargeCsv(csv, { rows, features, seed: 1 });
    const writeSeconds = Number(process.hrtime.bigint() - started) / 1e9;
    const megabytes = statSync(csv).size / 1e6;
    process.stdout.write(
      `data: ${rows} rows × ${features} features, ${megabytes.toFixed(1)} MB (written in ${writeSeconds.toFixed(1)} s)\n`,
    );

    const read = timed([thisScript, "--read-step", csv]);
    const { readMs } = JSON.parse(read.stdout) as { readMs: number };
    read.detail = `parse and convert ${(readMs / 1000).toFixed(2)} s`;

    const bin = fromSource
      ? join(packageRoot, "src", "bin", "headroom.ts")
      : join(packageRoot, "dist", "src", "bin", "headroom.js");
    const sizes = [1000, 5000, 20000].filter((s) => s <= rows * 0.8);
    const measure = timed([
      bin,
      "measure",
      csv,
      "--label",
      "class",
      "--repeats",
      "1",
      "--sizes",
      sizes.join(","),
      "--workers",
      String(workers),
      "--quiet",
      "--out",
      join(work, "curve.json"),
    ]);
    measure.detail = `--repeats 1 --sizes ${sizes.join(",")} --workers ${workers}`;

    process.stdout.write("step\twall s\tCPU s\tpeak memory MiB\tdetail\n");
    for (const [name, step] of [
      ["read", read],
      ["measure", measure],
    ] as const) {
      process.stdout.write(
        `${name}\t${step.wallSeconds.toFixed(1)}\t${step.cpuSeconds.toFixed(1)}\t${step.peakMiB.toFixed(0)}\t${step.detail ?? ""}\n`,
      );
    }
  } finally {
    rmSync(work, { recursive: true, force: true });
  }
}

const readAt = process.argv.indexOf("--read-step");
if (readAt >= 0) readStep(process.argv[readAt + 1]);
else main();
