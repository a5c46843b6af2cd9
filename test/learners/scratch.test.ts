import { describe, expect, it } from "vitest";
import { releaseScratch, scratchDoubles, scratchIntegers } from "../../src/learners/scratch.js";

describe("scratch work arrays", () => {
  it("lends the start of one array per purpose, reallocated only when a longer one is asked for", () => {
    releaseScratch();
    const a = scratchDoubles("test.a", 10);
    expect(a.length).toBe(10);
    a.fill(3);
    const shorter = scratchDoubles("test.a", 4);
    expect(shorter.buffer).toBe(a.buffer);
    expect(Array.from(shorter)).toEqual([3, 3, 3, 3]);
    const other = scratchDoubles("test.b", 4);
    expect(other.buffer).not.toBe(a.buffer);
    const longer = scratchDoubles("test.a", 11);
    expect(longer.length).toBe(11);
    expect(longer.buffer).not.toBe(a.buffer);
    expect(scratchDoubles("test.a", 2).buffer).toBe(longer.buffer);
    const integers = scratchIntegers("test.a", 5);
    expect(integers).toBeInstanceOf(Int32Array);
    expect(scratchIntegers("test.a", 3).buffer).toBe(integers.buffer);
  });

  it("gives an empty array for a length that is not a whole number of at least 0", () => {
    for (const length of [-1, 2.5, NaN, Infinity]) {
      expect(scratchDoubles("test.c", length).length).toBe(0);
      expect(scratchIntegers("test.c", length).length).toBe(0);
    }
  });

  it("forgets its arrays on release", () => {
    const before = scratchDoubles("test.d", 8);
    releaseScratch();
    expect(scratchDoubles("test.d", 8).buffer).not.toBe(before.buffer);
  });
});
