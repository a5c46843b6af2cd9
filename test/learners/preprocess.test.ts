import { describe, it, expect } from "vitest";
import fc from "fast-check";
import { fitPreprocessor, medianInPlace } from "../../src/learners/preprocess.js";
import { DataError } from "../../src/errors.js";

/** Row-major matrix from rows. */
function matrix(rows: number[][]): Float64Array {
  return Float64Array.from(rows.flat());
}

describe("fitPreprocessor", () => {
  it("imputes the median of the non-missing training values, then standardizes with the population sd", () => {
    // Hand-computed: column 0 is 1, NaN, 3, 4 → median of {1, 3, 4} is 3; imputed 1, 3, 3, 4 has mean
    // 2.75 and population variance (1.75² + 0.25² + 0.25² + 1.25²)/4 = 1.1875.
    // Column 1 is 1, 2, 10, 20 → no NaN; mean 8.25, variance (7.25² + 6.25² + 1.75² + 11.75²)/4 = 58.1875.
    const features = matrix([
      [1, 1],
      [NaN, 2],
      [3, 10],
      [4, 20],
    ]);
    const pre = fitPreprocessor(features, 4, 2);
    expect(Array.from(pre.imputedValues)).toEqual([3, 6]); // column 1: median of 1, 2, 10, 20 is (2 + 10)/2
    expect(pre.means[0]).toBeCloseTo(2.75, 14);
    expect(pre.means[1]).toBeCloseTo(8.25, 14);
    expect(pre.scales[0]).toBeCloseTo(Math.sqrt(1.1875), 14);
    expect(pre.scales[1]).toBeCloseTo(Math.sqrt(58.1875), 14);
    const out = pre.transform(features, 4);
    const expected = [
      [(1 - 2.75) / Math.sqrt(1.1875), (1 - 8.25) / Math.sqrt(58.1875)],
      [(3 - 2.75) / Math.sqrt(1.1875), (2 - 8.25) / Math.sqrt(58.1875)],
      [(3 - 2.75) / Math.sqrt(1.1875), (10 - 8.25) / Math.sqrt(58.1875)],
      [(4 - 2.75) / Math.sqrt(1.1875), (20 - 8.25) / Math.sqrt(58.1875)],
    ].flat();
    expected.forEach((v, i) => expect(out[i]).toBeCloseTo(v, 13));
  });

  it("fits on training rows only: extreme or missing test values do not move the imputation or scaling", () => {
    const training = matrix([[2], [4], [NaN], [9]]); // median 4; imputed 2, 4, 4, 9: mean 4.75
    const test = matrix([[NaN], [1e9], [-1e9]]);
    const pre = fitPreprocessor(training, 4, 1);
    const variance = ((2 - 4.75) ** 2 + 2 * (4 - 4.75) ** 2 + (9 - 4.75) ** 2) / 4;
    const out = pre.transform(test, 3);
    expect(out[0]).toBeCloseTo((4 - 4.75) / Math.sqrt(variance), 13); // NaN takes the training median
    expect(out[1]).toBeCloseTo((1e9 - 4.75) / Math.sqrt(variance), 4);
    expect(out[2]).toBeCloseTo((-1e9 - 4.75) / Math.sqrt(variance), 4);
    // Fitting on all seven rows would have given a different median and mean.
    const all = fitPreprocessor(matrix([[2], [4], [NaN], [9], [NaN], [1e9], [-1e9]]), 7, 1);
    expect(all.means[0]).not.toBeCloseTo(pre.means[0], 1);
  });

  it("imputes 0 in a column with no training value and gives constant columns scale 1 (as StandardScaler)", () => {
    const training = matrix([
      [NaN, 5, 1],
      [NaN, 5, 2],
      [NaN, 5, 3],
    ]);
    const pre = fitPreprocessor(training, 3, 3);
    expect(Array.from(pre.imputedValues)).toEqual([0, 5, 2]);
    expect(Array.from(pre.scales.subarray(0, 2))).toEqual([1, 1]);
    const out = pre.transform(
      matrix([
        [NaN, 5, 2],
        [7, 8, 2],
      ]),
      2,
    );
    expect(Array.from(out)).toEqual([0, 0, 0, 7, 3, 0]);
  });

  it("treats a column whose variance is rounding error as constant (StandardScaler's bound)", () => {
    // 0.1 + 0.2 style rounding: values equal to within one ulp.
    const values = [0.30000000000000004, 0.3, 0.30000000000000004, 0.3];
    const pre = fitPreprocessor(Float64Array.from(values), 4, 1);
    expect(pre.scales[0]).toBe(1);
  });

  it("gives the output of its doc example", () => {
    // Column 1, NaN, 3: the NaN imputes the median 2, so the imputed column has mean 2 and NaN maps to 0.
    expect(
      Array.from(fitPreprocessor(new Float64Array([1, NaN, 3]), 3, 1).transform(new Float64Array([NaN]), 1)),
    ).toEqual([0]);
  });

  it("does not change its input", () => {
    const training = matrix([
      [1, NaN],
      [2, 3],
      [NaN, 4],
    ]);
    const copy = training.slice();
    const pre = fitPreprocessor(training, 3, 2);
    pre.transform(training, 3);
    expect(Array.from(training)).toEqual(Array.from(copy));
  });

  it.each([
    ["no rows", () => fitPreprocessor(new Float64Array(0), 0, 2)],
    ["a length that is not rows × columns", () => fitPreprocessor(new Float64Array(5), 2, 3)],
    ["an infinite training value", () => fitPreprocessor(Float64Array.from([1, Infinity]), 2, 1)],
    [
      "an infinite value to transform",
      () => fitPreprocessor(Float64Array.from([1, 2]), 2, 1).transform(Float64Array.from([-Infinity]), 1),
    ],
    [
      "a wrong column count to transform",
      () => fitPreprocessor(Float64Array.from([1, 2]), 2, 1).transform(Float64Array.from([1, 2]), 1),
    ],
  ])("throws a DataError on %s", (_case, call) => {
    expect(call).toThrow(DataError);
  });

  it("gives training columns mean 0 and population sd 1 (or 0 when constant), whatever the values", () => {
    // Multiples of 1/8 up to ±125000: exact in binary, so distinct values differ far above rounding.
    const eighths = fc.integer({ min: -1_000_000, max: 1_000_000 }).map((v) => v / 8);
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 12 }).chain((rows) =>
          fc.tuple(
            fc.constant(rows),
            fc.integer({ min: 1, max: 4 }).chain((columns) =>
              fc.tuple(
                fc.constant(columns),
                fc.array(fc.oneof(eighths, fc.constant(NaN)), {
                  minLength: rows * columns,
                  maxLength: rows * columns,
                }),
              ),
            ),
          ),
        ),
        ([rows, [columns, values]]) => {
          const features = Float64Array.from(values);
          const pre = fitPreprocessor(features, rows, columns);
          const out = pre.transform(features, rows);
          for (let j = 0; j < columns; j++) {
            let mean = 0;
            for (let i = 0; i < rows; i++) mean += out[i * columns + j] / rows;
            let variance = 0;
            for (let i = 0; i < rows; i++) variance += (out[i * columns + j] - mean) ** 2 / rows;
            expect(Number.isFinite(mean)).toBe(true);
            expect(Math.abs(mean)).toBeLessThan(1e-6);
            // Either standardized (variance 1) or constant and only centered (variance ~0).
            expect(Math.min(Math.abs(variance - 1), variance)).toBeLessThan(1e-6);
          }
        },
      ),
      { numRuns: 200, seed: 20261201 },
    );
  });
});

