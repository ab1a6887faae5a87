/**
 * Problems found in a text file that entered from outside (a measured table, a Touchstone file),
 * located by line so that a person can open the file and fix it.
 */
export interface LineIssue {
  /** 1-based line number; 0 when the problem concerns the file as a whole. */
  readonly line: number;
  readonly message: string;
}

/**
 * The outcome of reading a text file: the value with notes (things done that the reader should
 * know about: a unit assumed, a table reversed), or every problem found.
 */
export type TextReadResult<T> =
  | { readonly ok: true; readonly value: T; readonly notes: readonly LineIssue[] }
  | { readonly ok: false; readonly issues: readonly LineIssue[] };

/** "line 12: frequency "abc" is not a number", or the bare message for a whole-file problem. */
export function formatLineIssue(issue: LineIssue): string {
  return issue.line > 0 ? `line ${issue.line}: ${issue.message}` : issue.message;
}

/** Drop a UTF-8 byte-order mark: editors on Windows write one and parsers choke on it. */
export function stripByteOrderMark(text: string): string {
  return text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
}

/** The text split into lines; \r\n, \n and a lone \r all end a line. */
export function splitLines(text: string): string[] {
  return text.split(/\r\n|\r|\n/u);
}

/** "lines 4, 9 and 12" / "lines 4–40 (37 lines)": for notes that cover many lines at once. */
export function describeLines(lines: readonly number[]): string {
  if (lines.length === 0) return 'no lines';
  if (lines.length === 1) return `line ${lines[0]!}`;
  if (lines.length <= 4) return `lines ${lines.slice(0, -1).join(', ')} and ${lines[lines.length - 1]!}`;
  return `${lines.length} lines from ${lines[0]!} to ${lines[lines.length - 1]!}`;
}
