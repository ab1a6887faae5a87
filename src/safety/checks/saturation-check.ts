import type { PartCore } from '../../model/design.ts';
import { type CheckContext, percent } from '../check-context.ts';
import { figure, formatFigure, shareOf } from '../figure-format.ts';
import { isToGround, lineOf, nameOf, type PlacedElement, storedCapacitanceF } from '../filter-positions.ts';
import { leakageCurrentA } from '../leakage-current.ts';
import { atLeastOne, checkResult, judged, notChecked, type SafetyCheckResult, type SafetyFigure, type SafetyFinding } from '../safety-finding.ts';
import { chokeMutualAndLeakage, fluxDensityT, inductanceRatioAt, SQUARE_MM } from '../winding-flux.ts';

/**
 * Saturation of chokes and inductors at full load (winding-flux.ts has the formulas): the peak flux
 * density from the line current (through a common-mode choke's leakage inductance) and from the
 * common-mode current, against the core's saturation flux density with the chosen margin; and how
 * much inductance is left at that current, from the part's bias curve when one is given.
 */


interface Winding {
  readonly placed: PlacedElement;
  readonly kind: 'common-mode-choke' | 'inductor';
  readonly inductanceH: number;
  readonly ratedCurrentA: number | undefined;
  readonly core: PartCore | undefined;
}

function windingOf(placed: PlacedElement): Winding | undefined {
  const { part, placement } = placed.element;
  if (part.kind === 'common-mode-choke') return { placed, kind: part.kind, inductanceH: part.inductance, ratedCurrentA: part.ratedCurrent, core: part.core };
  if (part.kind === 'inductor' && (placement === 'series-line1' || placement === 'series-line2')) {
    return { placed, kind: part.kind, inductanceH: part.inductance, ratedCurrentA: part.ratedCurrent, core: part.core };
  }
  return undefined;
}

interface PeakCurrent {
  readonly rmsA: number;
  readonly peakA: number;
  readonly from: 'line current' | 'rated current';
}

export function saturationCheck(ctx: CheckContext): SafetyCheckResult {
  const margin = ctx.choices.saturationMargin;
  const crest = ctx.choices.lineCurrentCrestFactor;
  const assumptions = [
    margin.given
      ? `The peak flux must stay ${percent(margin.value)} below saturation (safety.saturationMargin).`
      : `The peak flux must stay ${percent(margin.value)} below saturation (common practice, no source; set safety.saturationMargin).`,
    crest.given
      ? `The line current peaks at ${Number(crest.value.toPrecision(4))} × its rms value (safety.lineCurrentCrestFactor).`
      : `The line current peaks at ${Number(crest.value.toPrecision(4))} × its rms value (${ctx.supply?.kind === 'dc' ? 'a DC input' : 'a sine'}); a capacitor-input rectifier without power-factor correction draws peaks of 2.5 to 3 × rms (common practice): set safety.lineCurrentCrestFactor.`,
    'B = L·i/(N·A_e), all of a choke’s leakage flux taken through the core’s cross-section: an upper bound (common practice). The saturation flux density is the core material’s at its working temperature.',
    'The common-mode current is the mains-frequency current of the Y capacitors on the converter side of the choke (normal condition, worse polarity); the switching-frequency common-mode current is not included.',
  ];
  const findings: SafetyFinding[] = [];
  for (const placed of ctx.elements.enabled) {
    const winding = windingOf(placed);
    if (!winding) continue;
    const current = peakCurrent(winding, ctx);
    findings.push(fluxFinding(winding, current, ctx), inductanceFinding(winding, current, ctx));
  }
  return checkResult('saturation', findings, [], assumptions);
}

