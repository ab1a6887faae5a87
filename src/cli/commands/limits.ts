import { maskToCsv, readMaskCsv } from '../../io/mask-csv.ts';
import { formatLineIssue } from '../../io/text-issues.ts';
import { copyPreset, findPreset, LIMIT_PRESETS } from '../../spectrum/limit-presets.ts';
import type { ParsedArgs } from '../args.ts';
import type { Command, CommandContext } from '../command.ts';
import { listProblems, loadDesign, readInputFile } from '../design-input.ts';
import { CliError, ExitCode, UsageError } from '../exit-codes.ts';
import { writeOutput } from '../output.ts';

export const limitsCommand: Command = {
  name: 'limits',
  summary: 'list the limit presets, write one (or a design’s mask) as a mask CSV file, or check a mask file',
  description: [
    'Without options, lists the preset limit masks with their detector and standard (docs/limits.md). With --preset, writes that preset as a mask CSV file, an editable copy; with --design and --mask, writes one of a design’s own masks; with --read, reads a mask CSV file and reports what it holds or every line that is wrong.',
  ],
  arguments: [],
  options: [
    { name: 'preset', value: 'id', description: 'write this preset as a mask CSV file' },
    { name: 'design', value: 'file', description: 'a design whose emissions.masks to export (with --mask)' },
    { name: 'mask', value: 'id', description: 'the id of the design’s mask to export' },
    { name: 'read', value: 'file', description: 'read a mask CSV file and report it' },
    { name: 'out', short: 'o', value: 'file', description: 'write to <file> instead of standard output' },
  ],
  examples: [
    { command: 'chokepoint limits', description: 'the preset catalogue' },
    { command: 'chokepoint limits --preset cispr32-class-b-qp -o out/class-b-qp.csv', description: 'a preset as an editable mask file' },
    { command: 'chokepoint limits --read fixtures/masks/invented-in-house-class-b-qp-less-6.5db.csv', description: 'check a mask file' },
  ],
  run: runLimits,
};

async function runLimits(args: ParsedArgs, context: CommandContext): Promise<number> {
  const presetId = args.value('preset');
  const readPath = args.value('read');
  if (readPath !== undefined) {
    const read = readMaskCsv(await readInputFile(context, readPath, 'the mask file'), { name: readPath });
    if (!read.ok) throw new CliError(`${readPath} is not a usable limit mask:`, listProblems(read.issues.map(formatLineIssue)));
    const mask = read.value.mask;
    const lines = [
      `${readPath}: "${mask.name}", ${mask.detector}, ${mask.frequencyHz.length} points from ${mask.frequencyHz[0]} Hz to ${mask.frequencyHz[mask.frequencyHz.length - 1]} Hz`,
      ...read.notes.map((note) => `note: ${formatLineIssue(note)}`),
    ];
    await writeOutput(context, args.value('out'), `${lines.join('\n')}\n`);
    return ExitCode.Ok;
  }
  const designPath = args.value('design');
  if (designPath !== undefined) {
    const maskId = args.value('mask');
    if (maskId === undefined) throw new UsageError('--design needs --mask <id> to say which mask to write', 'limits');
    const design = await loadDesign(context, designPath);
    const masks = design.emissions?.masks ?? [];
    const mask = masks.find((m) => m.id === maskId);
    if (!mask) throw new CliError(`${designPath} has no mask "${maskId}" (its masks: ${masks.map((m) => m.id).join(', ') || 'none'})`);
    await writeOutput(context, args.value('out'), maskToCsv(mask));
    return ExitCode.Ok;
  }
  if (presetId !== undefined) {
    if (!findPreset(presetId)) throw new CliError(`no preset "${presetId}"; presets: ${LIMIT_PRESETS.map((p) => p.id).join(', ')}`);
    await writeOutput(context, args.value('out'), maskToCsv(copyPreset(presetId)));
    return ExitCode.Ok;
  }
  const rows = LIMIT_PRESETS.map((p) => `${p.id.padEnd(32)} ${p.detector.padEnd(11)} ${p.name}`);
  await writeOutput(context, args.value('out'), `${rows.join('\n')}\n`);
  return ExitCode.Ok;
}
