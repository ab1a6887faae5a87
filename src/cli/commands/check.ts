import { parseFrequencyUnit } from '../../io/frequency-unit.ts';
import { readMaskCsv } from '../../io/mask-csv.ts';
import { formatLineIssue } from '../../io/text-issues.ts';
import { readScanText, type ScanCsvOptions } from '../../io/scan-csv.ts';
import { MAX_SCAN_FILE_BYTES, scanFileTooLarge } from '../../io/scan-limits.ts';
import type { Design, LimitMask } from '../../model/design.ts';
import { ATTRIBUTIONS, MAX_LIMIT_MASKS } from '../../model/emissions-schema.ts';
import { formatQuantity } from '../../model/index.ts';
import { analyzeEmissions, type EmissionsAnalysis, type NoiseInput } from '../../spectrum/emissions-analysis.ts';
import { LEVEL_UNIT_NAMES, type LevelUnitName } from '../../spectrum/level-units.ts';
import { copyPreset, findPreset, LIMIT_PRESETS } from '../../spectrum/limit-presets.ts';
import type { BandResult, MarginPoint } from '../../spectrum/margin.ts';
import { describeShortfall, type Verdict } from '../../spectrum/verdict.ts';
import { DEFAULT_SCAN_TAG, type Scan, SCAN_TAGS, type ScanTag } from '../../spectrum/spectrum-types.ts';
import type { ParsedArgs } from '../args.ts';
import type { Command, CommandContext } from '../command.ts';
import { listProblems, loadDesign, readInputFile } from '../design-input.ts';
import { CliError, ExitCode, UsageError } from '../exit-codes.ts';
import { readDecimalOption, readWholeOption } from '../numeric-options.ts';
import { tell, writeOutput } from '../output.ts';

const DEMO = 'fixtures/demo/adapter-two-stage.design.json';
const DEMO_SCAN = 'fixtures/scans/invented-adapter-no-filter.csv';

export const checkCommand: Command = {
  name: 'check',
  summary: 'predict the emissions with the design’s filter and judge them against limits: the margin table',
  description: [
    'Predicts what the receivers would read with the design’s filter and prints the margin table: worst margin overall and per band, the worst peaks, the failing ranges, and the attenuation still missing per mode. The noise comes from a scan (--scan), scaled by the filter’s in-circuit transfer over the baseline’s (the filter fitted when the scan was taken, from the design’s emissions.baseline; none by default), or from the design’s noise estimate (--estimate).',
    'Limits come from --limit (preset ids or mask CSV files, comma-separated) or else from the design’s emissions.masks. A peak scan judged against a quasi-peak or average limit is conservative, and the table says so.',
    'A band passes only when judged points cover it: a scan point (or a harmonic of the estimate) where a limit applies, above the noise floor, with the covered points reaching both edges of the band. A band without such evidence is "not covered" and the result fails; when nothing at all was judged (a scan in MHz read as Hz, say), there is no result: the command says why and exits 2. How the scan was read goes to standard error as notes, and what looks like a mistake as warnings.',
    'Exit code 0 when every band is covered and keeps the target margin, 1 when a band does not or is not covered, 2 on bad input or when nothing was judged.',
  ],
  arguments: [{ name: 'design.json', description: 'a design file (JSON, format "chokepoint-design", version 1 or 2)' }],
  options: [
    { name: 'scan', value: 'file', description: 'a scan: CSV or whitespace table of frequency and level columns (docs/scan-import.md)' },
    { name: 'estimate', description: 'use the design’s noise estimate (emissions.estimate) instead of a scan' },
    { name: 'limit', value: 'ids', description: `limit masks: preset ids or mask CSV files, comma-separated (presets: ${LIMIT_PRESETS.map((p) => p.id).join(', ')})` },
    { name: 'margin', value: 'dB', description: 'target margin below every limit (default: the design’s, else 6)' },
    { name: 'scan-tag', value: 'tag', description: `what the scan measured: ${SCAN_TAGS.join(', ')} (default ${DEFAULT_SCAN_TAG}: a line's level, mode unknown)` },
    { name: 'attribution', value: 'mode', description: `for a scan of unknown mode: ${ATTRIBUTIONS.join(', ')} (default: the design’s, else both)` },
    { name: 'noise-floor', value: 'dBµV', description: 'scan points at or below this level are left out of the required attenuation' },
    { name: 'frequency-unit', value: 'unit', description: 'the scan’s frequency unit when its header names none: Hz, kHz, MHz, GHz' },
    { name: 'level-unit', value: 'unit', description: 'the scan’s level unit when its header names none: dBuV, dBm, dBuA, V, dBV' },
    { name: 'transfer-impedance', value: 'ohm', description: 'for levels in dBµA: the current probe’s transfer impedance in Ω' },
    { name: 'peaks', value: 'n', description: 'how many worst peaks to list (default 10)' },
    { name: 'json', description: 'write the analysis as JSON instead of the table' },
    { name: 'out', short: 'o', value: 'file', description: 'write to <file> instead of standard output' },
  ],
  examples: [
    { command: `chokepoint check ${DEMO} --scan ${DEMO_SCAN} --limit cispr32-class-b-qp,cispr32-class-b-av`, description: 'the invented demo against its invented scan, class B' },
    { command: `chokepoint check ${DEMO} --scan ${DEMO_SCAN} --margin 3 --json -o out/check.json`, description: 'the design’s own limits, 3 dB target, as JSON' },
  ],
  run: runCheck,
};

