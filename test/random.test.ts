import { readdirSync, readFileSync, statSync } from "node:fs";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { describe, expect, it } from "vitest";
import { RandomStream, StreamPurpose, splitmix32, streamFor } from "../src/random.js";

interface Vectors {
  xoshiro128starstar: { state: [number, number, number, number]; outputs: number[] }[];
  splitmix32: { state: number; outputs: number[] }[];
}

// Outputs of the authors' reference C code (xoshiro128starstar.c, Blackman and Vigna; MurmurHash3's
// fmix32, Appleby), compiled with gcc: fixtures/reference/random/README.md.
const vectors = JSON.parse(
  readFileSync(new URL("../fixtures/reference/random/random-vectors.json", import.meta.url), "utf8"),
) as Vectors;

describe("generators against the reference C code", () => {
  it.each(vectors.xoshiro128starstar)("xoshiro128** 1.1 from state $state", ({ state, outputs }) => {
    const stream = RandomStream.fromState(...state);
    expect(outputs.map(() => stream.nextUint32())).toEqual(outputs);
  });

  it.each(vectors.splitmix32)("splitmix32 from state $state", ({ state, outputs }) => {
    let s = state | 0;
    const values = outputs.map(() => {
      const [next, value] = splitmix32(s);
      s = next;
      return value;
    });
    expect(values).toEqual(outputs);
  });
});

describe("stream purposes", () => {
  const purposes = Object.values(StreamPurpose);

  it("are distinct integers, so paths of different purposes differ in their first element", () => {
    expect(purposes.every((p) => Number.isInteger(p))).toBe(true);
    expect(new Set(purposes).size).toBe(purposes.length);
  });

  it("give streams that start differently for every purpose and index path a run uses", () => {
    // Every path of up to three indices below 40 (beyond the draws' j, which runs to thousands with
    // one index): 64,000 three-index paths per purpose. A stream is named by its first two outputs.
    const seen = new Map<string, string>();
    const visit = (path: number[]): void => {
      const stream = streamFor(20261203, path[0] as StreamPurpose, ...path.slice(1));
      const key = `${stream.nextUint32()},${stream.nextUint32()}`;
      const name = path.join(",");
      expect(seen.get(key) ?? name, `paths (${seen.get(key)}) and (${name})`).toBe(name);
      seen.set(key, name);
    };
    for (const p of purposes) {
      for (let j = 0; j < 5000; j++) visit([p, j]);
      for (let a = 0; a < 40; a++) for (let b = 0; b < 40; b++) visit([p, a, b]);
    }
  });

  it("keep apart the forecast's and the decision table's draws, which once shared streams", () => {
    // Before the registry, forecast deviates used (seed, j, p + 1) and yields (seed, 51, j).
    const a = streamFor(1, StreamPurpose.singleModel, 51, 0);
    const b = streamFor(1, StreamPurpose.runYield, 1);
    expect(a.nextUint32()).not.toBe(b.nextUint32());
  });

  it("are the only way library code makes a stream, each call naming a registered purpose", () => {
    const root = fileURLToPath(new URL("../src", import.meta.url));
    const files: string[] = [];
    const walk = (dir: string): void => {
      for (const name of readdirSync(dir)) {
        const path = join(dir, name);
        if (statSync(path).isDirectory()) walk(path);
        else if (name.endsWith(".ts") && path !== join(root, "random.ts")) files.push(path);
      }
    };
    walk(root);
    const used = new Set<string>();
    for (const file of files) {
      const text = readFileSync(file, "utf8");
      expect(text, file).not.toMatch(/new RandomStream\(/);
      for (const call of text.matchAll(/streamFor\(\s*[^,]+,\s*([^,)]+)/g)) {
        expect(call[1], file).toMatch(/^StreamPurpose\.\w+$/);
        used.add(call[1].slice("StreamPurpose.".length));
      }
    }
    expect([...used].sort()).toEqual(Object.keys(StreamPurpose).sort());
  });
});

describe("RandomStream", () => {
  it("gives the same stream for the same seed and path, another for another seed", () => {
    const a = streamFor(7, StreamPurpose.folds, 2);
    const b = streamFor(7, StreamPurpose.folds, 2);
    const c = streamFor(8, StreamPurpose.folds, 2);
    const first = [a.uniform(), a.uniform()];
    expect([b.uniform(), b.uniform()]).toEqual(first);
    expect([c.uniform(), c.uniform()]).not.toEqual(first);
  });

  it("draws uniforms in [0, 1) with mean 1/2 and variance 1/12", () => {
    const stream = new RandomStream(3);
    const n = 200_000;
    let sum = 0;
    let squares = 0;
    for (let i = 0; i < n; i++) {
      const u = stream.uniform();
      expect(u >= 0 && u < 1).toBe(true);
      sum += u;
      squares += u * u;
    }
    const mean = sum / n;
    // Standard errors: sqrt(1/12/n) ≈ 0.00065 for the mean; 5 of them as the bound.
    expect(Math.abs(mean - 0.5)).toBeLessThan(0.0033);
    expect(Math.abs(squares / n - mean * mean - 1 / 12)).toBeLessThan(0.002);
  });
});
