import { parseFrequencyUnit } from '../../io/frequency-unit.ts';
import { readMaskCsv } from '../../io/mask-csv.ts';
import { readScanText, type ScanCsvOptions } from '../../io/scan-csv.ts';
import { formatLineIssue } from '../../io/text-issues.ts';
import type { LimitMask } from '../../model/design.ts';
import { ATTRIBUTIONS } from '../../model/emissions-schema.ts';
import { makeReport } from '../../report/make-report.ts';
import type { NoiseInput } from '../../spectrum/emissions-analysis.ts';
import { LEVEL_UNIT_NAMES, type LevelUnitName } from '../../spectrum/level-units.ts';
import { copyPreset, findPreset, LIMIT_PRESETS } from '../../spectrum/limit-presets.ts';
import { SCAN_TAGS, type ScanTag } from '../../spectrum/spectrum-types.ts';
import type { ParsedArgs } from '../args.ts';
import type { Command, CommandContext } from '../command.ts';
import { listProblems, loadDesign, readInputFile } from '../design-input.ts';
import { CliError, ExitCode, UsageError } from '../exit-codes.ts';
import { tell, writeOutput } from '../output.ts';

const DEMO = 'fixtures/demo/adapter-two-stage.design.json';
const DEMO_SCAN = 'fixtures/scans/invented-adapter-no-filter.csv';
const NAME = 'report';

export const reportCommand: Command = {
  name: NAME,
  summary: 'write the hand-over report: one self-contained printable HTML page (and CSV files of every curve and table)',
  description: [
    'Sweeps the design, judges its emissions when there is noise and a limit (a scan with --scan, else the design’s noise estimate when it has one), and writes one HTML page to print or keep: the design as tables, the drawn filter, the plots, the margin table with the mode that limits each band and the attenuation still needed, every assumption, the checks, the cautions, the program version, the date and a SHA-256 content hash of the design. The page needs no network and no script to read. docs/report.md describes it.',
    'The page shows the same content as the planner’s report for the same design and inputs. Limits come from --limit (preset ids or mask CSV files) or the design’s emissions.masks.',
  ],
  arguments: [{ name: 'design.json', description: 'a design file (JSON, format "chokepoint-design")' }],
  options: [
    { name: 'out', short: 'o', value: 'file', description: 'write the HTML page to <file> (required; "-" for standard output)' },
    { name: 'scan', value: 'file', description: 'a scan: CSV or whitespace table of frequency and level columns (docs/scan-import.md)' },
    { name: 'estimate', description: 'judge the design’s noise estimate (emissions.estimate); the default without --scan when the design has one' },
    { name: 'limit', value: 'ids', description: `limit masks: preset ids or mask CSV files, comma-separated (presets: ${LIMIT_PRESETS.map((p) => p.id).join(', ')})` },
    { name: 'margin', value: 'dB', description: 'target margin below every limit (default: the design’s, else 6)' },
    { name: 'scan-tag', value: 'tag', description: `what the scan measured: ${SCAN_TAGS.join(', ')} (default total)` },
    { name: 'attribution', value: 'mode', description: `for a scan of unknown mode: ${ATTRIBUTIONS.join(', ')} (default: the design’s, else both)` },
    { name: 'noise-floor', value: 'dBµV', description: 'scan points at or below this level are left out of the required attenuation' },
    { name: 'frequency-unit', value: 'unit', description: 'the scan’s frequency unit when its header names none: Hz, kHz, MHz, GHz' },
    { name: 'level-unit', value: 'unit', description: 'the scan’s level unit when its header names none: dBuV, dBm, dBuA, V, dBV' },
    { name: 'transfer-impedance', value: 'ohm', description: 'for levels in dBµA: the current probe’s transfer impedance in Ω' },
    { name: 'csv', value: 'prefix', description: 'also write every curve and table as CSV files named <prefix>-<table>.csv' },
    { name: 'date', value: 'when', description: 'the date printed in the report (YYYY-MM-DD, or an ISO date and time); default now, in UTC' },
  ],
  examples: [
    { command: `chokepoint report ${DEMO} --scan ${DEMO_SCAN} --out out/report.html`, description: 'the invented demo judged against its invented scan and its own limits' },
    { command: `chokepoint report ${DEMO} --estimate --limit cispr32-class-b-qp,cispr32-class-b-av -o out/estimate.html --csv out/estimate`, description: 'from the noise estimate, with CSV files beside the page' },
  ],
  run: runReport,
};

