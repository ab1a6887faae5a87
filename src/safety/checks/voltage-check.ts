import type { Supply } from '../../model/design.ts';
import { type CheckContext, describeSupply } from '../check-context.ts';
import { figure, formatFigure, shareOf } from '../figure-format.ts';
import { isToGround, nameOf, type PlacedElement } from '../filter-positions.ts';
import { checkResult, judged, notChecked, type SafetyCheckResult, type SafetyFigure, type SafetyFinding } from '../safety-finding.ts';

/**
 * Voltage stress: every capacitor and common-mode choke against its rated voltage. On mains each
 * capacitor, across the line or to earth, sees the mains peak √2·V (either line can be the live
 * one). On a DC input it sees the DC voltage.
 *
 * How a rating is read: X- and Y-class capacitors and mains chokes are rated in AC rms (IEC 60384-14
 * rates X and Y parts so), so on mains the working rms voltage is compared with the rating, which is
 * the same as the peak against √2 × the rating. A capacitor without a safety class is taken as
 * DC-rated: its rating is compared with the peak.
 */

const ON_THE_RATING = 1 + 1e-12;
/**
 * Mains parts are commonly rated for the nominal voltage with the supply's +10 % tolerance allowed
 * for (a 250 V choke on a 240 V supply whose highest voltage is 264 V); common practice, no source.
 * A working voltage up to 10 % above an AC rating is a warning, above that a failure.
 */
const TOLERANCE_ALLOWANCE = 1.1;

function acVerdict(workingV: number, ratedV: number): 'pass' | 'warn' | 'fail' {
  if (workingV <= ratedV * ON_THE_RATING) return 'pass';
  return workingV <= ratedV * TOLERANCE_ALLOWANCE * ON_THE_RATING ? 'warn' : 'fail';
}

function acWords(verdict: 'pass' | 'warn' | 'fail', workingV: number): string {
  if (verdict === 'pass') return '';
  if (verdict === 'warn') {
    return ` The highest supply voltage is above its rating but within 10 % of it (${formatFigure(workingV / TOLERANCE_ALLOWANCE, 'V')} without a +10 % tolerance): mains parts are commonly rated for the nominal voltage and allow for +10 % (common practice); check that its data sheet does, or choose a higher rating.`;
  }
  return ` That is more than 10 % above its rating: choose a part rated for at least ${formatFigure(workingV, 'V')}.`;
}

export function voltageCheck(ctx: CheckContext): SafetyCheckResult {
  const supply = ctx.supply;
  const assumptions = [
    'X- and Y-class capacitors and mains chokes are rated in AC rms; a capacitor without a class is taken as DC-rated (its rating is compared with the peak).',
    'Surges and the impulse withstand are not part of this check (see the class check for the impulse test voltage).',
  ];
  if (supply === undefined) {
    return checkResult('voltage', [notChecked({ id: 'voltage.supply', title: 'Voltage stress', summary: 'Not checked: the supply voltage is not given (operating.supply).' }, ['operating.supply'])], [], assumptions);
  }
  const findings: SafetyFinding[] = [];
  for (const placed of ctx.elements.enabled) {
    const kind = placed.element.part.kind;
    if (kind === 'capacitor') findings.push(capacitorFinding(placed, supply));
    else if (kind === 'damping-rc') findings.push(dampingRcFinding(placed, supply));
    else if (kind === 'common-mode-choke') findings.push(chokeFinding(placed, supply));
  }
  return checkResult('voltage', findings, [figure(supply.kind === 'ac-mains' ? 'mains peak' : 'DC voltage', stressV(supply), 'V')], assumptions);
}

function stressV(supply: Supply): number {
  return supply.kind === 'ac-mains' ? Math.SQRT2 * supply.highestVoltage : supply.highestVoltage;
}

function missingRating(placed: PlacedElement, what: string, stress: SafetyFigure): SafetyFinding {
  return notChecked(
    { id: `voltage.${placed.element.id}`, subject: placed.element.id, title: `Rated voltage of ${placed.element.id}`, summary: `Not checked: ${nameOf(placed.element)} has no rated voltage; ${what}.` },
    [`${placed.path}.part.ratedVoltage`],
    [stress],
  );
}

