import { asksForHelp, editDistance, parseArgs } from './args.ts';
import type { CliIo } from './cli-io.ts';
import type { Command, CommandContext } from './command.ts';
import { COMMON_OPTIONS } from './command.ts';
import { COMMANDS } from './commands/index.ts';
import { CliError, ExitCode, UsageError } from './exit-codes.ts';
import { commandHelp, generalHelp, usageLine } from './help.ts';

export type { CliIo } from './cli-io.ts';
export { ExitCode } from './exit-codes.ts';

const PROGRAM = 'chokepoint';

/**
 * The command line, independent of Node: `argv` is the arguments after the program name, `io`
 * reads and writes files and the two output streams. Resolves to the exit code; never throws,
 * and never prints a stack trace (an unexpected error is reported in one line with code 3).
 */
export async function runCli(argv: readonly string[], io: CliIo, commands: readonly Command[] = COMMANDS): Promise<number> {
  const context: CommandContext = { io, program: PROGRAM };
  try {
    return await dispatch(argv, context, commands);
  } catch (error) {
    return report(error, context, commands);
  }
}

async function dispatch(argv: readonly string[], context: CommandContext, commands: readonly Command[]): Promise<number> {
  const { io, program } = context;
  const [first, ...rest] = argv;
  if (first === undefined) {
    io.stderr(generalHelp(program, io.version, commands));
    throw new UsageError('missing command');
  }
  if (first === '--version') {
    io.stdout(`${program} ${io.version}\n`);
    return ExitCode.Ok;
  }
  if (first === '--help' || first === '-h') {
    io.stdout(generalHelp(program, io.version, commands));
    return ExitCode.Ok;
  }
  if (first === 'help') {
    const topic = rest[0];
    if (topic === undefined || topic === 'help') io.stdout(generalHelp(program, io.version, commands));
    else io.stdout(commandHelp(program, findCommand(topic, commands)));
    return ExitCode.Ok;
  }
  if (first.startsWith('-')) {
    throw new UsageError(`unknown option ${first}: give a command first, options after it (${program} <command> [options])`);
  }

  const command = findCommand(first, commands);
  if (asksForHelp(rest)) {
    io.stdout(commandHelp(program, command));
    return ExitCode.Ok;
  }
  const args = parseArgs(rest, [...command.options, ...COMMON_OPTIONS], command.name);
  const expected = command.arguments;
  if (args.positionals.length < expected.length) {
    const missing = expected[args.positionals.length]!;
    throw new UsageError(`missing argument <${missing.name}> (${missing.description}): ${usageLine(program, command)}`, command.name);
  }
  if (args.positionals.length > expected.length) {
    const extra = args.positionals[expected.length]!;
    throw new UsageError(`unexpected argument "${extra}": ${usageLine(program, command)}`, command.name);
  }
  return await command.run(args, context);
}

function findCommand(name: string, commands: readonly Command[]): Command {
  const command = commands.find((c) => c.name === name);
  if (command) return command;
  const near = commands.filter((c) => editDistance(name, c.name) <= 2).map((c) => `"${c.name}"`);
  const hint = near.length > 0 ? ` (did you mean ${near.join(' or ')}?)` : '';
  throw new UsageError(`unknown command "${name}"${hint}; commands: ${[...commands.map((c) => c.name), 'help'].join(', ')}`);
}

function report(error: unknown, context: CommandContext, commands: readonly Command[]): number {
  const { io, program } = context;
  if (error instanceof CliError) {
    const lines = [`${program}: ${error.message}`, ...error.details.map((line) => `  ${line}`)];
    if (error instanceof UsageError) {
      const topic = error.helpTopic !== undefined && commands.some((c) => c.name === error.helpTopic) ? ` ${error.helpTopic}` : '';
      lines.push(`Run "${program} help${topic}" for the usage.`);
    }
    io.stderr(`${lines.join('\n')}\n`);
    return error.exitCode;
  }
  const message = error instanceof Error ? `${error.name}: ${error.message}` : String(error);
  io.stderr(`${program}: internal error, please report it with the command and input that caused it: ${message}\n`);
  return ExitCode.Internal;
}
