/**
 * Where and why JSON text is malformed, for error messages that name line and column.
 *
 * `JSON.parse` says what went wrong but not always where: V8 (Node 20) reports "in JSON at position
 * n" for some errors and, for others ("Unexpected token '}', ... is not valid JSON"), only quotes
 * the text, across lines. This scanner follows the grammar of RFC 8259 and stops at the first
 * character that cannot continue a JSON text, so every malformed file gets a position and a short
 * reason in our own words.
 */

export interface JsonSyntaxError {
  /** Offset (UTF-16 code units) of the character where the text stops being JSON. */
  offset: number;
  /** 1-based line and column of that character. */
  line: number;
  column: number;
  /** What was expected there, e.g. "expected ',' or '}' after a property". */
  reason: string;
}

/**
 * Finds the first syntax error of `text`, or returns undefined when it is a valid JSON text.
 * @example
 * findJsonSyntaxError('{"a": 1,\n "b": }')
 * // { offset: 15, line: 2, column: 7,
 * //   reason: "expected a value (object, array, string, number, true, false or null)" }
 */
export function findJsonSyntaxError(text: string): JsonSyntaxError | undefined {
  const scanner = new Scanner(text);
  try {
    scanner.whitespace();
    scanner.value();
    scanner.whitespace();
    if (scanner.position < text.length) scanner.fail("unexpected text after the end of the JSON value");
    return undefined;
  } catch (error) {
    // Nesting deeper than the call stack: no position to offer.
    if (error instanceof RangeError) return undefined;
    if (!(error instanceof StopScan)) throw error;
    const before = text.slice(0, error.offset);
    const lineStart = before.lastIndexOf("\n") + 1;
    return {
      offset: error.offset,
      line: before.split("\n").length,
      column: error.offset - lineStart + 1,
      reason: error.reason,
    };
  }
}

class StopScan {
  constructor(
    readonly offset: number,
    readonly reason: string,
  ) {}
}

const NUMBER = /-?(0|[1-9]\d*)(\.\d+)?([eE][+-]?\d+)?/y;

class Scanner {
  position = 0;
  constructor(private readonly text: string) {}

  fail(reason: string, offset = this.position): never {
    throw new StopScan(offset, this.position >= this.text.length ? `${reason} (the file ends too early)` : reason);
  }

  whitespace(): void {
    while (this.position < this.text.length && " \t\n\r".includes(this.text[this.position])) this.position++;
  }

  value(): void {
    const c = this.text[this.position];
    if (c === "{") return this.object();
    if (c === "[") return this.array();
    if (c === '"') return this.string();
    if (c === "-" || (c >= "0" && c <= "9")) return this.number();
    for (const word of ["true", "false", "null"]) {
      if (this.text.startsWith(word, this.position)) {
        this.position += word.length;
        return;
      }
    }
    this.fail("expected a value (object, array, string, number, true, false or null)");
  }

  object(): void {
    this.position++;
    this.whitespace();
    if (this.text[this.position] === "}") {
      this.position++;
      return;
    }
    for (;;) {
      if (this.text[this.position] !== '"') this.fail("expected a double-quoted property name");
      this.string();
      this.whitespace();
      if (this.text[this.position] !== ":") this.fail("expected ':' after the property name");
      this.position++;
      this.whitespace();
      this.value();
      this.whitespace();
      const c = this.text[this.position];
      if (c === "}") {
        this.position++;
        return;
      }
      if (c !== ",") this.fail("expected ',' or '}' after a property");
      this.position++;
      this.whitespace();
    }
  }

  array(): void {
    this.position++;
    this.whitespace();
    if (this.text[this.position] === "]") {
      this.position++;
      return;
    }
    for (;;) {
      this.value();
      this.whitespace();
      const c = this.text[this.position];
      if (c === "]") {
        this.position++;
        return;
      }
      if (c !== ",") this.fail("expected ',' or ']' after an array element");
      this.position++;
      this.whitespace();
    }
  }

  string(): void {
    this.position++;
    for (;;) {
      if (this.position >= this.text.length) this.fail("unterminated string");
      const code = this.text.charCodeAt(this.position);
      if (code === 0x22) {
        this.position++;
        return;
      }
      if (code < 0x20) this.fail("control character (such as a line break) inside a string");
      if (code === 0x5c) {
        const escape = this.text[this.position + 1];
        if (escape !== undefined && '"\\/bfnrt'.includes(escape)) this.position += 2;
        else if (escape === "u" && /^[0-9a-fA-F]{4}$/.test(this.text.slice(this.position + 2, this.position + 6)))
          this.position += 6;
        else this.fail("bad escape sequence in a string");
      } else this.position++;
    }
  }

  number(): void {
    NUMBER.lastIndex = this.position;
    const match = NUMBER.exec(this.text);
    if (match === null) this.fail("malformed number");
    this.position += match[0].length;
  }
}