async function runCheck(args: ParsedArgs, context: CommandContext): Promise<number> {
  const scanPath = args.value('scan');
  const useEstimate = args.flag('estimate');
  if ((scanPath === undefined) === !useEstimate) throw new UsageError('give either --scan <file> or --estimate', 'check');
  const targetMarginDb = readDecimalOption(args, 'margin', 'check', { min: -40, max: 60, unit: DB_UNIT });
  const noiseFloorDbuV = readDecimalOption(args, 'noise-floor', 'check', { min: -200, max: 300, unit: DB_UNIT });
  const peaks = readWholeOption(args, 'peaks', 'check', 1, 1000);
  const attribution = readChoice(args, 'attribution', ATTRIBUTIONS);
  const scanOptions = readScanOptions(args, scanPath);

  const design = await loadDesign(context, args.positionals[0]!);
  const masks = await readMasks(args, context, design);
  let input: NoiseInput;
  if (scanPath !== undefined) {
    const read = readScanText(await readInputFile(context, scanPath, 'the scan', { maxBytes: MAX_SCAN_FILE_BYTES, tooLarge: scanFileTooLarge }), scanOptions);
    if (!read.ok) {
      throw new CliError(`${scanPath}: ${read.error.message}`, listProblems(read.error.rejected.map((r) => `line ${r.line}: ${r.reason}`)));
    }
    for (const rejected of read.scan.rejected.slice(0, 20)) tell(context, `warning: ${scanPath}, line ${rejected.line} left out: ${rejected.reason}`);
    if (read.scan.rejected.length > 20) tell(context, `warning: ${scanPath}: ${read.scan.rejected.length - 20} more lines left out`);
    const warnings = new Set(read.scan.warnings ?? []);
    for (const note of read.scan.notes) tell(context, `${warnings.has(note) ? 'warning' : 'note'}: ${scanPath}: ${note}`);
    input = { kind: 'scan', scan: read.scan };
  } else {
    if (!design.emissions?.estimate) throw new CliError('--estimate: the design has no emissions.estimate (docs/design-format.md)');
    input = { kind: 'estimate' };
  }

  let analysis: EmissionsAnalysis;
  try {
    analysis = analyzeEmissions(design, input, {
      masks,
      ...(targetMarginDb === undefined ? {} : { targetMarginDb }),
      ...(noiseFloorDbuV === undefined ? {} : { noiseFloorDbuV }),
      ...(attribution === undefined ? {} : { attribution }),
      ...(peaks === undefined ? {} : { worstPeakCount: peaks }),
    });
  } catch (error) {
    if (error instanceof RangeError) throw new CliError(error.message);
    throw error;
  }
  const verdict = analysis.report.verdict;
  if (verdict.status === 'refused') {
    throw new CliError(`no result: ${analysis.input === 'scan' ? `the scan ${scanPath ?? ''}` : 'the noise estimate'} gives no evidence to judge`, verdict.reasons);
  }
  const text = args.flag('json') ? `${JSON.stringify(analysisToJson(design, analysis, input.kind === 'scan' ? input.scan : undefined))}\n` : marginTable(design, analysis, scanPath);
  await writeOutput(context, args.value('out'), text);
  return exitCodeOf(verdict);
}

