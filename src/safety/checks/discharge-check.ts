import { type CheckContext, describeSupply, toleranceAssumption } from '../check-context.ts';
import { bleederPowerW, mainsPeakV, maxBleedResistanceOhm, maxTimeConstantForResidualS, parallelResistanceOhm, residualVoltageV } from '../discharge.ts';
import { type DischargeRequirement, DISCHARGE_EXEMPTION_F } from '../discharge-requirements.ts';
import { figure, formatFigure } from '../figure-format.ts';
import { isToGround, lineOf, nameOf, type PlacedElement, storedCapacitanceF } from '../filter-positions.ts';
import { atLeastOne, checkResult, type Figures, judged, notApplicable, notChecked, type SafetyCheckResult, type SafetyFigure } from '../safety-finding.ts';
import { type SourceNote, sourceNote } from '../source-confirmation.ts';

/**
 * X-capacitor discharge: the capacitance left across the plug pins when the product is unplugged,
 * the largest bleed resistance that meets the chosen requirement and what it dissipates, and the
 * design's own bleeder against it.
 *
 * Recognising a bleeder: every enabled `resistor` element placed `line-to-line` is one (the chokes
 * and series parts are connections at DC, so it bleeds every X capacitor wherever it sits), in
 * parallel with `safety.externalBleedResistance` for one outside the filter. Nothing else counts: a
 * damping R-C blocks DC, and an active discharge circuit must be entered as its equivalent resistance.
 */

const EXEMPTION_SOURCES: readonly SourceNote[] = [sourceNote('IEC 60335-1', 'cl. 22.5', 'published-text'), sourceNote('IEC 60950-1', 'cl. 2.1.1.7', 'published-text')];
/** Room for rounding when a part sits exactly on its bound. */
const ON_THE_BOUND = 1 + 1e-12;

interface PinCapacitance {
  /** Everything across the lines at DC: X capacitors, damping R-Cs, and the two Y groups in series through ground. */
  readonly totalF: number;
  readonly acrossF: number;
  readonly yInSeriesF: number;
  readonly across: readonly PlacedElement[];
}

function pinCapacitance(elements: readonly PlacedElement[]): PinCapacitance {
  let acrossF = 0;
  let line1F = 0;
  let line2F = 0;
  const across: PlacedElement[] = [];
  for (const placed of elements) {
    const { placement, part } = placed.element;
    const c = storedCapacitanceF(part);
    if (c === undefined) continue;
    if (placement === 'line-to-line') {
      acrossF += c;
      across.push(placed);
    } else if (isToGround(placement)) {
      if (lineOf(placement) === 'line1') line1F += c;
      else line2F += c;
    }
  }
  const yInSeriesF = line1F + line2F === 0 ? 0 : (line1F * line2F) / (line1F + line2F);
  return { totalF: acrossF + yInSeriesF, acrossF, yInSeriesF, across };
}

function bleeders(elements: readonly PlacedElement[]): PlacedElement[] {
  return elements.filter((p) => p.element.placement === 'line-to-line' && p.element.part.kind === 'resistor');
}

function ruleWords(requirement: DischargeRequirement): string {
  const rule = requirement.rule;
  return rule.kind === 'time-constant'
    ? `a time constant of at most ${formatFigure(rule.maxTimeConstantS, 's')}`
    : `at most ${formatFigure(rule.maxVoltageV, 'V')} ${formatFigure(rule.afterS, 's')} after disconnection at the mains peak`;
}

/** "IEC 60335-1 cl. 22.5, household appliance, plug pins", or the entered requirement's own words. */
function requirementWords(requirement: DischargeRequirement): string {
  return requirement.source ? `${requirement.source.standard} ${requirement.source.clause}, ${requirement.name}` : requirement.name;
}

function requirementSources(requirement: DischargeRequirement): SourceNote[] {
  return [...(requirement.source ? [requirement.source] : []), ...(requirement.thresholdSource ? [requirement.thresholdSource] : [])];
}

function confirmationSentences(requirement: DischargeRequirement): string {
  if (!requirement.source) return ' The requirement is the one you entered.';
  const doubtful = requirementSources(requirement).filter((s) => s.confirmation !== 'published-text');
  return doubtful.map((s) => ` ${s.standard} ${s.clause}: ${s.confirmationText}.`).join('');
}

