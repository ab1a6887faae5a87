import type { Command } from '../command.ts';
import { ASSIST_COMMANDS } from './assist-commands.ts';
import { checkCommand } from './check.ts';
import { limitsCommand } from './limits.ts';
import { measuredPartCommand } from './measured-part.ts';
import { reportCommand } from './report.ts';
import { safetyCommand } from './safety.ts';
import { sweepCommand } from './sweep.ts';

/** Every command, in the order the help lists them. A new command is one more entry here. */
export const COMMANDS: readonly Command[] = [sweepCommand, checkCommand, limitsCommand, measuredPartCommand, safetyCommand, reportCommand, ...ASSIST_COMMANDS];