/** 0 for a pass, 1 for a fail (a band short of the target or not covered), 2 when nothing was judged. */
export function exitCodeOf(verdict: Verdict): ExitCode {
  return verdict.status === 'pass' ? ExitCode.Ok : verdict.status === 'fail' ? ExitCode.NotPassed : ExitCode.BadInput;
}

/** "6 dB", "20 dBµV": a unit after a dB figure is allowed and dropped. */
const DB_UNIT = /\s*dB(µV|uV)?$/iu;

function readChoice<T extends string>(args: ParsedArgs, name: string, choices: readonly T[]): T | undefined {
  const text = args.value(name);
  if (text === undefined) return undefined;
  const choice = choices.find((c) => c === text);
  if (!choice) throw new UsageError(`--${name} must be one of ${choices.join(', ')}, got "${text}"`, 'check');
  return choice;
}

function readScanOptions(args: ParsedArgs, scanPath: string | undefined): ScanCsvOptions {
  const tag: ScanTag | undefined = readChoice(args, 'scan-tag', SCAN_TAGS);
  const frequencyText = args.value('frequency-unit');
  const frequencyUnit = frequencyText === undefined ? undefined : parseFrequencyUnit(frequencyText);
  if (frequencyText !== undefined && frequencyUnit === undefined) throw new UsageError(`--frequency-unit must be Hz, kHz, MHz or GHz, got "${frequencyText}"`, 'check');
  const levelText = args.value('level-unit');
  const levelUnit: LevelUnitName | undefined = levelText === undefined ? undefined : LEVEL_UNIT_NAMES.find((u) => u.toLowerCase() === levelText.toLowerCase());
  if (levelText !== undefined && levelUnit === undefined) throw new UsageError(`--level-unit must be dBuV, dBm, dBuA, V or dBV, got "${levelText}"`, 'check');
  const transfer = readDecimalOption(args, 'transfer-impedance', 'check', { min: 1e-6, max: 1e6, unit: /\s*(Ω|ohms?)$/iu });
  return {
    name: scanPath ?? 'scan',
    ...(tag ? { tag } : {}),
    ...(frequencyUnit ? { frequencyUnit } : {}),
    ...(levelUnit ? { levelUnit } : {}),
    ...(transfer === undefined ? {} : { transferImpedanceOhm: transfer }),
  };
}

