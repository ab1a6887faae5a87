import { AssistInputError, type AssistNoise, type AssistProblem, assistProblem } from '../../assist/margin/assist-problem.ts';
import { parseFrequencyUnit } from '../../io/frequency-unit.ts';
import { readMaskCsv } from '../../io/mask-csv.ts';
import { readScanText, type ScanCsvOptions } from '../../io/scan-csv.ts';
import { formatLineIssue } from '../../io/text-issues.ts';
import type { Design, LimitMask } from '../../model/design.ts';
import { ATTRIBUTIONS } from '../../model/emissions-schema.ts';
import { parseQuantity, type UnitSymbol } from '../../model/index.ts';
import { copyPreset, findPreset, LIMIT_PRESETS } from '../../spectrum/limit-presets.ts';
import { SCAN_TAGS, type Scan, type ScanTag } from '../../spectrum/spectrum-types.ts';
import type { OptionSpec, ParsedArgs } from '../args.ts';
import type { CommandContext } from '../command.ts';
import { listProblems, readInputFile } from '../design-input.ts';
import { CliError, UsageError } from '../exit-codes.ts';
import { tell } from '../output.ts';

/**
 * What every assistant command reads besides the design: the noise (a scan, the two outputs of a
 * CM/DM separator, or the design's estimate), the limits and the target margin. The same words as
 * the check command, so a person who knows one knows all.
 */

export const DEMO_DESIGN = 'fixtures/demo/adapter-two-stage.design.json';
export const DEMO_SCAN = 'fixtures/scans/invented-adapter-no-filter.csv';

export const NOISE_OPTIONS: readonly OptionSpec[] = [
  { name: 'scan', value: 'file', description: 'a scan of the product (docs/scan-import.md); its mode from --scan-tag' },
  { name: 'scan-tag', value: 'tag', description: `what --scan measured: ${SCAN_TAGS.join(', ')} (default total)` },
  { name: 'cm-scan', value: 'file', description: 'the common-mode output of a CM/DM separator (may come with --dm-scan)' },
  { name: 'dm-scan', value: 'file', description: 'the differential-mode output of a CM/DM separator' },
  { name: 'estimate', description: 'use the design’s noise estimate (emissions.estimate) instead of a scan' },
  { name: 'limit', value: 'ids', description: `limit masks: preset ids or mask CSV files, comma-separated (default: the design’s emissions.masks; presets: ${LIMIT_PRESETS.map((p) => p.id).join(', ')})` },
  { name: 'margin', value: 'dB', description: 'target margin below every limit (default: the design’s, else 6)' },
  { name: 'attribution', value: 'mode', description: `for a scan of unknown mode: ${ATTRIBUTIONS.join(', ')} (default: the design’s, else both)` },
  { name: 'noise-floor', value: 'dBµV', description: 'scan points at or below this level are the receiver’s floor and are not judged' },
  { name: 'frequency-unit', value: 'unit', description: 'the scans’ frequency unit when a header names none: Hz, kHz, MHz, GHz' },
];

export const OUTPUT_OPTIONS: readonly OptionSpec[] = [
  { name: 'json', description: 'write the result as JSON instead of text' },
  { name: 'out', short: 'o', value: 'file', description: 'write to <file> instead of standard output' },
];

/** A number option within bounds, with an optional unit ("6", "6 dB"); undefined when absent. */
export function readNumberOption(args: ParsedArgs, name: string, command: string, min: number, max: number): number | undefined {
  const text = args.value(name);
  if (text === undefined) return undefined;
  const value = Number(text.trim().replace(/\s*(dB(µV|uV)?|%)$/iu, ''));
  if (text.trim() === '' || !(Number.isFinite(value) && value >= min && value <= max)) {
    throw new UsageError(`--${name} must be a number from ${min} to ${max}, got "${text}"`, command);
  }
  return value;
}

/** A whole-number option within bounds. */
export function readCountOption(args: ParsedArgs, name: string, command: string, min: number, max: number): number | undefined {
  const value = readNumberOption(args, name, command, min, max);
  if (value !== undefined && !Number.isInteger(value)) throw new UsageError(`--${name} must be a whole number, got "${args.value(name)}"`, command);
  return value;
}

/** A physical quantity in engineering notation ("0.75 mA", "264 V"); undefined when absent. */
export function readQuantityOption(args: ParsedArgs, name: string, command: string, unit: UnitSymbol): number | undefined {
  const text = args.value(name);
  if (text === undefined) return undefined;
  const parsed = parseQuantity(text, unit);
  if (!parsed.ok) throw new UsageError(`--${name}: cannot read "${text}": ${parsed.reason}`, command);
  if (!(parsed.value > 0)) throw new UsageError(`--${name} must be above zero, got "${text}"`, command);
  return parsed.value;
}

export function readChoiceOption<T extends string>(args: ParsedArgs, name: string, command: string, choices: readonly T[]): T | undefined {
  const text = args.value(name);
  if (text === undefined) return undefined;
  const choice = choices.find((c) => c === text);
  if (!choice) throw new UsageError(`--${name} must be one of ${choices.join(', ')}, got "${text}"`, command);
  return choice;
}

