import { describe, it, expect } from "vitest";
import fc from "fast-check";
import { fitCategoryEncoder, hasCategories } from "../../src/learners/encode.js";
import { fitPreprocessor } from "../../src/learners/preprocess.js";
import { DataError } from "../../src/errors.js";
import { loadOpenData } from "../helpers/openData.js";

/**
 * The rules follow scikit-learn's SimpleImputer(strategy="most_frequent") then
 * OneHotEncoder(handle_unknown="ignore"); the expected values here are worked by hand.
 */
describe("fitCategoryEncoder", () => {
  it("makes one indicator per category seen in training, in category order", () => {
    // Categories a, b, c, d; training holds c, a, c (b and d unseen): indicators for a and c.
    const encoder = fitCategoryEncoder(Float64Array.of(2, 0, 2), 3, 1, [["a", "b", "c", "d"]]);
    expect(encoder.outputColumns).toBe(2);
    expect(Array.from(encoder.indicatedCategories)).toEqual([0, 2]);
    // a → (1, 0), c → (0, 1), b and d (unseen) → zeros, missing → the most frequent, c.
    expect(Array.from(encoder.transform(Float64Array.of(0, 2, 1, 3, NaN), 5))).toEqual([1, 0, 0, 1, 0, 0, 0, 0, 0, 1]);
  });

  it("fills a missing training value with the most frequent category, the lower index on a tie", () => {
    // b and c twice each: the tie goes to b (index 1); the missing row then counts as b.
    const encoder = fitCategoryEncoder(Float64Array.of(1, 2, NaN, 2, 1), 5, 1, [["a", "b", "c"]]);
    expect(encoder.fillCategories[0]).toBe(1);
    expect(Array.from(encoder.transform(Float64Array.of(NaN), 1))).toEqual([1, 0]);
  });

  it("keeps numeric columns in place, NaN included, and widens each text column where it stands", () => {
    // Columns: number, text (x, y), number.
    const features = Float64Array.of(1.5, 1, NaN, -2, 0, 4);
    const encoder = fitCategoryEncoder(features, 2, 3, [null, ["x", "y"], null]);
    expect(encoder.outputColumns).toBe(4);
    expect(Array.from(encoder.sourceColumns)).toEqual([0, 1, 1, 2]);
    const out = encoder.transform(features, 2);
    expect(Array.from(out.subarray(0, 4))).toEqual([1.5, 0, 1, NaN]);
    expect(Array.from(out.subarray(4, 8))).toEqual([-2, 1, 0, 4]);
  });

  it("gives a text column missing in every training row no indicator columns", () => {
    const encoder = fitCategoryEncoder(Float64Array.of(NaN, 5, NaN, 6), 2, 2, [["p", "q"], null]);
    expect(encoder.outputColumns).toBe(1);
    expect(Array.from(encoder.transform(Float64Array.of(0, 7), 1))).toEqual([7]);
  });

  it.each([
    ["an index past the categories", Float64Array.of(0, 3)],
    ["a fractional index", Float64Array.of(0, 0.5)],
    ["a negative index", Float64Array.of(-1, 0)],
  ])("throws a DataError on %s", (_case, features) => {
    expect(() => fitCategoryEncoder(features, 2, 1, [["a", "b", "c"]])).toThrow(DataError);
    const encoder = fitCategoryEncoder(Float64Array.of(0, 1), 2, 1, [["a", "b", "c"]]);
    expect(() => encoder.transform(features, 2)).toThrow(DataError);
  });

  it("throws a DataError when the category lists do not match the columns", () => {
    expect(() => fitCategoryEncoder(Float64Array.of(0, 1), 1, 2, [null])).toThrow(DataError);
  });

  it("puts exactly one 1 in each text column's indicators for a seen category, none for an unseen one", () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 5 }),
        fc.array(fc.option(fc.nat(4), { nil: undefined }), { minLength: 1, maxLength: 30 }),
        fc.array(fc.option(fc.nat(4), { nil: undefined }), { minLength: 1, maxLength: 10 }),
        (count, trainingCodes, testCodes) => {
          const code = (c: number | undefined) => (c === undefined ? NaN : c % count);
          const names = Array.from({ length: count }, (_, k) => `c${k}`);
          const training = Float64Array.from(trainingCodes, code);
          const encoder = fitCategoryEncoder(training, training.length, 1, [names]);
          const seen = new Set(Array.from(training).filter((v) => !Number.isNaN(v)));
          expect(encoder.outputColumns).toBe(seen.size);
          const test = Float64Array.from(testCodes, code);
          const out = encoder.transform(test, test.length);
          for (let i = 0; i < test.length; i++) {
            const row = Array.from(out.subarray(i * seen.size, (i + 1) * seen.size));
            const value = Number.isNaN(test[i]) ? encoder.fillCategories[0] : test[i];
            const ones = row.filter((v) => v === 1).length;
            expect(row.every((v) => v === 0 || v === 1)).toBe(true);
            expect(ones).toBe(seen.size > 0 && seen.has(value) ? 1 : 0);
          }
        },
      ),
      { numRuns: 200, seed: 20261201 },
    );
  });
});

describe("fitPreprocessor with text columns", () => {
  it("standardizes the numeric columns and leaves the indicators as 0/1", () => {
    // Column 0 numeric 1, 2, 3, NaN: median 2, imputed 1, 2, 3, 2 → mean 2, variance 0.5.
    // Column 1 text (u, v, w): u, w, u, missing → indicators for u and w; missing → u.
    const features = Float64Array.of(1, 0, 2, 2, 3, 0, NaN, NaN);
    const pre = fitPreprocessor(features, 4, 2, { categories: [null, ["u", "v", "w"]] });
    expect(pre.columns).toBe(2);
    expect(pre.outputColumns).toBe(3);
    const out = pre.transform(features, 4);
    const s = Math.sqrt(0.5);
    const expected = [-1 / s, 1, 0, 0, 0, 1, 1 / s, 1, 0, 0, 1, 0];
    expected.forEach((v, i) => expect(out[i]).toBeCloseTo(v, 14));
    expect(Array.from(pre.scales.subarray(1))).toEqual([1, 1]);
    expect(Array.from(pre.means.subarray(1))).toEqual([0, 0]);
  });

  it("leaves numeric-only data exactly as before when every category entry is null", () => {
    const d = loadOpenData("wine");
    const plain = fitPreprocessor(d.features, d.rows, d.columns);
    const withNulls = fitPreprocessor(d.features, d.rows, d.columns, { categories: Array(d.columns).fill(null) });
    expect(plain.encoder).toBeNull();
    expect(withNulls.encoder).toBeNull();
    expect(Array.from(withNulls.transform(d.features, d.rows))).toEqual(
      Array.from(plain.transform(d.features, d.rows)),
    );
    expect(hasCategories(undefined)).toBe(false);
  });

  it("with standardize false only imputes", () => {
    const pre = fitPreprocessor(Float64Array.of(1, NaN, 10), 3, 1, { standardize: false });
    expect(Array.from(pre.transform(Float64Array.of(NaN, 4), 2))).toEqual([5.5, 4]);
  });

  it("names the input column in its errors, not the output column", () => {
    const pre = fitPreprocessor(Float64Array.of(0, 1, 1, 2), 2, 2, { categories: [["a", "b"], null] });
    expect(() => pre.transform(Float64Array.of(0, Infinity), 1)).toThrow(/feature column 2/);
  });
});
