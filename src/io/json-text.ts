import { stripByteOrderMark } from './text-issues.ts';

/**
 * JSON text with a located syntax error: "line 12, column 5: expected ',' or '}'". JSON.parse
 * does the parsing; when it fails, a small scanner that follows the JSON grammar finds where,
 * because the engine's own message does not always say (Node 20 names no position).
 */
export type JsonTextResult =
  | { readonly ok: true; readonly value: unknown }
  | { readonly ok: false; readonly error: JsonSyntaxError };

export interface JsonSyntaxError {
  /** 1-based line and column of the offending character (or of the end of the text). */
  readonly line: number;
  readonly column: number;
  readonly message: string;
  /** The offending line and a caret under the column, for a terminal. */
  readonly excerpt: string;
}

export function parseJsonText(text: string): JsonTextResult {
  const source = stripByteOrderMark(text);
  try {
    return { ok: true, value: JSON.parse(source) as unknown };
  } catch (cause) {
    const found = locateJsonSyntaxError(source);
    const { offset, reason } = found ?? { offset: source.length, reason: (cause as Error).message };
    return { ok: false, error: { ...lineAndColumn(source, offset), message: reason, excerpt: excerptAt(source, offset) } };
  }
}

/** Where JSON text breaks the grammar, or undefined when it does not. */
export function locateJsonSyntaxError(text: string): { offset: number; reason: string } | undefined {
  const scanner = new Scanner(text);
  try {
    scanner.whitespace();
    scanner.value();
    scanner.whitespace();
    if (scanner.position < text.length) scanner.fail('unexpected text after the end of the JSON value');
    return undefined;
  } catch (error) {
    if (error instanceof JsonScanError) return { offset: error.offset, reason: error.reason };
    throw error;
  }
}

class JsonScanError extends Error {
  constructor(
    readonly offset: number,
    readonly reason: string,
  ) {
    super(reason);
  }
}

/** What the scanner is inside of: the open containers, innermost last. */
const OBJECT = 0;
const ARRAY = 1;

/**
 * Follows the JSON grammar without recursion: the open objects and arrays are a stack of its own,
 * so text nested a million levels deep is located like any other (a recursive scanner ran out of
 * call stack near 3,500 levels, long before any limit of its own).
 */
class Scanner {
  position = 0;
  private readonly open: number[] = [];
  constructor(private readonly text: string) {}

  fail(reason: string, at = this.position): never {
    throw new JsonScanError(at, reason);
  }

  private peek(): string | undefined {
    return this.text[this.position];
  }

  private describe(char: string | undefined): string {
    if (char === undefined) return 'the end of the text';
    if (char === '\n') return 'a line break';
    if (char === '\t') return 'a tab';
    if (char === "'") return `"'" (JSON strings use double quotes)`;
    return JSON.stringify(char);
  }

  whitespace(): void {
    while (this.position < this.text.length) {
      const c = this.text[this.position];
      if (c === ' ' || c === '\t' || c === '\n' || c === '\r') this.position += 1;
      else break;
    }
  }

  /** One whole value, with everything nested in it. */
  value(): void {
    const depth = this.open.length;
    for (;;) {
      // Here a value starts.
      if (this.startValue()) continue;
      // A value ended: close what it ends, until a container asks for its next member.
      for (;;) {
        if (this.open.length === depth) return;
        this.whitespace();
        const inObject = this.open[this.open.length - 1] === OBJECT;
        const next = this.peek();
        if (next === ',') {
          this.position += 1;
          this.whitespace();
          if (inObject) this.propertyName();
          else if (this.peek() === ']') this.fail('trailing comma before "]"');
          break;
        }
        if (next === (inObject ? '}' : ']')) {
          this.position += 1;
          this.open.pop();
          continue;
        }
        this.fail(
          inObject
            ? `expected "," or "}" after a property value, found ${this.describe(next)}`
            : `expected "," or "]" after a list item, found ${this.describe(next)}`,
        );
      }
      this.whitespace();
    }
  }

