import type { ArgumentSpec, OptionSpec, ParsedArgs } from './args.ts';
import type { CliIo } from './cli-io.ts';

/** What a command gets besides its arguments. */
export interface CommandContext {
  readonly io: CliIo;
  /** "chokepoint": for messages and help. */
  readonly program: string;
}

/**
 * One command of the command line. A new command is one object in src/cli/commands/index.ts;
 * the dispatcher parses its options from the table, checks the positional count, and prints
 * its help, so a command's `run` starts from validated arguments.
 */
export interface Command {
  readonly name: string;
  /** One line for the command list. */
  readonly summary: string;
  /** Paragraphs for the command's help, after the usage line. */
  readonly description: readonly string[];
  /** Required positional arguments, in order. */
  readonly arguments: readonly ArgumentSpec[];
  readonly options: readonly OptionSpec[];
  readonly examples: readonly { readonly command: string; readonly description: string }[];
  /** Returns the exit code; throws CliError for bad input. */
  run(args: ParsedArgs, context: CommandContext): Promise<number>;
}

/** Options every command takes; the dispatcher handles them. */
export const COMMON_OPTIONS: readonly OptionSpec[] = [{ name: 'help', short: 'h', description: 'show this help' }];
