import { describe, expect, it } from "vitest";
import { parseCsv } from "../../src/data/csv.js";
import { tableToDataset } from "../../src/data/tableToDataset.js";

const csv = (text: string) => parseCsv(text, "d.csv");

describe("tableToDataset", () => {
  it("converts features, marks empty and NA cells missing, sorts class names", () => {
    const data = tableToDataset(csv("id,x,y,run,class\n1,1.5,,r1,b\n2,-2e1,NA,r2,a\n3,.5,3,r1,b\n"), {
      label: "class",
      group: "run",
      ignore: ["id"],
    });
    expect(data.featureNames).toEqual(["x", "y"]);
    expect([...data.features]).toEqual([1.5, NaN, -20, NaN, 0.5, 3]);
    expect(data.classNames).toEqual(["a", "b"]);
    expect([...data.labels]).toEqual([1, 0, 1]);
    expect(data.groupNames).toEqual(["r1", "r2"]);
    expect([...(data.groups as Int32Array)]).toEqual([0, 1, 0]);
  });

  it("reads a numeric target for regression: targets filled, labels and class names empty", () => {
    const data = tableToDataset(csv("x,y\n1,2.5\n2,-1e-3\n3,40\n"), { label: "y", task: "regression" });
    expect([...(data.targets as Float64Array)]).toEqual([2.5, -0.001, 40]);
    expect(data.labels).toHaveLength(0);
    expect(data.classNames).toEqual([]);
    expect(data.featureNames).toEqual(["x"]);
  });

  it("makes a text column categorical: sorted category names, index values, NaN for missing", () => {
    const data = tableToDataset(csv("color,x,c\nred,1,a\nblue,2,b\n,3,a\nred,NA,b\ngreen,5,a\n"), { label: "c" });
    expect(data.categories).toEqual([["blue", "green", "red"], null]);
    expect([...data.features]).toEqual([2, 1, 0, 2, NaN, 3, 2, NaN, 1, 5]);
  });

  it("keeps the numbers of a mostly-text column as category names", () => {
    const data = tableToDataset(csv("site,c\nA,a\nB,b\n3,a\nB,b\n"), { label: "c" });
    expect(data.categories).toEqual([["3", "A", "B"]]);
    expect([...data.features]).toEqual([1, 2, 0, 2]);
  });

  it("leaves `categories` out when every feature column is numeric", () => {
    expect(tableToDataset(csv("x,c\n1,a\n2,b\n"), { label: "c" }).categories).toBeUndefined();
  });

  it.each([
    [
      "text in a mostly numeric column",
      "x,c\n1,a\n2,b\nabc,a\n",
      "d.csv:4:1: 'abc' in column 'x' is not a number, though most of the column is numbers",
    ],
    ["NaN in a text column", "s,c\nA,a\nB,a\nNaN,b\n", "d.csv:4:1: 'NaN' in column 's' is not a finite number"],
    [
      // 1e200 is a finite double, but its square is not: means, variances and distances would overflow.
      "a number whose square overflows",
      "x,c\n1,a\n-1e200,b\n",
      "d.csv:3:1: '-1e200' in column 'x' is too large to compute with (above 1e150 in size); rescale the column",
    ],
  ])("rejects %s", (_, text, expected) => {
    expect(() => tableToDataset(csv(text), { label: "c" })).toThrow(expected);
  });

  it.each([
    [
      "a text target",
      "x,y\n1,2\n2,abc\n",
      "d.csv:3:2: the target 'y' is 'abc', not a finite number, as task regression needs",
    ],
    ["an infinite target", "x,y\n1,2\n2,Infinity\n", "d.csv:3:2: 'Infinity' in column 'y' is not a finite number"],
    ["an empty target", "x,y\n1,2\n2,\n", "d.csv:3:2: the label 'y' is empty"],
  ])("rejects %s for regression", (_, text, expected) => {
    expect(() => tableToDataset(csv(text), { label: "y", task: "regression" })).toThrow(expected);
  });

  it.each([
    ["a non-number", "x,c\n1,a\n0x10,b\n", "d.csv:3:1: '0x10' in column 'x' is not a number"],
    ["NaN", "x,c\n1,a\nNaN,b\n", "d.csv:3:1: 'NaN' in column 'x' is not a finite number"],
    ["Infinity", "x,c\n1,a\n-Infinity,b\n", "d.csv:3:1: '-Infinity' in column 'x' is not a finite number"],
    ["an overflow", "x,c\n1,a\n1e999,b\n", "d.csv:3:1: '1e999' in column 'x' is not a finite number"],
    ["a ragged row", "x,c\n1,a\n2\n", "d.csv:3: expected 2 fields as in the header, found 1"],
    ["a duplicate column", "x,x,c\n1,2,a\n", "d.csv:1:2: duplicate column name 'x' (also column 1)"],
    ["an empty column name", "x,,c\n1,2,a\n", "d.csv:1:2: the header has an empty column name"],
    ["an empty label", "x,c\n1,a\n2,\n", "d.csv:3:2: the label 'c' is empty"],
    ["one class only", "x,c\n1,a\n2,a\n", "d.csv: the label column 'c' has only one class ('a')"],
    ["a missing label column", "x,y\n1,a\n", "d.csv: label column 'c' is not in the header (columns: 'x', 'y')"],
  ])("rejects %s with file, line and column", (_, text, expected) => {
    expect(() => tableToDataset(csv(text), { label: "c" })).toThrow(expected);
  });
});
