import { type CheckContext, describeSupply, toleranceAssumption } from '../check-context.ts';
import { figure, formatFigure, shareOf } from '../figure-format.ts';
import { conductsAtMainsFrequency, isToGround, lineOf, mainsImpedanceOhm, nameOf, type PlacedElement, storedCapacitanceF } from '../filter-positions.ts';
import { type LargestYCapacitance, largestYCapacitance, leakageCases } from '../leakage-cases.ts';
import type { ResolvedLeakageLimit } from '../safety-choices.ts';
import { checkResult, type Figures, judged, notApplicable, notChecked, type SafetyCheckResult, type SafetyFigure, type SafetyFinding } from '../safety-finding.ts';
import type { SourceNote } from '../source-confirmation.ts';

/**
 * Y-capacitor leakage (touch) current at the highest supply voltage and frequency, in normal
 * condition and with one supply conductor open (leakage-cases.ts says which capacitance each sees),
 * against the user's limit; and the largest Y capacitance that keeps within it.
 */

/** Room for rounding when a value sits exactly on its limit (a capacitance sized by largestYCapacitance). */
const ON_THE_LIMIT = 1 + 1e-12;

export interface LeakageCheckOutcome {
  readonly result: SafetyCheckResult;
  readonly largestY?: LargestYCapacitance;
}

interface GroundParts {
  readonly line1F: number;
  readonly line2F: number;
  readonly acrossF: number;
  readonly capacitors: readonly PlacedElement[];
  readonly conducting: readonly PlacedElement[];
  readonly unknown: readonly PlacedElement[];
}

function groundParts(elements: readonly PlacedElement[]): GroundParts {
  let line1F = 0;
  let line2F = 0;
  let acrossF = 0;
  const capacitors: PlacedElement[] = [];
  const conducting: PlacedElement[] = [];
  const unknown: PlacedElement[] = [];
  for (const placed of elements) {
    const { placement, part } = placed.element;
    const capacitance = storedCapacitanceF(part);
    if (placement === 'line-to-line') {
      if (capacitance !== undefined) acrossF += capacitance;
      continue;
    }
    if (!isToGround(placement)) continue;
    if (capacitance !== undefined) {
      if (lineOf(placement) === 'line1') line1F += capacitance;
      else line2F += capacitance;
      capacitors.push(placed);
    } else if (conductsAtMainsFrequency(part)) conducting.push(placed);
    else unknown.push(placed);
  }
  return { line1F, line2F, acrossF, capacitors, conducting, unknown };
}

function limitWords(limit: ResolvedLeakageLimit): string {
  return limit.source ? `${limit.name}, ${limit.source.standard} ${limit.source.clause}` : limit.name;
}

/** The plain-words warning a result repeats when its limit is not from the published text. */
function confirmationSentence(limit: ResolvedLeakageLimit): string {
  if (!limit.source) return 'The limit is the value you entered.';
  if (limit.source.confirmation === 'published-text') return '';
  return `The limit is ${limit.source.confirmationText}.`;
}

function sourcesOf(limit: ResolvedLeakageLimit | undefined): SourceNote[] {
  return limit?.source ? [limit.source] : [];
}