async function runReport(args: ParsedArgs, context: CommandContext): Promise<number> {
  const out = args.value('out');
  if (out === undefined) throw new UsageError('give --out <file> for the report page ("-" writes it to standard output)', NAME);
  const scanPath = args.value('scan');
  if (scanPath !== undefined && args.flag('estimate')) throw new UsageError('give --scan <file> or --estimate, not both', NAME);
  const targetMarginDb = readNumber(args, 'margin', -40, 60);
  const noiseFloorDbuV = readNumber(args, 'noise-floor', -200, 300);
  const attribution = readChoice(args, 'attribution', ATTRIBUTIONS);
  const scanOptions = readScanOptions(args, scanPath);
  const generatedAt = readDate(args.value('date'));
  const designPath = args.positionals[0]!;

  const design = await loadDesign(context, designPath);
  const masks = await readMasks(args, context);
  let noise: NoiseInput | undefined;
  if (scanPath !== undefined) {
    const read = readScanText(await readInputFile(context, scanPath, 'the scan'), scanOptions);
    if (!read.ok) throw new CliError(`${scanPath}: ${read.error.message}`, listProblems(read.error.rejected.map((r) => `line ${r.line}: ${r.reason}`)));
    for (const rejected of read.scan.rejected.slice(0, 20)) tell(context, `warning: ${scanPath}, line ${rejected.line} left out: ${rejected.reason}`);
    if (read.scan.rejected.length > 20) tell(context, `warning: ${scanPath}: ${read.scan.rejected.length - 20} more lines left out`);
    noise = { kind: 'scan', scan: read.scan };
  } else if (args.flag('estimate')) {
    if (!design.emissions?.estimate) throw new CliError('--estimate: the design has no emissions.estimate (docs/design-format.md)');
    noise = { kind: 'estimate' };
  }

  let report: ReturnType<typeof makeReport>;
  try {
    report = makeReport({
      design,
      ...(noise ? { noise } : {}),
      ...(masks ? { masks } : {}),
      analysisOptions: {
        ...(targetMarginDb === undefined ? {} : { targetMarginDb }),
        ...(noiseFloorDbuV === undefined ? {} : { noiseFloorDbuV }),
        ...(attribution === undefined ? {} : { attribution }),
      },
      origin: {
        program: context.program,
        version: context.io.version,
        generatedAt,
        designFile: baseName(designPath),
        ...(scanPath === undefined ? {} : { scanFile: baseName(scanPath) }),
      },
    });
  } catch (error) {
    if (error instanceof RangeError) throw new CliError(error.message);
    throw error;
  }
  await writeOutput(context, out, report.html);
  const csvPrefix = args.value('csv');
  if (csvPrefix !== undefined) {
    for (const file of report.csv) await writeOutput(context, `${csvPrefix}-${file.name}`, file.text);
  }
  if (out !== '-') {
    const verdict = report.data.margin ? (report.data.margin.pass ? 'every band meets the target' : 'below the target in some band') : `not judged (${report.data.marginAbsentReason ?? ''})`;
    tell(context, `wrote ${out}${csvPrefix === undefined ? '' : ` and ${report.csv.length} CSV files ${csvPrefix}-*.csv`}: ${verdict}; design hash ${report.data.designHash.slice(0, 12)}…`);
  }
  return ExitCode.Ok;
}

function baseName(path: string): string {
  return path.split(/[\\/]/u).pop() ?? path;
}

