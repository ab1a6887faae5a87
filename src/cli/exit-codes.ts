/** Process exit codes; docs/cli.md lists them. */
export const ExitCode = {
  /** The command did what was asked. */
  Ok: 0,
  /** Reserved for commands that judge a design: it ran, and the design did not pass. */
  NotPassed: 1,
  /** Bad input: usage, a file that cannot be read or is invalid, an output that cannot be written. */
  BadInput: 2,
  /** A defect in the tool: please report it. */
  Internal: 3,
} as const;
export type ExitCode = (typeof ExitCode)[keyof typeof ExitCode];

/**
 * A failure with a message for the person at the terminal, and its exit code. `details` are more
 * lines (one problem each) printed indented under the message.
 */
export class CliError extends Error {
  constructor(
    message: string,
    readonly details: readonly string[] = [],
    readonly exitCode: ExitCode = ExitCode.BadInput,
  ) {
    super(message);
    this.name = 'CliError';
  }
}

/** A problem with how the command was typed: the message is followed by a pointer to the help. */
export class UsageError extends CliError {
  constructor(
    message: string,
    readonly helpTopic?: string,
  ) {
    super(message);
    this.name = 'UsageError';
  }
}