/** --limit items: a preset id, or a mask CSV file; else the design's own masks. */
async function readMasks(args: ParsedArgs, context: CommandContext, design: Design): Promise<LimitMask[]> {
  const text = args.value('limit');
  if (text === undefined) {
    const own = design.emissions?.masks ?? [];
    if (own.length === 0) throw new CliError('no limit to judge against: give --limit <preset ids or mask files> or add emissions.masks to the design');
    return [...own];
  }
  const items = text.split(',').map((s) => s.trim()).filter((s) => s !== '');
  if (items.length === 0) throw new UsageError('--limit needs at least one preset id or file', 'check');
  const repeated = items.find((item, i) => items.indexOf(item) !== i);
  if (repeated !== undefined) throw new UsageError(`--limit: "${repeated}" is given twice; give each limit once`, 'check');
  if (items.length > MAX_LIMIT_MASKS) {
    throw new UsageError(`--limit gives ${items.length} limits; a design is judged against at most ${MAX_LIMIT_MASKS}`, 'check');
  }
  const masks: LimitMask[] = [];
  for (const item of items) {
    if (findPreset(item)) {
      masks.push(copyPreset(item));
      continue;
    }
    if (!/[./\\]/u.test(item)) {
      throw new UsageError(`--limit: "${item}" is neither a preset (${LIMIT_PRESETS.map((p) => p.id).join(', ')}) nor a file name`, 'check');
    }
    const read = readMaskCsv(await readInputFile(context, item, 'the limit mask'), { id: `mask${masks.length + 1}`, name: item });
    if (!read.ok) throw new CliError(`${item} is not a usable limit mask:`, listProblems(read.issues.map(formatLineIssue)));
    masks.push(read.value.mask);
  }
  return masks;
}

const MHZ = (f: number): string => formatQuantity(f, 'Hz', 4);
/** Six digits for a covered span, so that 29.998 MHz does not read as the band's 30 MHz. */
const EDGE = (f: number): string => formatQuantity(f, 'Hz', 6);
const DB = (x: number): string => (Number.isFinite(x) ? x.toFixed(1) : '–');

function pointRow(point: MarginPoint): string {
  return `${DB(point.marginDb).padStart(7)} dB at ${MHZ(point.frequencyHz).padEnd(11)} level ${DB(point.levelDbuV).padStart(6)} dBµV, limit ${DB(point.limitDbuV).padStart(6)} dBµV (${point.maskName}; ${point.series})${point.conservative ? ' *' : ''}`;
}

/** The margin table as a person reads it at a terminal. */
export function marginTable(design: Design, analysis: EmissionsAnalysis, scanPath: string | undefined): string {
  const { report } = analysis;
  const lines: string[] = [];
  lines.push(`design: ${design.name}`);
  lines.push(`noise: ${analysis.input === 'scan' ? `scan ${scanPath ?? ''}` : 'the design’s noise estimate'}; target margin ${report.targetMarginDb} dB`);
  lines.push(`limits: ${analysis.masks.map((m) => `${m.name} (${m.detector})`).join('; ')}`);
  lines.push('');
  lines.push('band                     worst margin');
  for (const band of report.bands) {
    lines.push(`${band.name.padEnd(24)} ${band.worst ? pointRow(band.worst) : '–'}  ${BAND_WORDS[band.status]}`);
    lines.push(`${''.padEnd(24)} ${coverageText(band)}`);
  }
  lines.push('');
  lines.push(`worst peaks (lowest margin first):`);
  for (const point of report.worstPeaks) lines.push(`  ${pointRow(point)}`);
  lines.push('');
  if (report.failingRanges.length === 0) lines.push('failing ranges: none');
  else {
    lines.push(`ranges below the ${report.targetMarginDb} dB target:`);
    for (const range of report.failingRanges) lines.push(`  ${MHZ(range.startHz)} to ${MHZ(range.stopHz)}: worst ${pointRow(range.worst)}`);
  }
  lines.push('');
  for (const [mode, required] of [
    ['common mode', analysis.requiredAttenuationCmDb],
    ['differential mode', analysis.requiredAttenuationDmDb],
  ] as const) {
    if (!required) continue;
    let worst = -1;
    for (let i = 0; i < required.length; i += 1) if (Number.isFinite(required[i]!) && (worst < 0 || required[i]! > required[worst]!)) worst = i;
    lines.push(
      worst < 0
        ? `attenuation needed, ${mode}: –`
        : `attenuation needed, ${mode}: up to ${DB(required[worst]!)} dB (at ${MHZ(analysis.frequencyHz[worst]!)}), for the limit less ${report.targetMarginDb} dB with no filter`,
    );
  }
  if (report.comparisons.some((c) => c.conservative)) lines.push('* a peak (or quasi-peak) reading judged against a lower-reading detector’s limit: conservative');
  for (const note of [...analysis.notes, ...report.notes]) lines.push(`note: ${note}`);
  lines.push('');
  lines.push(resultLine(report.verdict, report.targetMarginDb));
  return `${lines.join('\n')}\n`;
}