describe("fitPreprocessor with complete columns", () => {
  /** Seeded values with no missing one: `rows × columns`, some columns with repeated values. */
  function values(rows: number, columns: number): Float64Array {
    return Float64Array.from({ length: rows * columns }, (_, at) => ((at * 7919) % 101) / 7 - (at % columns) * 0.5);
  }

  it("gives the same means, scales and rows as without, narrow and wide (column-major path)", () => {
    for (const [rows, columns] of [
      [9, 3],
      [7, 130],
    ]) {
      const x = values(rows, columns);
      const complete = new Uint8Array(columns).fill(1);
      complete[1] = 0; // a column that may hold missing values elsewhere keeps its median
      const plain = fitPreprocessor(x, rows, columns);
      const hinted = fitPreprocessor(x, rows, columns, { completeColumns: complete });
      expect(Array.from(hinted.means)).toEqual(Array.from(plain.means));
      expect(Array.from(hinted.scales)).toEqual(Array.from(plain.scales));
      expect(Array.from(hinted.transform(x, rows))).toEqual(Array.from(plain.transform(x, rows)));
      // Only the column that may hold missing values has an imputed value.
      expect(hinted.imputedValues[1]).toBe(plain.imputedValues[1]);
      expect(Number.isNaN(hinted.imputedValues[0])).toBe(true);
      // Without standardizing (trees), the values come through unchanged.
      const trees = fitPreprocessor(x, rows, columns, { completeColumns: complete, standardize: false });
      expect(Array.from(trees.transform(x, rows))).toEqual(Array.from(x));
    }
  });

  it("gives the same means and scales to the last bit when every column is complete (row-major sums)", () => {
    // With no median needed anywhere, the sums run along the rows; they must equal the column-by-column
    // sums of the general path, narrow and wide, including a constant column (scale 1).
    for (const [rows, columns] of [
      [9, 3],
      [7, 130],
      [40, 70],
    ]) {
      const x = values(rows, columns);
      for (let i = 0; i < rows; i++) x[i * columns + 2] = 1.1; // constant
      const plain = fitPreprocessor(x, rows, columns);
      const allComplete = fitPreprocessor(x, rows, columns, { completeColumns: new Uint8Array(columns).fill(1) });
      expect(Array.from(allComplete.means)).toEqual(Array.from(plain.means));
      expect(Array.from(allComplete.scales)).toEqual(Array.from(plain.scales));
      expect(allComplete.scales[2]).toBe(1);
    }
  });

  it("rejects a missing value in a column said to be complete, naming row and column, and still reports ±Infinity", () => {
    const complete = Uint8Array.of(1, 1);
    const training = matrix([
      [1, 2],
      [3, NaN],
    ]);
    expect(() => fitPreprocessor(training, 2, 2, { completeColumns: complete })).toThrow(
      new DataError(
        "preprocessing: training row 2, feature column 2 is missing, in a column said to have no missing value",
      ),
    );
    expect(() => fitPreprocessor(matrix([[1], [-Infinity]]), 2, 1, { completeColumns: Uint8Array.of(1) })).toThrow(
      /training row 2, feature column 1 is -Infinity/,
    );
    const pre = fitPreprocessor(
      matrix([
        [1, 2],
        [3, 4],
      ]),
      2,
      2,
      { completeColumns: complete },
    );
    expect(() => pre.transform(matrix([[NaN, 1]]), 1)).toThrow(/prediction row 1, feature column 1 is missing/);
    expect(() => pre.transform(matrix([[1, Infinity]]), 1)).toThrow(/prediction row 1, feature column 2 is Infinity/);
  });
});