function peakCurrent(winding: Winding, ctx: CheckContext): PeakCurrent | undefined {
  const crest = ctx.choices.lineCurrentCrestFactor.value;
  if (ctx.lineCurrentA !== undefined) return { rmsA: ctx.lineCurrentA, peakA: crest * ctx.lineCurrentA, from: 'line current' };
  if (winding.ratedCurrentA !== undefined) return { rmsA: winding.ratedCurrentA, peakA: crest * winding.ratedCurrentA, from: 'rated current' };
  return undefined;
}

function missingCore(winding: Winding): string[] {
  const path = `${winding.placed.path}.part.core`;
  const core = winding.core;
  const fields = ['effectiveAreaMm2', 'turns', 'saturationFluxDensityTesla'] as const;
  return fields.filter((field) => core?.[field] === undefined).map((field) => `${path}.${field}`);
}

/** Peak common-mode current through a choke: the Y capacitors on its converter side, at the mains peak. */
function commonModePeakA(winding: Winding, ctx: CheckContext): number | undefined {
  const supply = ctx.supply;
  if (supply === undefined) return undefined;
  if (supply.kind === 'dc') return 0;
  let line1F = 0;
  let line2F = 0;
  for (const placed of ctx.elements.enabled) {
    if (placed.order >= winding.placed.order || !isToGround(placed.element.placement)) continue;
    const c = storedCapacitanceF(placed.element.part) ?? 0;
    if (lineOf(placed.element.placement as 'line1-to-ground' | 'line2-to-ground') === 'line1') line1F += c;
    else line2F += c;
  }
  return Math.SQRT2 * leakageCurrentA(Math.max(line1F, line2F), supply.highestVoltage, supply.highestFrequencyHz, ctx.choices.capacitorTolerance.value);
}

function fluxFinding(winding: Winding, current: PeakCurrent | undefined, ctx: CheckContext): SafetyFinding {
  const { placed } = winding;
  const element = placed.element;
  const id = `saturation.${element.id}`;
  const title = `Peak flux in ${element.id}`;
  const missingData = missingCore(winding);
  const [first, ...rest] = [...(current === undefined ? ['operating.lineCurrent'] : []), ...missingData];
  if (first !== undefined) {
    const needs = [
      ...(missingData.length > 0 ? [`core data (${missingData.map((m) => m.split('.').at(-1)).join(', ')})`] : []),
      ...(current === undefined ? ['a current (the line current, or the part’s rated current)'] : []),
    ];
    return notChecked({ id, subject: element.id, title, summary: `Not checked: the peak flux of ${nameOf(element)} needs ${needs.join(' and ')}.` }, [first, ...rest]);
  }
  const core = winding.core!;
  const areaM2 = core.effectiveAreaMm2! * SQUARE_MM;
  const turns = core.turns!;
  const saturationT = core.saturationFluxDensityTesla!;
  const peak = current!;
  const marginValue = ctx.choices.saturationMargin.value;
  const allowedT = saturationT * (1 - marginValue);
  const figures: SafetyFigure[] = [figure(`peak current (${peak.from})`, peak.peakA, 'A')];
  let peakT: number;
  let incomplete: string | undefined;
  if (winding.kind === 'common-mode-choke' && element.part.kind === 'common-mode-choke') {
    const { mutualH, leakageH } = chokeMutualAndLeakage(element.part);
    const differentialT = fluxDensityT(leakageH, peak.peakA, turns, areaM2);
    const cmPeakA = commonModePeakA(winding, ctx);
    const commonT = cmPeakA === undefined ? 0 : fluxDensityT(mutualH, cmPeakA, turns, areaM2);
    figures.push(figure('leakage inductance per winding', leakageH, 'H'), figure('flux density from the line current', differentialT, 'T'));
    if (cmPeakA !== undefined) figures.push(figure('peak common-mode current', cmPeakA, 'A'), figure('flux density from the common-mode current', commonT, 'T'));
    else incomplete = 'operating.supply';
    peakT = differentialT + commonT;
  } else {
    peakT = fluxDensityT(winding.inductanceH, peak.peakA, turns, areaM2);
  }
  figures.push(figure('peak flux density', peakT, 'T'), figure('saturation flux density', saturationT, 'T'), figure('share of saturation', shareOf(peakT, saturationT), '%'));
  const words = `${formatFigure(peakT, 'T')} peak in ${nameOf(element)} at ${formatFigure(peak.peakA, 'A')} peak (${peak.from}): ${formatFigure(shareOf(peakT, saturationT), '%')} of its ${formatFigure(saturationT, 'T')} saturation flux density`;
  if (incomplete !== undefined) {
    return notChecked({ id, subject: element.id, title, summary: `${words}, without the common-mode current: the supply is not given (operating.supply).` }, [incomplete], figures);
  }
  const status = peakT <= allowedT ? 'pass' : peakT <= saturationT ? 'warn' : 'fail';
  const verdict = status === 'pass' ? `within the ${percent(marginValue)} margin` : status === 'warn' ? `inside the ${percent(marginValue)} margin below saturation` : 'above saturation: the inductance collapses at the current peaks';
  return judged(status, { id, subject: element.id, title, summary: `${words}, ${verdict}.` }, atLeastOne(figures));
}

