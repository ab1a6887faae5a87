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

/** A line on standard error for the person at the terminal ("chokepoint: wrote …"). */
export function tell(context: CommandContext, message: string): void {
  context.io.stderr(`${context.program}: ${message}\n`);
}
