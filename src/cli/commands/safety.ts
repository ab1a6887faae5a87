import type { SafetyChoices, SafetyChoicesInput } from '../../model/design.ts';
import { formatPath } from '../../model/index.ts';
import { DISCHARGE_REQUIREMENT_IDS, LEAKAGE_LIMIT_IDS, safetySchema } from '../../model/safety-schema.ts';
import { parseQuantity } from '../../model/units.ts';
import {
  describeSource,
  DISCHARGE_REQUIREMENTS,
  formatFigure,
  LEAKAGE_LIMITS,
  runSafetyChecks,
  SAFETY_CHECK_IDS,
  STATUS_WORDS,
  type SafetyCheckId,
  type SafetyReport,
} from '../../safety/index.ts';
import type { ParsedArgs } from '../args.ts';
import type { Command, CommandContext } from '../command.ts';
import { loadDesign } from '../design-input.ts';
import { ExitCode, UsageError } from '../exit-codes.ts';
import { wrap } from '../help.ts';
import { writeOutput } from '../output.ts';

const FIXTURE = 'fixtures/safety/adapter-with-safety-data.design.json';
const DEMO = 'fixtures/demo/adapter-two-stage.design.json';

export const safetyCommand: Command = {
  name: 'safety',
  summary: 'check a mains filter for leakage current, X-capacitor discharge, safety classes, voltage stress, copper loss and saturation',
  description: [
    'Runs the safety and practical checks of docs/safety.md on the design: leakage (touch) current in normal condition and with a supply conductor open, X-capacitor discharge, capacitor safety class, voltage stress against the ratings, line current against the ratings with the copper loss, and saturation of chokes and inductors. Each result is pass, warning or FAIL with its numbers and assumptions, or "not checked" with what to give. A planning aid, not a certification.',
    'The supply and line current come from the design’s operating block; the choices (leakage limit, discharge requirement, tolerance, margins) from its safety block, overridden by the options below.',
    `Leakage limits (--leakage-limit): ${LEAKAGE_LIMITS.map((l) => `${l.id} (${formatFigure(l.normalConditionA, 'A')}${l.singleFaultA === undefined ? '' : ` / ${formatFigure(l.singleFaultA, 'A')} single fault`}; ${l.source.standard} ${l.source.clause}; ${l.source.confirmation === 'not-confirmed' ? 'not confirmed' : 'secondary source'})`).join(', ')}; or a current such as 0.5mA.`,
    `Discharge requirements (--discharge): ${DISCHARGE_REQUIREMENTS.map((r) => `${r.id} (${r.rule.kind === 'time-constant' ? `τ ≤ ${r.rule.maxTimeConstantS} s` : `${r.rule.maxVoltageV} V after ${r.rule.afterS} s`}; ${r.source!.standard} ${r.source!.clause})`).join(', ')}; or a time constant such as 1s, or a voltage after a time such as 34V@1s.`,
    'Exit code 0 when every check ran and none failed (warnings allowed); 1 when a check failed, or when a check could not run for a missing input (a "not checked" never counts as a pass: give the input, or leave the check out with --skip); 2 on bad input.',
  ],
  arguments: [{ name: 'design.json', description: 'a design file (JSON, format "chokepoint-design")' }],
  options: [
    { name: 'leakage-limit', value: 'id|current', description: 'the leakage limit: an id from the list above, or a current in normal condition (0.5mA)' },
    { name: 'single-fault-limit', value: 'current', description: 'with an entered --leakage-limit: the limit with a supply conductor open' },
    { name: 'discharge', value: 'requirement', description: 'the discharge requirement: an id from the list above, a time constant (1s) or a voltage after a time (34V@1s)' },
    { name: 'tolerance', value: 'fraction', description: 'upper tolerance of every capacitor: 0.2 or 20% (default: the design’s, else 20 %)' },
    { name: 'saturation-margin', value: 'fraction', description: 'how far below saturation the peak flux must stay: 0.2 or 20% (default: the design’s, else 20 %)' },
    { name: 'crest-factor', value: 'n', description: 'peak over rms of the line current (default: the design’s, else √2 on mains, 1 on DC)' },
    { name: 'skip', value: 'checks', description: `checks to leave out, comma-separated: ${SAFETY_CHECK_IDS.join(', ')}` },
    { name: 'json', description: 'write the results as JSON instead of text' },
    { name: 'out', short: 'o', value: 'file', description: 'write to <file> instead of standard output' },
  ],
  examples: [
    { command: `chokepoint safety ${FIXTURE}`, description: 'the invented adapter with its operating conditions and safety choices' },
    { command: `chokepoint safety ${FIXTURE} --leakage-limit iec60335-1-class-ii --discharge 34V@1s`, description: 'the same against other choices' },
    { command: `chokepoint safety ${DEMO} --skip saturation --json -o out/safety.json`, description: 'the demo, which gives no supply: its checks say what is missing' },
  ],
  run: runSafety,
};