/** "YYYY-MM-DD" or an ISO date-time, as given; default the current time in UTC to the minute. */
export function readDate(text: string | undefined, now: Date = new Date()): string {
  if (text === undefined) return `${now.toISOString().slice(0, 16).replace('T', ' ')} UTC`;
  const trimmed = text.trim();
  if (!/^\d{4}-\d{2}-\d{2}([T ]\d{2}:\d{2}(:\d{2}(\.\d+)?)?(Z|[+-]\d{2}:?\d{2}| UTC)?)?$/u.test(trimmed) || Number.isNaN(Date.parse(trimmed.replace(' UTC', 'Z').replace(' ', 'T')))) {
    throw new UsageError(`--date must be a date such as 2026-12-04 or an ISO date and time, got "${text}"`, NAME);
  }
  return trimmed;
}

function readNumber(args: ParsedArgs, name: string, min: number, max: number): number | undefined {
  const text = args.value(name);
  if (text === undefined) return undefined;
  const value = Number(text.trim().replace(/\s*dB(µV|uV)?$/iu, ''));
  if (!(Number.isFinite(value) && value >= min && value <= max) || text.trim() === '') {
    throw new UsageError(`--${name} must be a number from ${min} to ${max}, got "${text}"`, NAME);
  }
  return value;
}

function readChoice<T extends string>(args: ParsedArgs, name: string, choices: readonly T[]): T | undefined {
  const text = args.value(name);
  if (text === undefined) return undefined;
  const choice = choices.find((c) => c === text);
  if (!choice) throw new UsageError(`--${name} must be one of ${choices.join(', ')}, got "${text}"`, NAME);
  return choice;
}

function readScanOptions(args: ParsedArgs, scanPath: string | undefined): ScanCsvOptions {
  const tag: ScanTag | undefined = readChoice(args, 'scan-tag', SCAN_TAGS);
  const frequencyText = args.value('frequency-unit');
  const frequencyUnit = frequencyText === undefined ? undefined : parseFrequencyUnit(frequencyText);
  if (frequencyText !== undefined && frequencyUnit === undefined) throw new UsageError(`--frequency-unit must be Hz, kHz, MHz or GHz, got "${frequencyText}"`, NAME);
  const levelText = args.value('level-unit');
  const levelUnit: LevelUnitName | undefined = levelText === undefined ? undefined : LEVEL_UNIT_NAMES.find((u) => u.toLowerCase() === levelText.toLowerCase());
  if (levelText !== undefined && levelUnit === undefined) throw new UsageError(`--level-unit must be dBuV, dBm, dBuA, V or dBV, got "${levelText}"`, NAME);
  const transfer = readNumber(args, 'transfer-impedance', 1e-6, 1e6);
  return {
    name: scanPath === undefined ? 'scan' : baseName(scanPath),
    ...(tag ? { tag } : {}),
    ...(frequencyUnit ? { frequencyUnit } : {}),
    ...(levelUnit ? { levelUnit } : {}),
    ...(transfer === undefined ? {} : { transferImpedanceOhm: transfer }),
  };
}

/** --limit items: a preset id or a mask CSV file; undefined means the design's own masks. */
async function readMasks(args: ParsedArgs, context: CommandContext): Promise<LimitMask[] | undefined> {
  const text = args.value('limit');
  if (text === undefined) return undefined;
  const masks: LimitMask[] = [];
  for (const item of text.split(',').map((s) => s.trim()).filter((s) => s !== '')) {
    if (findPreset(item)) {
      masks.push(copyPreset(item));
      continue;
    }
    if (!/[./\\]/u.test(item)) throw new UsageError(`--limit: "${item}" is neither a preset (${LIMIT_PRESETS.map((p) => p.id).join(', ')}) nor a file name`, NAME);
    const read = readMaskCsv(await readInputFile(context, item, 'the limit mask'), { id: `mask${masks.length + 1}`, name: item });
    if (!read.ok) throw new CliError(`${item} is not a usable limit mask:`, listProblems(read.issues.map(formatLineIssue)));
    masks.push(read.value.mask);
  }
  if (masks.length === 0) throw new UsageError('--limit needs at least one preset id or file', NAME);
  return masks;
}