  /**
   * Read the start of a value: a whole scalar (false: the value ended), or the opening of a
   * non-empty container up to where its first member's value starts (true). An empty container is
   * a whole value.
   */
  private startValue(): boolean {
    const c = this.peek();
    if (c === '{') {
      this.position += 1;
      this.whitespace();
      if (this.peek() === '}') {
        this.position += 1;
        return false;
      }
      this.open.push(OBJECT);
      this.propertyName();
      this.whitespace();
      return true;
    }
    if (c === '[') {
      this.position += 1;
      this.whitespace();
      if (this.peek() === ']') {
        this.position += 1;
        return false;
      }
      this.open.push(ARRAY);
      return true;
    }
    if (c === '"') {
      this.string();
      return false;
    }
    if (c === '-' || (c !== undefined && c >= '0' && c <= '9')) {
      this.number();
      return false;
    }
    for (const word of ['true', 'false', 'null']) {
      if (this.text.startsWith(word, this.position)) {
        this.position += word.length;
        return false;
      }
    }
    if (c === '/') this.fail('comments are not allowed in JSON');
    this.fail(`expected a value, found ${this.describe(c)}`);
  }

  /** A property name and its colon, the value after it left to the caller. */
  private propertyName(): void {
    this.whitespace();
    const c = this.peek();
    if (c !== '"') {
      if (c === '}') this.fail('trailing comma before "}"');
      this.fail(`expected a property name in double quotes, found ${this.describe(c)}`);
    }
    this.string();
    this.whitespace();
    if (this.peek() !== ':') this.fail(`expected ":" after the property name, found ${this.describe(this.peek())}`);
    this.position += 1;
  }

  private string(): void {
    const start = this.position;
    this.position += 1;
    for (;;) {
      const c = this.peek();
      if (c === undefined) this.fail('a string is not closed', start);
      if (c === '"') {
        this.position += 1;
        return;
      }
      if (c === '\\') {
        const escape = this.text[this.position + 1];
        if (escape === 'u') {
          if (!/^[0-9a-fA-F]{4}$/u.test(this.text.slice(this.position + 2, this.position + 6))) this.fail('"\\u" needs four hex digits');
          this.position += 6;
          continue;
        }
        if (escape === undefined || !'"\\/bfnrt'.includes(escape)) this.fail(`unknown escape "\\${escape ?? ''}" in a string`);
        this.position += 2;
        continue;
      }
      if (c.charCodeAt(0) < 0x20) this.fail(`${this.describe(c)} inside a string (write it as an escape)`);
      this.position += 1;
    }
  }

  private number(): void {
    const match = /^-?(?:0|[1-9]\d*)(?:\.\d+)?(?:[eE][+-]?\d+)?/u.exec(this.text.slice(this.position, this.position + 400));
    if (!match) this.fail('malformed number');
    this.position += match[0].length;
    const next = this.peek();
    if (next !== undefined && /[0-9.eE+-]/u.test(next)) this.fail('malformed number');
  }
}

function lineAndColumn(text: string, offset: number): { line: number; column: number } {
  let line = 1;
  let lineStart = 0;
  for (let i = 0; i < offset && i < text.length; i += 1) {
    if (text[i] === '\n') {
      line += 1;
      lineStart = i + 1;
    }
  }
  return { line, column: offset - lineStart + 1 };
}

/** The line around `offset`, cut to about 70 characters, with a caret under the offending spot. */
function excerptAt(text: string, offset: number): string {
  const lineStart = text.lastIndexOf('\n', offset - 1) + 1;
  const lineEndAt = text.indexOf('\n', offset);
  const lineText = text.slice(lineStart, lineEndAt < 0 ? text.length : lineEndAt).replace(/\r$/u, '');
  const column = offset - lineStart;
  const from = Math.max(0, column - 50);
  const shown = lineText.slice(from, from + 70).replace(/\t/gu, ' ');
  const lead = from > 0 ? '…' : '';
  return `${lead}${shown}\n${' '.repeat(lead.length + column - from)}^`;
}