async function runSafety(args: ParsedArgs, context: CommandContext): Promise<number> {
  const choices = readChoices(args);
  const skip = readSkip(args);
  const design = await loadDesign(context, args.positionals[0]!);
  const report = runSafetyChecks(design, { choices, skip });
  const text = args.flag('json') ? `${JSON.stringify(report, null, 2)}\n` : safetyText(report);
  await writeOutput(context, args.value('out'), text);
  return report.outcome === 'pass' ? ExitCode.Ok : ExitCode.NotPassed;
}

function fraction(args: ParsedArgs, name: string): number | undefined {
  const text = args.value(name);
  if (text === undefined) return undefined;
  const percent = /^\s*([0-9.eE+-]+)\s*%\s*$/u.exec(text);
  const value = percent ? Number(percent[1]) / 100 : Number(text.trim());
  if (!Number.isFinite(value) || text.trim() === '') throw new UsageError(`--${name} must be a fraction such as 0.2 or a percentage such as 20%, got "${text}"`, 'safety');
  return value;
}

function quantityOption(args: ParsedArgs, name: string, text: string, unit: 'A' | 'V' | 's'): number {
  const read = parseQuantity(text, unit);
  if (!read.ok) throw new UsageError(`--${name}: cannot read "${text}": ${read.reason}`, 'safety');
  return read.value;
}

/** The options as a safety block, validated by the design format's own schema. */
export function readChoices(args: ParsedArgs): SafetyChoices {
  const input: SafetyChoicesInput = {};
  const limit = args.value('leakage-limit');
  const singleFault = args.value('single-fault-limit');
  if (limit !== undefined) {
    const listed = LEAKAGE_LIMIT_IDS.find((id) => id === limit.trim());
    if (listed) {
      if (singleFault !== undefined) throw new UsageError('--single-fault-limit goes with an entered --leakage-limit (a current), not with a listed one', 'safety');
      input.leakageLimit = { kind: 'listed-limit', id: listed };
    } else if (/^\s*[0-9.]/u.test(limit)) {
      input.leakageLimit = {
        kind: 'entered-limit',
        normalCondition: quantityOption(args, 'leakage-limit', limit, 'A'),
        ...(singleFault === undefined ? {} : { singleFault: quantityOption(args, 'single-fault-limit', singleFault, 'A') }),
        label: 'entered on the command line',
      };
    } else {
      throw new UsageError(`--leakage-limit: "${limit}" is neither a listed limit (${LEAKAGE_LIMIT_IDS.join(', ')}) nor a current such as 0.5mA`, 'safety');
    }
  } else if (singleFault !== undefined) {
    throw new UsageError('--single-fault-limit needs an entered --leakage-limit (a current)', 'safety');
  }
  const discharge = args.value('discharge');
  if (discharge !== undefined) {
    const listed = DISCHARGE_REQUIREMENT_IDS.find((id) => id === discharge.trim());
    const [voltage, after, extra] = discharge.split('@');
    if (listed) input.discharge = { kind: 'listed-requirement', id: listed };
    else if (after !== undefined && extra === undefined) {
      input.discharge = { kind: 'residual-voltage', maxVoltage: quantityOption(args, 'discharge', voltage!, 'V'), after: quantityOption(args, 'discharge', after, 's'), label: 'entered on the command line' };
    } else if (/^\s*[0-9.]/u.test(discharge)) {
      input.discharge = { kind: 'time-constant', maxTimeConstant: quantityOption(args, 'discharge', discharge, 's'), label: 'entered on the command line' };
    } else {
      throw new UsageError(`--discharge: "${discharge}" is neither a listed requirement (${DISCHARGE_REQUIREMENT_IDS.join(', ')}), a time constant such as 1s, nor a voltage after a time such as 34V@1s`, 'safety');
    }
  }
  const tolerance = fraction(args, 'tolerance');
  if (tolerance !== undefined) input.capacitorTolerance = tolerance;
  const margin = fraction(args, 'saturation-margin');
  if (margin !== undefined) input.saturationMargin = margin;
  const crest = args.value('crest-factor');
  if (crest !== undefined) {
    const value = Number(crest.trim());
    if (crest.trim() === '' || !Number.isFinite(value)) throw new UsageError(`--crest-factor must be a number such as 2.5, got "${crest}"`, 'safety');
    input.lineCurrentCrestFactor = value;
  }
  const parsed = safetySchema.safeParse(input);
  if (!parsed.success) {
    const OPTION: Record<string, string> = { capacitorTolerance: '--tolerance', saturationMargin: '--saturation-margin', lineCurrentCrestFactor: '--crest-factor', leakageLimit: '--leakage-limit', discharge: '--discharge' };
    const issue = parsed.error.issues[0]!;
    const head = String(issue.path[0] ?? '');
    throw new UsageError(`${OPTION[head] ?? formatPath(issue.path.map((p) => (typeof p === 'symbol' ? String(p) : p)))}: ${issue.message}`, 'safety');
  }
  return parsed.data;
}

