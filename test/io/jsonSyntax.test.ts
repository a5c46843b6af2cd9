import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { findJsonSyntaxError } from "../../src/io/jsonSyntax.js";

/** Whether V8's JSON.parse (the parser readJsonFile uses) accepts the text. */
function parses(text: string): boolean {
  try {
    JSON.parse(text);
    return true;
  } catch {
    return false;
  }
}

describe("findJsonSyntaxError", () => {
  it("gives the result its doc comment's @example states", () => {
    expect(findJsonSyntaxError('{"a": 1,\n "b": }')).toEqual({
      offset: 15,
      line: 2,
      column: 7,
      reason: "expected a value (object, array, string, number, true, false or null)",
    });
  });

  // Positions worked out by hand: line and column of the first character that cannot continue JSON.
  it.each([
    ['{"a": 1,,\n}', 1, 9, "expected a double-quoted property name"],
    ['{"a": [1, 2\n', 2, 1, "expected ',' or ']' after an array element (the file ends too early)"],
    ['{"a": 1} x', 1, 10, "unexpected text after the end of the JSON value"],
    ['{\n  "a" 1}', 2, 7, "expected ':' after the property name"],
    ['{"a": tru}', 1, 7, "expected a value (object, array, string, number, true, false or null)"],
    ['{"a": "x\ny"}', 1, 9, "control character (such as a line break) inside a string"],
    ['{"a": 01}', 1, 8, "expected ',' or '}' after a property"],
    ['{"a": -}', 1, 7, "malformed number"],
    ['{"a":"\\x"}', 1, 7, "bad escape sequence in a string"],
    ['{"a": "open', 1, 12, "unterminated string (the file ends too early)"],
  ])("finds %j malformed at line %i, column %i", (text, line, column, reason) => {
    expect(parses(text)).toBe(false);
    expect(findJsonSyntaxError(text)).toMatchObject({ line, column, reason });
  });

  it("accepts whatever JSON.stringify writes", () => {
    fc.assert(
      fc.property(fc.jsonValue(), fc.integer({ min: 0, max: 4 }), (value, indent) => {
        expect(findJsonSyntaxError(JSON.stringify(value, null, indent))).toBeUndefined();
      }),
      { numRuns: 300, seed: 20261201 },
    );
  });

  it("agrees with JSON.parse on damaged JSON: an error exactly when JSON.parse throws", () => {
    const damaged = fc
      .tuple(fc.jsonValue(), fc.nat(), fc.constantFrom("", ",", "}", "]", '"', ":", "x", "\n", "-", "0", "\\"))
      .map(([value, at, insert]) => {
        const text = JSON.stringify(value, null, 1) ?? "null";
        const cut = at % (text.length + 1);
        return text.slice(0, cut) + insert + text.slice(cut + (insert === "" ? 1 : 0));
      });
    fc.assert(
      fc.property(damaged, (text) => {
        const error = findJsonSyntaxError(text);
        expect(error === undefined).toBe(parses(text));
        if (error) expect(error.offset).toBeLessThanOrEqual(text.length);
      }),
      { numRuns: 1000, seed: 20261201 },
    );
  });
});
