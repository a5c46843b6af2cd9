import { appendFileSync, existsSync, mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import {
  checkpointFileFor,
  checkpointFingerprint,
  datasetDigest,
  openCheckpoint,
  removeCheckpoint,
} from "../../src/curve/checkpoint.js";
import { measureCurve } from "../../src/curve/measure.js";
import type { Dataset } from "../../src/data/dataset.js";
import { DataError, InterruptedError, UsageError } from "../../src/errors.js";
import { toJson } from "../../src/io/files.js";
import { RandomStream } from "../../src/random.js";

const dir = mkdtempSync(join(tmpdir(), "headroom-checkpoint-"));
let counter = 0;
const fresh = () => join(dir, `c${counter++}.jsonl`);
const inputs = { data: "abc", folds: 5, trainingSizes: [10, 20] };

describe("openCheckpoint", () => {
  it("starts a file holding only the header, then reads back each recorded task exactly", () => {
    const file = fresh();
    const checkpoint = openCheckpoint({ file }, inputs, 4, 2);
    expect(checkpoint.completed.size).toBe(0);
    const lines = readFileSync(file, "utf8").split("\n");
    expect(lines).toHaveLength(2);
    expect(JSON.parse(lines[0])).toMatchObject({ kind: "headroom-checkpoint", version: 1, inputs });
    // Scores that need all 17 digits, and the non-finite values JSON has no numbers for.
    checkpoint.record(2, [0.1 + 0.2, 1 / 3]);
    checkpoint.record(0, [NaN, -Infinity]);
    const resumed = openCheckpoint({ file, resume: true }, inputs, 4, 2);
    expect([...resumed.completed.entries()]).toEqual([
      [2, [0.30000000000000004, 0.3333333333333333]],
      [0, [NaN, -Infinity]],
    ]);
  });

  it("refuses to start over an existing checkpoint without resume", () => {
    const file = fresh();
    openCheckpoint({ file }, inputs, 4, 2).record(1, [0.5, 0.6]);
    expect(() => openCheckpoint({ file }, inputs, 4, 2)).toThrow(
      new UsageError(
        `${file}: a checkpoint of an interrupted run is here; add --resume to continue it, or delete the file to start over`,
      ),
    );
  });

  it("refuses a checkpoint of other options, naming what changed", () => {
    const file = fresh();
    openCheckpoint({ file }, inputs, 4, 2);
    expect(() => openCheckpoint({ file, resume: true }, { ...inputs, folds: 10, seed: 3 }, 4, 2)).toThrow(
      new UsageError(
        `${file}: the checkpoint was written for other data or options (changed: folds, seed); delete it to start over`,
      ),
    );
  });

  it("drops a torn last line (a process killed mid-write) and appends after the last whole line", () => {
    const file = fresh();
    const checkpoint = openCheckpoint({ file }, inputs, 4, 2);
    checkpoint.record(3, [0.25, 0.5]);
    appendFileSync(file, '{"task":1,"scores":[0.7');
    const resumed = openCheckpoint({ file, resume: true }, inputs, 4, 2);
    expect([...resumed.completed.keys()]).toEqual([3]);
    resumed.record(1, [0.75, 0.875]);
    expect([...openCheckpoint({ file, resume: true }, inputs, 4, 2).completed.entries()]).toEqual([
      [3, [0.25, 0.5]],
      [1, [0.75, 0.875]],
    ]);
  });

  it("starts over when even the header was torn", () => {
    const file = fresh();
    writeFileSync(file, '{"kind":"headroom-check');
    expect(openCheckpoint({ file, resume: true }, inputs, 4, 2).completed.size).toBe(0);
    expect(JSON.parse(readFileSync(file, "utf8"))).toMatchObject({ kind: "headroom-checkpoint" });
  });

  it.each([
    ["not JSON", "oops\n"],
    ["a task beyond the measurement", '{"task":9,"scores":[1,2]}\n'],
    ["the wrong number of scores", '{"task":0,"scores":[1]}\n'],
    ["a score that is not a number", '{"task":0,"scores":[1,"high"]}\n'],
  ])("names the line of a whole but malformed line: %s", (_, line) => {
    const file = fresh();
    openCheckpoint({ file }, inputs, 4, 2).record(0, [0.5, 0.5]);
    appendFileSync(file, line);
    expect(() => openCheckpoint({ file, resume: true }, inputs, 4, 2)).toThrow(
      new DataError(`${file}:3: the checkpoint line is malformed; delete the file to start over`),
    );
  });

  it("resumes with a missing checkpoint by starting one, and removing a missing one is fine", () => {
    const file = fresh();
    expect(openCheckpoint({ file, resume: true }, inputs, 4, 2).completed.size).toBe(0);
    removeCheckpoint(file);
    expect(existsSync(file)).toBe(false);
    removeCheckpoint(file);
  });
});

describe("checkpointFingerprint and datasetDigest", () => {
  it("do not depend on key order, and change with any value", () => {
    expect(checkpointFingerprint({ a: 1, b: { c: [1, 2], d: "x" } })).toBe(
      checkpointFingerprint({ b: { d: "x", c: [1, 2] }, a: 1 }),
    );
    expect(checkpointFingerprint({ a: 1 })).not.toBe(checkpointFingerprint({ a: 2 }));
    const data = smallDataset();
    const changed = { ...data, features: data.features.slice() };
    changed.features[7] += 1e-12;
    expect(datasetDigest(data)).toBe(datasetDigest({ ...data, features: data.features.slice() }));
    expect(datasetDigest(changed)).not.toBe(datasetDigest(data));
    expect(checkpointFileFor("out/curve.json")).toBe("out/curve.json.checkpoint.jsonl");
  });
});

/** 120 rows, 3 noisy features, two classes that depend on the first feature. */
function smallDataset(): Dataset {
  const random = new RandomStream(11);
  const rows = 120;
  const features = new Float64Array(rows * 3);
  const labels = new Int32Array(rows);
  for (let i = 0; i < rows; i++) {
    for (let j = 0; j < 3; j++) features[i * 3 + j] = random.normal();
    labels[i] = features[i * 3] + random.normal() > 0 ? 1 : 0;
  }
  return { features, rows, featureNames: ["a", "b", "c"], labels, classNames: ["no", "yes"] };
}

describe("measureCurve with a checkpoint", () => {
  const options = { folds: 4, repeats: 3, trainingSizes: [12, 30, 60], seed: 5 };

  it("stops when aborted, says how to resume, and the resumed curve equals an uninterrupted one byte for byte", async () => {
    const data = smallDataset();
    const reference = toJson(await measureCurve(data, "small.csv", options));
    const file = fresh();
    const controller = new AbortController();
    const run = measureCurve(data, "small.csv", {
      ...options,
      checkpoint: { file },
      signal: controller.signal,
      // Stop after the fifth of twelve fits.
      onProgress: (done) => {
        if (done === 5) controller.abort();
      },
    });
    await expect(run).rejects.toThrow(
      new InterruptedError(
        `interrupted after 5 of 12 fits (kept in ${file}); rerun the same command with --resume to continue`,
      ),
    );
    expect(readFileSync(file, "utf8").trim().split("\n")).toHaveLength(1 + 5);
    const done: number[] = [];
    const resumed = await measureCurve(data, "small.csv", {
      ...options,
      checkpoint: { file, resume: true },
      onProgress: (n) => void done.push(n),
    });
    expect(done).toEqual([6, 7, 8, 9, 10, 11, 12]);
    expect(toJson(resumed)).toBe(reference);
  });

  it("refuses to resume with another seed", async () => {
    const data = smallDataset();
    const file = fresh();
    await measureCurve(data, "small.csv", { ...options, checkpoint: { file } });
    await expect(
      measureCurve(data, "small.csv", { ...options, seed: 6, checkpoint: { file, resume: true } }),
    ).rejects.toThrow(/changed: seed\)/);
  });
});