/** Check the noise options' shape before any file is read, so a typo fails at once. */
export function checkNoiseOptions(args: ParsedArgs, command: string): void {
  const scans = ['scan', 'cm-scan', 'dm-scan'].filter((name) => args.value(name) !== undefined);
  const estimate = args.flag('estimate');
  if (scans.length === 0 && !estimate) throw new UsageError('give the noise: --scan <file>, --cm-scan/--dm-scan <file>, or --estimate', command);
  if (scans.length > 0 && estimate) throw new UsageError('give either scans or --estimate, not both', command);
  if (args.value('scan') !== undefined && (args.value('cm-scan') !== undefined || args.value('dm-scan') !== undefined)) {
    throw new UsageError('--scan is one scan of unknown or given mode; --cm-scan/--dm-scan are a separator’s two outputs: give one kind', command);
  }
  if (args.value('scan-tag') !== undefined && args.value('scan') === undefined) throw new UsageError('--scan-tag goes with --scan', command);
  readChoiceOption(args, 'scan-tag', command, SCAN_TAGS);
  readChoiceOption(args, 'attribution', command, ATTRIBUTIONS);
  readNumberOption(args, 'margin', command, -40, 60);
  readNumberOption(args, 'noise-floor', command, -200, 300);
  const unit = args.value('frequency-unit');
  if (unit !== undefined && parseFrequencyUnit(unit) === undefined) throw new UsageError(`--frequency-unit must be Hz, kHz, MHz or GHz, got "${unit}"`, command);
}

/** The design's problem: the noise, limits and margin the assistants judge it by. */
export async function readAssistProblem(args: ParsedArgs, context: CommandContext, design: Design, command: string): Promise<AssistProblem> {
  checkNoiseOptions(args, command);
  let noise: AssistNoise;
  if (args.flag('estimate')) noise = { kind: 'estimate' };
  else {
    const scans: Scan[] = [];
    const scanTag = readChoiceOption(args, 'scan-tag', command, SCAN_TAGS);
    for (const [option, tag] of [
      ['scan', scanTag],
      ['cm-scan', 'common-mode'],
      ['dm-scan', 'differential-mode'],
    ] as const) {
      const path = args.value(option);
      if (path !== undefined) scans.push(await readScan(args, context, path, tag));
    }
    noise = { kind: 'scans', scans };
  }
  const masks = await readMasks(args, context, design, command);
  const targetMarginDb = readNumberOption(args, 'margin', command, -40, 60);
  const noiseFloorDbuV = readNumberOption(args, 'noise-floor', command, -200, 300);
  const attribution = readChoiceOption(args, 'attribution', command, ATTRIBUTIONS);
  try {
    return assistProblem(design, noise, {
      ...(masks ? { masks } : {}),
      ...(targetMarginDb === undefined ? {} : { targetMarginDb }),
      ...(noiseFloorDbuV === undefined ? {} : { noiseFloorDbuV }),
      ...(attribution === undefined ? {} : { attribution }),
    });
  } catch (error) {
    if (error instanceof AssistInputError) throw new CliError(error.message);
    throw error;
  }
}

async function readScan(args: ParsedArgs, context: CommandContext, path: string, tag: ScanTag | undefined): Promise<Scan> {
  const unit = args.value('frequency-unit');
  const frequencyUnit = unit === undefined ? undefined : parseFrequencyUnit(unit);
  const options: ScanCsvOptions = { name: path, ...(tag ? { tag } : {}), ...(frequencyUnit ? { frequencyUnit } : {}) };
  const read = readScanText(await readInputFile(context, path, 'the scan'), options);
  if (!read.ok) throw new CliError(`${path}: ${read.error.message}`, listProblems(read.error.rejected.map((r) => `line ${r.line}: ${r.reason}`)));
  for (const rejected of read.scan.rejected.slice(0, 20)) tell(context, `warning: ${path}, line ${rejected.line} left out: ${rejected.reason}`);
  if (read.scan.rejected.length > 20) tell(context, `warning: ${path}: ${read.scan.rejected.length - 20} more lines left out`);
  return read.scan;
}

/** --limit items (preset ids or mask files); undefined to use the design's own masks. */
async function readMasks(args: ParsedArgs, context: CommandContext, design: Design, command: string): Promise<LimitMask[] | undefined> {
  const text = args.value('limit');
  if (text === undefined) {
    if ((design.emissions?.masks ?? []).length === 0) throw new CliError('no limit to judge against: give --limit <preset ids or mask files> or add emissions.masks to the design');
    return undefined;
  }
  const masks: LimitMask[] = [];
  for (const item of text.split(',').map((s) => s.trim()).filter((s) => s !== '')) {
    if (findPreset(item)) {
      masks.push(copyPreset(item));
      continue;
    }
    if (!/[./\\]/u.test(item)) throw new UsageError(`--limit: "${item}" is neither a preset (${LIMIT_PRESETS.map((p) => p.id).join(', ')}) nor a file name`, command);
    const read = readMaskCsv(await readInputFile(context, item, 'the limit mask'), { id: `mask${masks.length + 1}`, name: item });
    if (!read.ok) throw new CliError(`${item} is not a usable limit mask:`, listProblems(read.issues.map(formatLineIssue)));
    masks.push(read.value.mask);
  }
  if (masks.length === 0) throw new UsageError('--limit needs at least one preset id or file', command);
  return masks;
}

/** Numbers for JSON: finite as they are, everything else null. */
export function jsonNumber(value: number): number | null {
  return Number.isFinite(value) ? value : null;
}

/** A JSON replacer that turns typed arrays into plain arrays and non-finite numbers into null. */
export function jsonReplacer(_key: string, value: unknown): unknown {
  if (typeof value === 'number') return Number.isFinite(value) ? value : null;
  if (value instanceof Float64Array || value instanceof Float32Array || value instanceof Uint8Array || value instanceof Int16Array || value instanceof Uint32Array) {
    return Array.from(value as ArrayLike<number>, (x) => (Number.isFinite(x) ? x : null));
  }
  return value;
}