export function dischargeCheck(ctx: CheckContext): SafetyCheckResult {
  const pins = pinCapacitance(ctx.elements.enabled);
  const tolerance = ctx.choices.capacitorTolerance.value;
  const requirement = ctx.choices.discharge;
  const assumptions = [
    'The capacitance across the plug pins is every X capacitor and damping R-C across the lines plus the two lines’ Y capacitors in series through ground; the chokes are connections at DC.',
    'The converter’s rectifier does not discharge the X capacitors; a bleeder or discharge circuit inside the converter must be entered as safety.externalBleedResistance.',
    'Bleeders: the enabled resistors across the lines, and safety.externalBleedResistance.',
    toleranceAssumption(ctx.choices),
  ];
  const small = pins.across.filter((p) => storedCapacitanceF(p.element.part)! <= DISCHARGE_EXEMPTION_F * ON_THE_BOUND);
  if (small.length > 0) {
    assumptions.push(`At or below the 0.1 µF exemption value on their own: ${small.map((p) => `${p.element.id} (${formatFigure(storedCapacitanceF(p.element.part)!, 'F')})`).join(', ')}; the total across the pins decides.`);
  }
  const capacitanceFigures: Figures = [
    figure('capacitance across the plug pins', pins.totalF, 'F'),
    figure('of which across the lines', pins.acrossF, 'F'),
    figure('of which Y capacitors in series', pins.yInSeriesF, 'F'),
  ];
  const id = 'discharge.plug';
  const title = 'Charge left across the plug pins';
  const supply = ctx.supply;
  if (supply === undefined) {
    return finish([notChecked({ id, title, summary: 'Not checked: the supply voltage is not given (operating.supply).' }, ['operating.supply'], capacitanceFigures)], assumptions);
  }
  if (supply.kind === 'dc') {
    return finish([notApplicable({ id, title, summary: `Not applicable: a ${describeSupply(supply)} input; the plug-discharge clauses are for mains plugs.` }, capacitanceFigures)], assumptions);
  }
  if (requirement === undefined) {
    return finish([notChecked({ id, title, summary: `Not checked: ${formatFigure(pins.totalF, 'F')} across the plug pins; choose a discharge requirement (safety.discharge).` }, ['safety.discharge'], capacitanceFigures)], assumptions);
  }
  if (requirement.note) assumptions.push(`${requirementWords(requirement)}: ${requirement.note}.`);

  const sources = requirementSources(requirement);
  const exemptUpTo = requirement.exemptUpToF;
  if (exemptUpTo !== undefined && pins.totalF <= exemptUpTo * ON_THE_BOUND) {
    return finish(
      [
        judged(
          'pass',
          {
            id,
            title,
            summary: `Exempt: ${formatFigure(pins.totalF, 'F')} across the plug pins is at or below ${formatFigure(exemptUpTo, 'F')}, for which the requirement (${requirementWords(requirement)}) asks for no discharge path.${confirmationSentences(requirement)}`,
            sources: [...sources, ...EXEMPTION_SOURCES],
          },
          [...capacitanceFigures, figure('exemption value', exemptUpTo, 'F')],
        ),
      ],
      assumptions,
    );
  }
  if (pins.totalF === 0) {
    return finish([judged('pass', { id, title, summary: 'No capacitance across the plug pins: nothing to discharge.', sources }, capacitanceFigures)], assumptions);
  }

  const voltageV = supply.highestVoltage;
  const peakV = mainsPeakV(voltageV);
  const worstCapacitanceF = pins.totalF * (1 + tolerance);
  const rule = requirement.rule;
  const maxTauS = rule.kind === 'time-constant' ? rule.maxTimeConstantS : maxTimeConstantForResidualS(peakV, rule.maxVoltageV, rule.afterS);
  const ruleFigures: SafetyFigure[] = [...capacitanceFigures, figure('mains peak', peakV, 'V')];
  if (!Number.isFinite(maxTauS)) {
    const maxV = rule.kind === 'residual-voltage' ? rule.maxVoltageV : 0;
    return finish(
      [judged('pass', { id, title, summary: `The mains peak ${formatFigure(peakV, 'V')} is already below ${formatFigure(maxV, 'V')}: no discharge path is needed for ${requirementWords(requirement)}.`, sources }, [figure('mains peak', peakV, 'V'), figure('allowed residual voltage', maxV, 'V')])],
      assumptions,
    );
  }
  const maxR = maxBleedResistanceOhm(maxTauS, worstCapacitanceF);
  const maxRPowerW = bleederPowerW(voltageV, maxR);
  ruleFigures.push(figure('largest time constant', maxTauS, 's'), figure('largest bleed resistance', maxR, 'Ω'), figure('its dissipation at the highest voltage', maxRPowerW, 'W'));

  const own = bleeders(ctx.elements.enabled);
  const ownOhm = own.map((p) => (p.element.part.kind === 'resistor' ? p.element.part.resistance : Number.POSITIVE_INFINITY));
  const external = ctx.choices.externalBleedResistanceOhm;
  const bleedOhm = parallelResistanceOhm([...ownOhm, ...(external === undefined ? [] : [external])]);
  const needs = `The requirement (${requirementWords(requirement)}) asks for ${ruleWords(requirement)}: with ${formatFigure(worstCapacitanceF, 'F')} across the pins (+tolerance) that is a bleed resistance of at most ${formatFigure(maxR, 'Ω')}, dissipating ${formatFigure(maxRPowerW, 'W')} at ${voltageV} V.`;
  if (!Number.isFinite(bleedOhm)) {
    return finish(
      [judged('fail', { id, title, summary: `No discharge path: ${needs} Add a bleeder across the lines (or enter the converter’s as safety.externalBleedResistance).${confirmationSentences(requirement)}`, sources }, atLeastOne(ruleFigures))],
      assumptions,
    );
  }
  if (bleedOhm === 0) {
    return finish(
      [judged('fail', { id, title, summary: 'A zero-ohm resistor across the lines shorts the supply: a bleeder must be a resistance that holds the mains voltage.', sources }, [figure('bleed resistance', 0, 'Ω')])],
      assumptions,
    );
  }
  const names = [...own.map((p) => nameOf(p.element)), ...(external === undefined ? [] : ['the external bleed resistance'])];
  assumptions.push(`Bleeding the pins: ${names.join(', ')}${names.length > 1 ? ', in parallel' : ''}. A bleeder holds the full mains voltage: use parts (or a series string) rated for it, and no switch between it and the capacitors.`);
  const tauS = bleedOhm * worstCapacitanceF;
  const powerW = bleederPowerW(voltageV, bleedOhm);
  const within = bleedOhm <= maxR * ON_THE_BOUND;
  const ownFigures: SafetyFigure[] = [figure('bleed resistance', bleedOhm, 'Ω'), figure('time constant', tauS, 's'), figure('bleeder dissipation', powerW, 'W')];
  if (rule.kind === 'residual-voltage') ownFigures.push(figure(`voltage after ${formatFigure(rule.afterS, 's')}`, residualVoltageV(peakV, tauS, rule.afterS), 'V'));
  const result =
    rule.kind === 'residual-voltage'
      ? `${formatFigure(residualVoltageV(peakV, tauS, rule.afterS), 'V')} is left after ${formatFigure(rule.afterS, 's')} (allowed ${formatFigure(rule.maxVoltageV, 'V')})`
      : `the time constant is ${formatFigure(tauS, 's')} (allowed ${formatFigure(rule.maxTimeConstantS, 's')})`;
  return finish(
    [
      judged(
        within ? 'pass' : 'fail',
        {
          id,
          title,
          summary: `${formatFigure(bleedOhm, 'Ω')} across ${formatFigure(worstCapacitanceF, 'F')}: ${result}; it dissipates ${formatFigure(powerW, 'W')} at ${voltageV} V. ${needs}${confirmationSentences(requirement)}`,
          sources,
        },
        atLeastOne([...ownFigures, ...ruleFigures]),
      ),
    ],
    assumptions,
  );
}

function finish(findings: Parameters<typeof checkResult>[1], assumptions: readonly string[]): SafetyCheckResult {
  return checkResult('discharge', findings, [], assumptions);
}
