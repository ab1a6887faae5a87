import { type CheckContext } from '../check-context.ts';
import { figure, formatFigure, shareOf } from '../figure-format.ts';
import { nameOf, type PlacedElement } from '../filter-positions.ts';
import { checkResult, judged, notChecked, type SafetyCheckResult, type SafetyFigure, type SafetyFinding } from '../safety-finding.ts';
import { copperLossW } from '../winding-flux.ts';

/**
 * Parts that carry the line current: copper loss I²·R per winding and in total, and the line
 * current (operating.lineCurrent) against each part's rated current. Without the line current the
 * loss is shown at the part's rated current, and the rating is not checked.
 */

const ON_THE_RATING = 1 + 1e-12;

interface Carrier {
  readonly placed: PlacedElement;
  /** Resistance of one winding. */
  readonly resistanceOhm: number;
  readonly windings: 1 | 2;
  readonly ratedCurrentA: number | undefined;
  readonly hasRating: boolean;
}

function carrierOf(placed: PlacedElement): Carrier | 'not-covered' | undefined {
  const { part, placement } = placed.element;
  if (placement !== 'series-line1' && placement !== 'series-line2' && placement !== 'both-lines-coupled') return undefined;
  switch (part.kind) {
    case 'common-mode-choke':
      return { placed, resistanceOhm: part.dcr, windings: 2, ratedCurrentA: part.ratedCurrent, hasRating: true };
    case 'inductor':
      return { placed, resistanceOhm: part.dcr, windings: 1, ratedCurrentA: part.ratedCurrent, hasRating: true };
    case 'ferrite-bead':
      return { placed, resistanceOhm: part.dcResistance, windings: 1, ratedCurrentA: part.ratedCurrent, hasRating: true };
    case 'resistor':
      return { placed, resistanceOhm: part.resistance, windings: 1, ratedCurrentA: undefined, hasRating: false };
    default:
      return 'not-covered';
  }
}

export function windingsCheck(ctx: CheckContext): SafetyCheckResult {
  const lineCurrentA = ctx.lineCurrentA;
  const findings: SafetyFinding[] = [];
  let totalW = 0;
  for (const placed of ctx.elements.enabled) {
    const carrier = carrierOf(placed);
    if (carrier === undefined) continue;
    if (carrier === 'not-covered') {
      const text = {
        id: `windings.${placed.element.id}`,
        subject: placed.element.id,
        title: `Line current in ${placed.element.id}`,
        summary: `${nameOf(placed.element)} (${placed.element.part.kind}) carries the line current, but the design holds no DC resistance or current rating for it: check its loss and rating by hand.`,
      };
      findings.push(lineCurrentA === undefined ? notChecked(text, ['operating.lineCurrent']) : judged('warn', text, [figure('line current', lineCurrentA, 'A')]));
      continue;
    }
    const finding = carrierFinding(carrier, lineCurrentA);
    findings.push(finding.finding);
    totalW += finding.lossAtLineCurrentW ?? 0;
  }
  const figures: SafetyFigure[] = lineCurrentA === undefined ? [] : [figure('line current', lineCurrentA, 'A'), figure('total copper loss at the line current', totalW, 'W')];
  return checkResult('windings', findings, figures, [
    'I²·R with the rms line current: true for any waveform; a capacitor-input rectifier draws a higher rms current than its power suggests, so give the measured or simulated rms.',
    'A part without a DC resistance (DCR) in the design shows no loss: the parasitic defaults to zero.',
    'Rated currents are rms at the data sheet’s ambient temperature; derate them for a hotter enclosure.',
  ]);
}

function carrierFinding(carrier: Carrier, lineCurrentA: number | undefined): { finding: SafetyFinding; lossAtLineCurrentW?: number } {
  const { placed, resistanceOhm, windings, ratedCurrentA } = carrier;
  const element = placed.element;
  const id = `windings.${element.id}`;
  const title = `Line current in ${element.id}`;
  const perWinding = windings === 2 ? ' per winding' : '';
  const noDcr = resistanceOhm === 0 ? ' (no DC resistance given: the loss shown is zero)' : '';
  const lossFigures = (currentA: number, at: string): SafetyFigure[] => [
    figure(`resistance${perWinding}`, resistanceOhm, 'Ω'),
    ...(windings === 2 ? [figure(`copper loss per winding at ${at}`, copperLossW(currentA, resistanceOhm), 'W')] : []),
    figure(`copper loss at ${at}`, windings * copperLossW(currentA, resistanceOhm), 'W'),
  ];
  if (lineCurrentA === undefined) {
    if (ratedCurrentA === undefined) {
      return {
        finding: notChecked(
          { id, subject: element.id, title, summary: `Not checked: neither the line current nor ${element.id}’s rated current is given.` },
          carrier.hasRating ? ['operating.lineCurrent', `${placed.path}.part.ratedCurrent`] : ['operating.lineCurrent'],
        ),
      };
    }
    const lossW = windings * copperLossW(ratedCurrentA, resistanceOhm);
    return {
      finding: notChecked(
        { id, subject: element.id, title, summary: `Not checked against its rating: the line current is not given. At its rated ${formatFigure(ratedCurrentA, 'A')}, ${nameOf(element)} loses ${formatFigure(lossW, 'W')}${noDcr}.` },
        ['operating.lineCurrent'],
        [figure('rated current', ratedCurrentA, 'A'), ...lossFigures(ratedCurrentA, 'the rated current')],
      ),
    };
  }
  const lossW = windings * copperLossW(lineCurrentA, resistanceOhm);
  const lossText = `${nameOf(element)} loses ${formatFigure(lossW, 'W')} at ${formatFigure(lineCurrentA, 'A')}${windings === 2 ? ` (${formatFigure(copperLossW(lineCurrentA, resistanceOhm), 'W')} per winding)` : ''}${noDcr}`;
  const figures = [figure('line current', lineCurrentA, 'A'), ...lossFigures(lineCurrentA, 'the line current')] as const;
  if (!carrier.hasRating) {
    return {
      finding: judged('warn', { id, subject: element.id, title, summary: `${lossText}: the design holds no power rating for a resistor; check its power and surge rating by hand.` }, figures),
      lossAtLineCurrentW: lossW,
    };
  }
  if (ratedCurrentA === undefined) {
    return {
      finding: notChecked({ id, subject: element.id, title, summary: `${lossText}; not checked against a rating: its rated current is not given.` }, [`${placed.path}.part.ratedCurrent`], figures),
      lossAtLineCurrentW: lossW,
    };
  }
  const within = lineCurrentA <= ratedCurrentA * ON_THE_RATING;
  const share = shareOf(lineCurrentA, ratedCurrentA);
  return {
    finding: judged(
      within ? 'pass' : 'fail',
      { id, subject: element.id, title, summary: `${lossText}; the line current is ${formatFigure(share, '%')} of its rated ${formatFigure(ratedCurrentA, 'A')}.` },
      [...figures, figure('rated current', ratedCurrentA, 'A'), figure('share of the rating', share, '%')],
    ),
    lossAtLineCurrentW: lossW,
  };
}
