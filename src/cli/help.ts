import type { OptionSpec } from './args.ts';
import { COMMON_OPTIONS, type Command } from './command.ts';
import { ExitCode } from './exit-codes.ts';

/** Every exit code with its meaning, for the general help (docs/cli.md, "Exit codes", says the same). */
export const EXIT_CODE_HELP: readonly (readonly [ExitCode, string])[] = [
  [ExitCode.Ok, 'done; for check: every band covered by judged points and keeping the target margin'],
  [ExitCode.NotPassed, 'check ran, and a band is below the target margin or not covered by judged points'],
  [ExitCode.BadInput, 'bad input: usage, a file that cannot be read, is not UTF-8, is invalid or cannot be written; or check judged nothing at all (no result)'],
  [ExitCode.Internal, 'internal error: a defect, please report it with the command and the input'],
];

const PROGRAM_SUMMARY =
  'plans a two-line mains or DC input filter for conducted-emission tests: sweeps the filter with its parasitics, separates common and differential mode, and predicts the level at the LISN.';

/** Help text is wrapped to this many columns. */
const WIDTH = 100;

/** Words filled into lines of at most `width` characters; the first line starts `first`, the rest `rest`. */
export function wrap(text: string, width = WIDTH, first = '', rest = first): string[] {
  const lines: string[] = [];
  let line = first;
  let empty = true;
  for (const word of text.split(/\s+/u).filter((w) => w !== '')) {
    if (!empty && line.length + 1 + word.length > width) {
      lines.push(line);
      line = rest + word;
    } else {
      line += empty ? word : ` ${word}`;
    }
    empty = false;
  }
  lines.push(line);
  return lines;
}

/** Lines of "  name    text", the names padded to one column and the texts wrapped beside them. */
function table(rows: readonly (readonly [string, string])[]): string[] {
  const width = Math.max(...rows.map(([name]) => name.length)) + 2;
  return rows.flatMap(([name, text]) => wrap(text, WIDTH, `  ${name.padEnd(width)}`, ' '.repeat(width + 2)));
}

export function usageLine(program: string, command: Command): string {
  const positionals = command.arguments.map((a) => `<${a.name}>`).join(' ');
  return `${program} ${command.name}${positionals === '' ? '' : ` ${positionals}`} [options]`;
}

function optionName(option: OptionSpec): string {
  const long = `--${option.name}${option.value === undefined ? '' : ` <${option.value}>`}`;
  return option.short ? `-${option.short}, ${long}` : `    ${long}`;
}

export function generalHelp(program: string, version: string, commands: readonly Command[]): string {
  return [
    ...wrap(`${program} ${version}: ${PROGRAM_SUMMARY}`),
    '',
    `Usage: ${program} <command> [arguments] [options]`,
    '',
    'Commands:',
    ...table([...commands.map((c): [string, string] => [c.name, c.summary]), ['help', 'show the help of a command: help <command>']]),
    '',
    'Options:',
    ...table([
      ['-h, --help', `show this help; after a command name, that command's help`],
      ['    --version', 'print the version'],
    ]),
    '',
    'Exit codes:',
    ...table(EXIT_CODE_HELP.map(([code, text]): [string, string] => [String(code), text])),
    `Run "${program} help <command>" for a command's arguments and options.`,
    '',
  ].join('\n');
}

export function commandHelp(program: string, command: Command): string {
  const lines = [`Usage: ${usageLine(program, command)}`, ''];
  for (const paragraph of command.description) lines.push(...wrap(paragraph), '');
  if (command.arguments.length > 0) {
    lines.push('Arguments:', ...table(command.arguments.map((a): [string, string] => [`<${a.name}>`, a.description])), '');
  }
  lines.push('Options:', ...table([...command.options, ...COMMON_OPTIONS].map((o): [string, string] => [optionName(o), o.description])), '');
  if (command.examples.length > 0) {
    lines.push('Examples:');
    for (const example of command.examples) lines.push(`  ${example.command}`, `      ${example.description}`);
    lines.push('');
  }
  return lines.join('\n');
}