describe("medianInPlace", () => {
  // numpy.median (from memory): [3, 1, 2] → 2.0; [4, 1, 3, 2] → 2.5; [5, 5, 1, 5] → 5.0.
  it.each([
    [[3, 1, 2], 2],
    [[4, 1, 3, 2], 2.5],
    [[5, 5, 1, 5], 5],
    [[7], 7],
  ])("gives numpy's median of %j", (values, expected) => {
    expect(medianInPlace(Float64Array.from(values), values.length)).toBe(expected);
  });

  it("equals the median of the sorted values bit for bit, the sign of a zero included", () => {
    // Many ties and zeros of both signs, as in image data (digits) and columns written "-0.00000".
    const value = fc.oneof(
      fc.constantFrom(-0, 0, 1, -1, 2.5, 5e-324, -5e-324),
      fc.double({ noNaN: true, min: -1e6, max: 1e6 }),
    );
    fc.assert(
      fc.property(fc.array(value, { minLength: 1, maxLength: 60 }), (values) => {
        const sorted = Float64Array.from(values).sort();
        const half = values.length >> 1;
        const expected = values.length % 2 === 1 ? sorted[half] : (sorted[half - 1] + sorted[half]) / 2;
        const median = medianInPlace(Float64Array.from(values), values.length);
        expect(Object.is(median, expected)).toBe(true);
      }),
      { numRuns: 2000, seed: 20261202 },
    );
  });

  it("reads only the first `count` values", () => {
    expect(medianInPlace(Float64Array.of(9, 1, 5, -100, -100), 3)).toBe(5);
  });
});

describe("Preprocessor.transform into a given array", () => {
  it("writes the same values into the start of the array and returns that view", () => {
    const features = matrix([
      [1, NaN],
      [4, 2],
      [6, 8],
    ]);
    const pre = fitPreprocessor(features, 3, 2);
    const target = new Float64Array(9).fill(-7);
    const written = pre.transform(features, 3, target);
    expect(written.buffer).toBe(target.buffer);
    expect(Array.from(written)).toEqual(Array.from(pre.transform(features, 3)));
    expect(target[6]).toBe(-7);
    expect(() => pre.transform(features, 3, new Float64Array(5))).toThrow(RangeError);
  });
});
