import type { Command } from '../command.ts';
import { dampCommand } from './damp.ts';
import { diagnoseCommand } from './diagnose.ts';
import { sizeCommand } from './size.ts';
import { stabilityCommand } from './stability.ts';
import { mapCommand } from './map.ts';
import { proposeCommand } from './propose.ts';
import { toleranceCommand } from './tolerance.ts';

/** The design assistants' commands (docs/assistants.md), in the order the help lists them. */
export const ASSIST_COMMANDS: readonly Command[] = [diagnoseCommand, sizeCommand, dampCommand, stabilityCommand, toleranceCommand, mapCommand, proposeCommand];