export function leakageCheck(ctx: CheckContext): LeakageCheckOutcome {
  const parts = groundParts(ctx.elements.enabled);
  const limit = ctx.choices.leakageLimit;
  const tolerance = ctx.choices.capacitorTolerance.value;
  const assumptions = baseAssumptions(ctx, parts);
  const capacitanceFigures: Figures = [
    figure('capacitance from line 1 to ground', parts.line1F, 'F'),
    figure('capacitance from line 2 to ground', parts.line2F, 'F'),
  ];
  const findings: SafetyFinding[] = [];
  const supply = ctx.supply;

  if (supply === undefined) {
    findings.push(
      notChecked(
        { id: 'leakage.normal', title: 'Leakage current', summary: 'Not checked: the supply voltage and frequency are not given (operating.supply).' },
        ['operating.supply'],
        capacitanceFigures,
      ),
    );
    return { result: finish(findings, [], assumptions) };
  }
  if (supply.kind === 'dc') {
    findings.push(
      notApplicable(
        {
          id: 'leakage.normal',
          title: 'Leakage current',
          summary: `Not applicable: a ${describeSupply(supply)} input draws no mains-frequency current through its capacitors to ground. If the DC input is taken from mains or is itself hazardous, check touch current as its standard asks.`,
        },
        capacitanceFigures,
      ),
    );
    return { result: finish(findings, [], assumptions) };
  }

  const voltageV = supply.highestVoltage;
  const frequencyHz = supply.highestFrequencyHz;
  const cases = leakageCases(parts, voltageV, frequencyHz, tolerance);
  const conditions = `at ${describeSupply(supply)} with the capacitors +${Number((tolerance * 100).toPrecision(3))} %`;

  for (const placed of parts.conducting) findings.push(conductingFinding(placed, voltageV, frequencyHz));
  for (const placed of parts.unknown) {
    findings.push(
      notChecked(
        {
          id: `leakage.${placed.element.id}`,
          subject: placed.element.id,
          title: 'Part from a line to ground',
          summary: `Not checked: ${nameOf(placed.element)} is a measured part from a line to ground; its mains-frequency impedance is not known. Give it as a capacitor (or a damping R-C) with its capacitance to include it.`,
        },
        [`${placed.path}.part: a capacitor with its capacitance`],
      ),
    );
  }

  const normalFigures: SafetyFigure[] = [
    ...capacitanceFigures,
    figure('leakage current, line 1 live', cases.line1LiveA, 'A'),
    figure('leakage current, line 2 live', cases.line2LiveA, 'A'),
  ];
  const normalText = {
    id: 'leakage.normal',
    title: 'Leakage current, normal condition',
    sources: sourcesOf(limit),
    assumptions: ['Either line may be the live one (a plug that fits both ways): the larger current is judged.'],
  };
  if (limit === undefined) {
    findings.push(
      notChecked(
        { ...normalText, summary: `Not checked against a limit: ${formatFigure(cases.normalA, 'A')} ${conditions}; choose a limit from the list or enter one (safety.leakageLimit).` },
        ['safety.leakageLimit'],
        normalFigures,
      ),
    );
  } else {
    const within = cases.normalA <= limit.normalConditionA * ON_THE_LIMIT;
    const share = shareOf(cases.normalA, limit.normalConditionA);
    findings.push(
      judged(
        within ? 'pass' : 'fail',
        {
          ...normalText,
          summary: `${formatFigure(cases.normalA, 'A')} ${conditions}: ${formatFigure(share, '%')} of the ${formatFigure(limit.normalConditionA, 'A')} limit (${limitWords(limit)}).${suffix(confirmationSentence(limit))}`,
        },
        [...capacitanceFigures, ...normalFigures.slice(2), figure('limit, normal condition', limit.normalConditionA, 'A'), figure('share of the limit', share, '%')],
      ),
    );
  }

  findings.push(openConductorFinding(parts, cases, limit, conditions));

  const largestY = limit === undefined ? undefined : largestYCapacitance(limit, voltageV, frequencyHz, tolerance);
  const checkFigures = largestY
    ? [figure('largest Y capacitance per line', largestY.perLineF, 'F'), figure('largest total Y capacitance', largestY.totalF, 'F')]
    : [];
  if (largestY) {
    assumptions.push(
      `The largest Y capacitance within the limit is ${formatFigure(largestY.perLineF, 'F')} per line and ${formatFigure(largestY.totalF, 'F')} in total (set by the ${largestY.governedBy === 'single-fault' ? 'single fault' : 'normal condition'}${largestY.singleFaultLimitFromNormal ? '; with no separate single-fault limit, the normal-condition limit is used for the total' : ''}).`,
    );
  }
  return { result: finish(findings, checkFigures, assumptions), ...(largestY ? { largestY } : {}) };
}

function suffix(sentence: string): string {
  return sentence === '' ? '' : ` ${sentence}`;
}

