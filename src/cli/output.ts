import { describeFileError } from './cli-io.ts';
import type { CommandContext } from './command.ts';
import { CliError } from './exit-codes.ts';

/** Write a command's result to standard output (no path, or "-") or to a file. */
export async function writeOutput(context: CommandContext, path: string | undefined, text: string): Promise<void> {
  if (path === undefined || path === '-') {
    context.io.stdout(text);
    return;
  }
  try {
    await context.io.writeTextFile(path, text);
  } catch (error) {
    throw new CliError(`cannot write ${path}: ${describeFileError(error, 'write')}`);
  }
}

/**
 * Write a result made in pieces to standard output (no path, or "-") or to a file, piece by piece
 * where the surroundings can (CliIo.writeChunks), else joined.
 */
export async function writeOutputChunks(context: CommandContext, path: string | undefined, chunks: Iterable<string>): Promise<void> {
  const target = path === '-' ? undefined : path;
  const { io } = context;
  if (!io.writeChunks) {
    await writeOutput(context, path, [...chunks].join(''));
    return;
  }
  try {
    await io.writeChunks(target, chunks);
  } catch (error) {
    if (target === undefined) throw error;
    throw new CliError(`cannot write ${target}: ${describeFileError(error, 'write')}`);
  }
}

/** A line on standard error for the person at the terminal ("chokepoint: wrote …"). */
export function tell(context: CommandContext, message: string): void {
  context.io.stderr(`${context.program}: ${message}\n`);
}
