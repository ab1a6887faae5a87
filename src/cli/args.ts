import { UsageError } from './exit-codes.ts';

/** One option of a command: a flag ("--json") or an option with a value ("--out <file>"). */
export interface OptionSpec {
  /** Long name without the dashes: "out" is written "--out". */
  readonly name: string;
  /** One letter for a short form: "o" is written "-o". */
  readonly short?: string;
  /** Placeholder of the value, for options that take one ("file" shows as "<file>"). Absent for flags. */
  readonly value?: string;
  readonly description: string;
}

/** A positional argument. */
export interface ArgumentSpec {
  readonly name: string;
  readonly description: string;
}

export interface ParsedArgs {
  readonly positionals: readonly string[];
  /** True when a flag was given. */
  flag(name: string): boolean;
  /** The value of an option, or undefined when it was not given. */
  value(name: string): string | undefined;
}

/** True when argv asks for help anywhere before "--". */
export function asksForHelp(argv: readonly string[]): boolean {
  for (const arg of argv) {
    if (arg === '--') return false;
    if (arg === '--help' || arg === '-h') return true;
  }
  return false;
}

/**
 * Split a command's arguments into options and positionals. Accepts "--out file", "--out=file",
 * "-o file", flags, and "--" to end the options. Refuses unknown options (with a suggestion), a
 * flag given a value, an option without its value, and an option given twice.
 */
export function parseArgs(argv: readonly string[], options: readonly OptionSpec[], command: string): ParsedArgs {
  const positionals: string[] = [];
  const flags = new Set<string>();
  const values = new Map<string, string>();
  const seen = (spec: OptionSpec, written: string): void => {
    if (flags.has(spec.name) || values.has(spec.name)) throw new UsageError(`${written} is given twice`, command);
  };

  for (let i = 0; i < argv.length; i += 1) {
    const arg = argv[i]!;
    if (arg === '--') {
      positionals.push(...argv.slice(i + 1));
      break;
    }
    if (arg === '-' || !arg.startsWith('-')) {
      positionals.push(arg);
      continue;
    }
    let spec: OptionSpec | undefined;
    let inline: string | undefined;
    let written = arg;
    if (arg.startsWith('--')) {
      const equals = arg.indexOf('=');
      const name = equals < 0 ? arg.slice(2) : arg.slice(2, equals);
      if (equals >= 0) inline = arg.slice(equals + 1);
      written = `--${name}`;
      spec = options.find((o) => o.name === name);
    } else if (arg.length === 2) {
      spec = options.find((o) => o.short === arg[1]);
    }
    if (!spec) throw new UsageError(`unknown option ${written} for "${command}"${suggestion(written, options)}`, command);
    seen(spec, written);
    if (spec.value === undefined) {
      if (inline !== undefined) throw new UsageError(`${written} takes no value`, command);
      flags.add(spec.name);
      continue;
    }
    let value = inline;
    if (value === undefined) {
      const next = argv[i + 1];
      if (next === undefined) throw new UsageError(`${written} needs a value: ${written} <${spec.value}>`, command);
      if (next.startsWith('-') && next !== '-' && !/^-\d/u.test(next)) {
        throw new UsageError(`${written} needs a value: ${written} <${spec.value}>, found the option ${next}`, command);
      }
      value = next;
      i += 1;
    }
    if (value === '') throw new UsageError(`${written} needs a value: ${written} <${spec.value}>`, command);
    values.set(spec.name, value);
  }
  return { positionals, flag: (name) => flags.has(name), value: (name) => values.get(name) };
}

/** " (did you mean --json?)" when a known option is a typo away. */
function suggestion(written: string, options: readonly OptionSpec[]): string {
  const name = written.replace(/^-+/u, '');
  let best: { name: string; distance: number } | undefined;
  for (const option of options) {
    const distance = editDistance(name, option.name);
    if (distance <= 2 && (!best || distance < best.distance)) best = { name: option.name, distance };
  }
  return best ? ` (did you mean --${best.name}?)` : '';
}

/** Levenshtein distance, for "did you mean" hints. */
export function editDistance(a: string, b: string): number {
  let previous = Array.from({ length: b.length + 1 }, (_, j) => j);
  for (let i = 1; i <= a.length; i += 1) {
    const current = [i];
    for (let j = 1; j <= b.length; j += 1) {
      const cost = a[i - 1] === b[j - 1] ? 0 : 1;
      current.push(Math.min(previous[j]! + 1, current[j - 1]! + 1, previous[j - 1]! + cost));
    }
    previous = current;
  }
  return previous[b.length]!;
}
