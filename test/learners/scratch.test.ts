import { describe, expect, it } from "vitest";
import {
  expectTrainingRows,
  releaseScratch,
  scratchDoubles,
  scratchIntegers,
  scratchRowDoubles,
  scratchRowIntegers,
} from "../../src/learners/scratch.js";

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

  it("grows an array per training row at once to the rows expected, so that growing sizes reuse it", () => {
    releaseScratch();
    expectTrainingRows(50);
    const first = scratchRowDoubles("test.rows", 10, 3);
    expect(first.length).toBe(30);
    expect(first.buffer.byteLength).toBe(50 * 3 * Float64Array.BYTES_PER_ELEMENT);
    // The larger sizes of the same task find it large enough.
    expect(scratchRowDoubles("test.rows", 50, 3).buffer).toBe(first.buffer);
    const integers = scratchRowIntegers("test.rows", 7);
    expect(integers.length).toBe(7);
    expect(scratchRowIntegers("test.rows", 50).buffer).toBe(integers.buffer);
    // More rows than expected: exactly as many.
    const more = scratchRowDoubles("test.rows", 60, 3);
    expect(more.buffer.byteLength).toBe(60 * 3 * Float64Array.BYTES_PER_ELEMENT);
    // Arrays that are not per training row keep their own length.
    expect(scratchDoubles("test.plain", 4).buffer.byteLength).toBe(4 * Float64Array.BYTES_PER_ELEMENT);
    // Release forgets the expectation too.
    releaseScratch();
    expect(scratchRowDoubles("test.rows", 10, 3).buffer.byteLength).toBe(30 * Float64Array.BYTES_PER_ELEMENT);
  });

  it("forgets its arrays on release", () => {
    const before = scratchDoubles("test.d", 8);
    releaseScratch();
    expect(scratchDoubles("test.d", 8).buffer).not.toBe(before.buffer);
  });
});