const BAND_WORDS: Readonly<Record<BandResult['status'], string>> = { pass: 'meets target', fail: 'BELOW TARGET', 'not-covered': 'NOT COVERED' };

/** The band's evidence: "29 judged points, covering 150 kHz to 498 kHz", or why it is not covered. */
function coverageText(band: BandResult): string {
  if (band.status === 'not-covered') return `not covered: ${band.reason}`;
  const span = band.coveredFromHz === undefined || band.coveredToHz === undefined ? '' : `, covering ${EDGE(band.coveredFromHz)} to ${EDGE(band.coveredToHz)}`;
  const floor = band.coveredPoints - band.judgedPoints;
  return `${band.judgedPoints} judged point${band.judgedPoints === 1 ? '' : 's'}${floor > 0 ? ` (${floor} more at the noise floor)` : ''}${span}`;
}

function resultLine(verdict: Verdict<BandResult>, target: number): string {
  const points = `${verdict.judgedPoints} judged point${verdict.judgedPoints === 1 ? '' : 's'}`;
  if (verdict.status === 'pass') return `RESULT: PASS, every band keeps ${target} dB of margin (${points})`;
  const below = verdict.items.filter((b) => b.status === 'fail').length;
  const uncovered = verdict.items.filter((b) => b.status === 'not-covered').length;
  const parts: string[] = [];
  if (below > 0) parts.push(`${below} band${below === 1 ? '' : 's'} below the ${target} dB target`);
  if (uncovered > 0) parts.push(`${uncovered} band${uncovered === 1 ? '' : 's'} not covered`);
  return `RESULT: FAIL, ${parts.join(', ') || describeShortfall(verdict)} (${points})`;
}

function analysisToJson(design: Design, analysis: EmissionsAnalysis, scan: Scan | undefined): unknown {
  const list = (a: Float64Array | undefined): (number | null)[] | undefined => (a ? Array.from(a, (x) => (Number.isFinite(x) ? x : null)) : undefined);
  return {
    design: design.name,
    input: analysis.input,
    targetMarginDb: analysis.report.targetMarginDb,
    pass: analysis.report.pass,
    verdict: { status: analysis.report.verdict.status, judgedPoints: analysis.report.verdict.judgedPoints, reasons: analysis.report.verdict.reasons },
    masks: analysis.masks.map((m) => ({ id: m.id, name: m.name, detector: m.detector, origin: m.origin })),
    bands: analysis.report.bands,
    worst: analysis.report.worst,
    worstPeaks: analysis.report.worstPeaks,
    failingRanges: analysis.report.failingRanges,
    notes: [...analysis.notes, ...analysis.report.notes],
    ...(scan ? { scanNotes: scan.notes, scanWarnings: scan.warnings ?? [] } : {}),
    frequencyHz: list(analysis.frequencyHz),
    predicted: analysis.predicted.map((s) => ({ label: s.label, detector: s.detector, levelDbuV: list(s.levelDbuV) })),
    comparisons: analysis.report.comparisons.map((c) => ({
      series: c.series,
      detector: c.seriesDetector,
      mask: c.maskName,
      conservative: c.conservative,
      limitDbuV: list(c.limitDbuV),
      marginDb: list(c.marginDb),
    })),
    requiredAttenuationCmDb: list(analysis.requiredAttenuationCmDb),
    requiredAttenuationDmDb: list(analysis.requiredAttenuationDmDb),
  };
}