function capacitorFinding(placed: PlacedElement, supply: Supply): SafetyFinding {
  const { element } = placed;
  if (element.part.kind !== 'capacitor') throw new Error('capacitors only');
  const part = element.part;
  const id = `voltage.${element.id}`;
  const title = `Rated voltage of ${element.id}`;
  const peak = stressV(supply);
  const stress = figure(supply.kind === 'ac-mains' ? 'peak voltage across it' : 'DC voltage across it', peak, 'V');
  if (element.placement !== 'line-to-line' && !isToGround(element.placement)) {
    return judged('warn', { id, subject: element.id, title, summary: `${nameOf(element)} sits in series with a line: the voltage across it depends on the line current; check its rating by hand.` }, [stress]);
  }
  if (part.ratedVoltage === undefined) return missingRating(placed, `it sees ${formatFigure(peak, 'V')} ${supply.kind === 'ac-mains' ? 'peak' : 'DC'}`, stress);
  const rated = part.ratedVoltage;
  const acRated = part.safetyClass !== 'none';
  if (supply.kind === 'ac-mains' && acRated) {
    const working = supply.highestVoltage;
    const verdict = acVerdict(working, rated);
    return judged(
      verdict,
      {
        id,
        subject: element.id,
        title,
        summary: `${nameOf(element)} is rated ${formatFigure(rated, 'V')} AC (${part.safetyClass}) for a working voltage of ${formatFigure(working, 'V')} rms (peak ${formatFigure(peak, 'V')} against ${formatFigure(Math.SQRT2 * rated, 'V')}): ${formatFigure(shareOf(working, rated), '%')} of its rating.${acWords(verdict, working)}`,
      },
      [figure('working voltage (rms)', working, 'V'), figure('rated voltage (AC rms)', rated, 'V'), stress, figure('rating as a peak', Math.SQRT2 * rated, 'V'), figure('share of the rating', shareOf(working, rated), '%')],
    );
  }
  const within = peak <= rated * ON_THE_RATING;
  const note =
    supply.kind === 'dc' && acRated
      ? ` Its rating is an AC rating (${part.safetyClass}); its DC rating, usually higher, is on its data sheet.`
      : supply.kind === 'ac-mains'
        ? ' A capacitor without a safety class is taken as DC-rated.'
        : '';
  return judged(
    within ? 'pass' : 'fail',
    {
      id,
      subject: element.id,
      title,
      summary: `${nameOf(element)} is rated ${formatFigure(rated, 'V')} and sees ${formatFigure(peak, 'V')} ${supply.kind === 'ac-mains' ? 'peak' : 'DC'}: ${formatFigure(shareOf(peak, rated), '%')} of its rating.${note}`,
    },
    [stress, figure('rated voltage', rated, 'V'), figure('share of the rating', shareOf(peak, rated), '%')],
  );
}

function dampingRcFinding(placed: PlacedElement, supply: Supply): SafetyFinding {
  const peak = stressV(supply);
  return judged(
    'warn',
    {
      id: `voltage.${placed.element.id}`,
      subject: placed.element.id,
      title: `Rated voltage of ${placed.element.id}`,
      summary: `${nameOf(placed.element)} is a damping R-C: the design holds no rating for its capacitor, which sees ${formatFigure(peak, 'V')} ${supply.kind === 'ac-mains' ? 'peak' : 'DC'}; check it by hand.`,
    },
    [figure(supply.kind === 'ac-mains' ? 'peak voltage across it' : 'DC voltage across it', peak, 'V')],
  );
}

function chokeFinding(placed: PlacedElement, supply: Supply): SafetyFinding {
  const { element } = placed;
  if (element.part.kind !== 'common-mode-choke') throw new Error('chokes only');
  const working = supply.highestVoltage;
  const stress = figure(supply.kind === 'ac-mains' ? 'working voltage (rms)' : 'DC voltage', working, 'V');
  const rated = element.part.ratedVoltage;
  if (rated === undefined) return missingRating(placed, `it works at ${formatFigure(working, 'V')}${supply.kind === 'ac-mains' ? ' rms' : ' DC'}`, stress);
  const verdict = supply.kind === 'ac-mains' ? acVerdict(working, rated) : working <= rated * ON_THE_RATING ? 'pass' : 'fail';
  const insulation = supply.kind === 'ac-mains' ? ' Its insulation (winding to winding and to the core) must suit mains; a signal-line choke does not.' : '';
  return judged(
    verdict,
    {
      id: `voltage.${element.id}`,
      subject: element.id,
      title: `Rated voltage of ${element.id}`,
      summary: `${nameOf(element)} is rated ${formatFigure(rated, 'V')} for ${formatFigure(working, 'V')} (${describeSupply(supply)}): ${formatFigure(shareOf(working, rated), '%')} of its rating.${supply.kind === 'ac-mains' ? acWords(verdict, working) : ''}${insulation}`,
    },
    [stress, figure('rated voltage', rated, 'V'), figure('share of the rating', shareOf(working, rated), '%')],
  );
}