function openConductorFinding(
  parts: GroundParts,
  cases: ReturnType<typeof leakageCases>,
  limit: ResolvedLeakageLimit | undefined,
  conditions: string,
): SafetyFinding {
  const figures: Figures = [
    figure('capacitance from both lines to ground', parts.line1F + parts.line2F, 'F'),
    figure('leakage current, one supply conductor open', cases.openConductorA, 'A'),
    figure('the same with the load not conducting', cases.openConductorLoadOpenA, 'A'),
  ];
  const text = {
    id: 'leakage.single-fault',
    title: 'Leakage current, one supply conductor open (single fault)',
    sources: sourcesOf(limit),
    assumptions: [
      'With one supply conductor open, the floating line reaches the live voltage through the converter’s input or the X capacitors, so the live line sees both lines’ capacitance to ground (the worst case, judged). With the load not conducting, only the X capacitors tie the lines and the floating line’s capacitor is in series with them.',
      'With the protective earth open (class I), a person touching the enclosure carries the normal-condition current above.',
    ],
  };
  if (limit === undefined) {
    return notChecked(
      { ...text, summary: `Not checked against a limit: ${formatFigure(cases.openConductorA, 'A')} ${conditions}; choose a limit (safety.leakageLimit).` },
      ['safety.leakageLimit'],
      figures,
    );
  }
  const ownLimit = limit.singleFaultA;
  const limitA = ownLimit ?? limit.normalConditionA;
  const within = cases.openConductorA <= limitA * ON_THE_LIMIT;
  const share = shareOf(cases.openConductorA, limitA);
  const judgedFigures: Figures = [...figures, figure(ownLimit === undefined ? 'limit (normal condition, used for the fault)' : 'limit, single fault', limitA, 'A'), figure('share of the limit', share, '%')];
  const base = `${formatFigure(cases.openConductorA, 'A')} ${conditions}: ${formatFigure(share, '%')} of the ${formatFigure(limitA, 'A')}`;
  if (ownLimit !== undefined) {
    return judged(within ? 'pass' : 'fail', { ...text, summary: `${base} single-fault limit (${limitWords(limit)}).${suffix(confirmationSentence(limit))}` }, judgedFigures);
  }
  return judged(
    within ? 'pass' : 'warn',
    {
      ...text,
      summary: within
        ? `${base} limit even with a supply conductor open (${limitWords(limit)}).${suffix(confirmationSentence(limit))}`
        : `${base} limit with a supply conductor open. The list gives no single-fault limit for ${limitWords(limit)}: check whether its test opens a supply conductor and what it allows then.${suffix(confirmationSentence(limit))}`,
    },
    judgedFigures,
  );
}

function conductingFinding(placed: PlacedElement, voltageV: number, frequencyHz: number): SafetyFinding {
  const impedanceOhm = mainsImpedanceOhm(placed.element.part, frequencyHz) ?? 0;
  const currentA = impedanceOhm === 0 ? Number.POSITIVE_INFINITY : voltageV / impedanceOhm;
  return judged(
    'fail',
    {
      id: `leakage.${placed.element.id}`,
      subject: placed.element.id,
      title: 'Conducting part from a line to ground',
      summary:
        impedanceOhm === 0
          ? `${nameOf(placed.element)} shorts a line to ground: on mains it connects the supply to protective earth.`
          : `${nameOf(placed.element)} (a ${placed.element.part.kind}) conducts from a line to ground: about ${formatFigure(currentA, 'A')} at ${voltageV} V, ${frequencyHz} Hz flows to protective earth. Only capacitors belong between a line and earth on mains.`,
    },
    [figure('impedance at mains frequency', impedanceOhm, 'Ω'), figure('current to ground', currentA, 'A')],
  );
}

function baseAssumptions(ctx: CheckContext, parts: GroundParts): string[] {
  const counted = parts.capacitors.map((p) => p.element.id);
  const lines = [
    `Counted between the lines and ground: ${counted.length === 0 ? 'no capacitors' : counted.join(', ')} (capacitors and damping R-Cs; a damping R-C’s resistor only lowers its current).`,
    'The design’s ground is protective earth (class I) or the accessible conductive parts (class II); the receiving networks (LISNs) are test equipment and are not counted.',
    'The noise source’s impedance to ground (noiseSource.commonMode) is a radio-frequency model and is not counted: if the converter has real capacitance to earth (its own Y capacitor, a heat sink), add its current.',
    'Series parts are plain connections at mains frequency, so a capacitor acts on its line wherever it sits in the chain.',
    'The neutral is at earth potential (TN or TT supply); on a supply with both lines live to earth the figures differ.',
    'I = 2π·f·C·V: at 50/60 Hz the body model of IEC 60990 weights the current by about 1 (common practice).',
    toleranceAssumption(ctx.choices),
  ];
  const off = ctx.elements.disabled.filter((p) => isToGround(p.element.placement)).map((p) => p.element.id);
  if (off.length > 0) lines.push(`Disabled and not counted: ${off.join(', ')}.`);
  return lines;
}

function finish(findings: readonly SafetyFinding[], figures: readonly SafetyFigure[], assumptions: readonly string[]): SafetyCheckResult {
  return checkResult('leakage', findings, figures, assumptions);
}