function readSkip(args: ParsedArgs): SafetyCheckId[] {
  const text = args.value('skip');
  if (text === undefined) return [];
  return text
    .split(',')
    .map((s) => s.trim())
    .filter((s) => s !== '')
    .map((name) => {
      const id = SAFETY_CHECK_IDS.find((c) => c === name);
      if (!id) throw new UsageError(`--skip: "${name}" is not a check; the checks are ${SAFETY_CHECK_IDS.join(', ')}`, 'safety');
      return id;
    });
}

const STATUS_COLUMN = 14;

/** The results as a person reads them at a terminal. */
export function safetyText(report: SafetyReport): string {
  const lines: string[] = [];
  const { choices } = report;
  lines.push(`design: ${report.designName}`);
  lines.push(`supply: ${report.supply?.text ?? 'not given (operating.supply)'}; line current: ${report.lineCurrentA === undefined ? 'not given (operating.lineCurrent)' : formatFigure(report.lineCurrentA, 'A')}`);
  const limit = choices.leakageLimit;
  lines.push(
    ...wrap(
      `leakage limit: ${limit ? `${formatFigure(limit.normalConditionA, 'A')}${limit.singleFaultA === undefined ? '' : ` (single fault ${formatFigure(limit.singleFaultA, 'A')})`}, ${limit.name}${limit.source ? `, ${describeSource(limit.source)}` : ''}` : 'none chosen'}`,
      100,
      '',
      '  ',
    ),
  );
  const discharge = choices.discharge;
  lines.push(...wrap(`discharge requirement: ${discharge ? `${discharge.name}${discharge.source ? `, ${describeSource(discharge.source)}` : ''}` : 'none chosen'}`, 100, '', '  '));
  const chosen = (v: { value: number; given: boolean }, text: string) => `${text}${v.given ? '' : ' (default)'}`;
  lines.push(
    `capacitor tolerance: ${chosen(choices.capacitorTolerance, `+${Number((choices.capacitorTolerance.value * 100).toPrecision(3))} %`)}; saturation margin: ${chosen(choices.saturationMargin, `${Number((choices.saturationMargin.value * 100).toPrecision(3))} %`)}; crest factor: ${chosen(choices.lineCurrentCrestFactor, String(Number(choices.lineCurrentCrestFactor.value.toPrecision(4))))}`,
  );
  for (const check of report.checks) {
    lines.push('', `${check.title.toUpperCase()}: ${STATUS_WORDS[check.status]}`);
    for (const f of check.findings) {
      lines.push(...wrap(f.summary, 100, `  ${STATUS_WORDS[f.status].padEnd(STATUS_COLUMN)}`, ' '.repeat(STATUS_COLUMN + 2)));
      if (f.status === 'not-checked') lines.push(...wrap(`give: ${f.missing.join('; ')}`, 100, ' '.repeat(STATUS_COLUMN + 2), ' '.repeat(STATUS_COLUMN + 4)));
    }
    for (const fig of check.figures) lines.push(`  ${fig.label}: ${fig.text}`);
    const assumptions = [...check.assumptions, ...check.findings.flatMap((f) => f.assumptions)];
    if (assumptions.length > 0) {
      lines.push('  assumptions:');
      for (const a of [...new Set(assumptions)]) lines.push(...wrap(a, 100, '    - ', '      '));
    }
  }
  lines.push('', 'CAUTIONS');
  for (const caution of report.cautions) lines.push(...wrap(caution.text, 100, '  - ', '    '));
  lines.push('');
  const { counts } = report;
  const warnings = counts.warn === 0 ? '' : `, ${counts.warn} warning${counts.warn === 1 ? '' : 's'}`;
  if (report.outcome === 'pass') lines.push(`RESULT: PASS, no check failed${warnings}`);
  else if (report.outcome === 'fail') lines.push(`RESULT: FAIL, ${counts.fail} failed${counts['not-checked'] > 0 ? `, ${counts['not-checked']} not checked` : ''}${warnings}`);
  else lines.push(`RESULT: INCOMPLETE, ${counts['not-checked']} not checked (give the inputs named above, or --skip the checks)${warnings}`);
  return `${lines.join('\n')}\n`;
}