function inductanceFinding(winding: Winding, current: PeakCurrent | undefined, ctx: CheckContext): SafetyFinding {
  const element = winding.placed.element;
  const id = `inductance-at-current.${element.id}`;
  const title = `Inductance of ${element.id} at full load`;
  const nominal = figure(winding.kind === 'common-mode-choke' ? 'inductance per winding (no current)' : 'inductance (no current)', winding.inductanceH, 'H');
  const curve = winding.core?.biasCurve;
  const which = winding.kind === 'common-mode-choke' ? 'its common-mode inductance falls as the line current partly saturates the core through the leakage flux' : 'its inductance falls with the current through it';
  if (curve === undefined) {
    return judged(
      'warn',
      {
        id,
        subject: element.id,
        title,
        summary: `${nameOf(element)}: ${which}, and no bias curve is given (core.biasCurve), so the sweep uses the zero-current value. Check the data sheet’s inductance against current${current ? ` at ${formatFigure(current.peakA, 'A')} peak` : ''} and sweep a variant with the lower value.`,
      },
      [nominal, ...(current ? [figure(`peak current (${current.from})`, current.peakA, 'A')] : [])],
    );
  }
  if (current === undefined) {
    return notChecked({ id, subject: element.id, title, summary: `Not checked: ${nameOf(element)} has a bias curve but no current is given.` }, ['operating.lineCurrent'], [nominal]);
  }
  const ratio = inductanceRatioAt(curve, current.peakA);
  const peakFigure = figure(`peak current (${current.from})`, current.peakA, 'A');
  if (ratio === undefined) {
    return notChecked(
      { id, subject: element.id, title, summary: `Not checked: the bias curve of ${nameOf(element)} ends at ${formatFigure(curve.currentA.at(-1)!, 'A')}, below the ${formatFigure(current.peakA, 'A')} peak.` },
      [`${winding.placed.path}.part.core.biasCurve: points up to ${formatFigure(current.peakA, 'A')}`],
      [nominal, peakFigure],
    );
  }
  const keep = 1 - ctx.choices.saturationMargin.value;
  const left = figure('inductance left', ratio * winding.inductanceH, 'H');
  const share = figure('share of the zero-current value', ratio * 100, '%');
  return judged(
    ratio >= keep ? 'pass' : 'warn',
    {
      id,
      subject: element.id,
      title,
      summary: `${nameOf(element)} keeps ${formatFigure(ratio * 100, '%')} of its inductance at ${formatFigure(current.peakA, 'A')} peak (from its bias curve)${ratio >= keep ? '' : `: below ${percent(keep)}; the sweep uses the zero-current value, so sweep a variant with ${formatFigure(ratio * winding.inductanceH, 'H')}`}.`,
    },
    [nominal, peakFigure, left, share],
  );
}
