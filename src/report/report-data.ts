import { drawLadder } from '../drawing/ladder-svg.ts';
import {
  impedanceText,
  partKindText,
  partParasiticsText,
  partRatingsText,
  partSafetyClass,
  partValueText,
  placementText,
  receiverText,
} from '../drawing/part-text.ts';
import type { PlotSpec } from '../drawing/plot-spec.ts';
import { emissionsPlot } from '../drawing/plots/emissions-plot.ts';
import { insertionLossPlot } from '../drawing/plots/insertion-loss-plot.ts';
import { partImpedancePlot } from '../drawing/plots/part-impedance-plot.ts';
import { requiredAttenuationPlot } from '../drawing/plots/required-attenuation-plot.ts';
import type { SvgNode } from '../drawing/svg-node.ts';
import type { Design, FilterElement } from '../model/design.ts';
import { formatQuantity } from '../model/units.ts';
import type { EmissionsAnalysis } from '../spectrum/emissions-analysis.ts';
import type { MarginPoint } from '../spectrum/margin.ts';
import { maxInRange } from './columns.ts';
import { designHash } from './design-hash.ts';
import { limitingModeOfBand } from './limiting-mode.ts';
import type { AssistantSection, ReportInput, ReportOrigin, SafetyChecksSection } from './report-inputs.ts';

/**
 * The report as data: every table, plot and statement the printed page shows, taken from the pure
 * layers' results and nothing else. The HTML page (report-html.ts) and the CSV files (report-csv.ts)
 * are both made from this, so the page, the worker and the command line say the same thing.
 * Numbers are kept beside their printed text, so a reader (or a test) can trace each one.
 */

/** A number as printed and as computed. */
export interface ReportNumber {
  readonly text: string;
  readonly value: number;
}

export interface PartRow {
  readonly stageId: string;
  readonly stageTitle: string;
  readonly id: string;
  readonly label: string;
  readonly placement: string;
  readonly kind: string;
  readonly value: string;
  readonly parasitics: string;
  readonly ratings: string;
  readonly safetyClass: string;
  readonly enabled: boolean;
}

export interface StageTable {
  readonly id: string;
  readonly title: string;
  readonly rows: readonly PartRow[];
}

export interface BandRow {
  readonly name: string;
  readonly range: string;
  readonly worstMarginDb: ReportNumber | undefined;
  readonly atHz: ReportNumber | undefined;
  readonly levelDbuV: ReportNumber | undefined;
  readonly limitDbuV: ReportNumber | undefined;
  readonly limitName: string;
  readonly trace: string;
  readonly verdict: 'meets target' | 'below target' | 'no limit here';
  readonly conservative: boolean;
  readonly limitingMode: string;
  readonly limitingReason: string;
  readonly requiredCmDb: ReportNumber | undefined;
  readonly requiredDmDb: ReportNumber | undefined;
}

export interface PointRow {
  readonly marginDb: ReportNumber;
  readonly atHz: ReportNumber;
  readonly levelDbuV: ReportNumber;
  readonly limitDbuV: ReportNumber;
  readonly limitName: string;
  readonly trace: string;
  readonly conservative: boolean;
}

export interface RangeRow {
  readonly fromHz: ReportNumber;
  readonly toHz: ReportNumber;
  readonly worst: PointRow;
}

export interface MarginSection {
  readonly targetMarginDb: number;
  readonly pass: boolean;
  readonly noise: string;
  readonly limits: readonly { readonly name: string; readonly detector: string; readonly origin: string }[];
  readonly bands: readonly BandRow[];
  readonly worstPeaks: readonly PointRow[];
  readonly failingRanges: readonly RangeRow[];
  /** Per mode, the most attenuation still needed over the whole span. */
  readonly required: readonly { readonly mode: string; readonly maxDb: ReportNumber | undefined; readonly atHz: ReportNumber | undefined }[];
  readonly notes: readonly string[];
}

export interface ReportPlot {
  readonly spec: PlotSpec;
  /** The figure's caption under the plot. */
  readonly caption: string;
}

export interface VariantRow {
  readonly name: string;
  readonly reported: boolean;
  readonly bandMargins: readonly (ReportNumber | undefined)[];
  readonly partCount: number;
  readonly totalCmInductance: string;
  readonly totalYCapacitance: string;
}

export interface VariantsSection {
  readonly bandNames: readonly string[];
  readonly rows: readonly VariantRow[];
}

export interface Statement {
  readonly title: string;
  readonly text: string;
}

export interface ReportData {
  readonly title: string;
  readonly designName: string;
  readonly designDescription: string;
  readonly designHash: string;
  readonly origin: ReportOrigin;
  readonly summary: readonly Statement[];
  readonly ladder: SvgNode;
  readonly designTables: {
    readonly source: readonly Statement[];
    readonly receivers: readonly Statement[];
    readonly plan: readonly Statement[];
    readonly operating: readonly Statement[];
    readonly stages: readonly StageTable[];
  };
  readonly plots: readonly ReportPlot[];
  readonly margin: MarginSection | undefined;
  readonly marginAbsentReason: string | undefined;
  readonly assumptions: readonly Statement[];
  readonly checks: SafetyChecksSection | undefined;
  readonly assistants: readonly AssistantSection[];
  readonly variants: VariantsSection | undefined;
  readonly cautions: readonly string[];
}

const q = (value: number, unit: Parameters<typeof formatQuantity>[1], digits = 3): string => formatQuantity(value, unit, digits);
const minus = (text: string): string => (text.startsWith('-') ? `\u2212${text.slice(1)}` : text);
export const dbNumber = (value: number): ReportNumber => ({ text: minus(value.toFixed(1)), value });
export const hzNumber = (value: number): ReportNumber => ({ text: formatQuantity(value, 'Hz', 4), value });

function pointRow(point: MarginPoint): PointRow {
  return {
    marginDb: dbNumber(point.marginDb),
    atHz: hzNumber(point.frequencyHz),
    levelDbuV: dbNumber(point.levelDbuV),
    limitDbuV: dbNumber(point.limitDbuV),
    limitName: point.maskName,
    trace: point.series,
    conservative: point.conservative,
  };
}

function stageTitle(design: Design, index: number): string {
  return design.stages[index]!.label ?? `Stage ${index + 1}`;
}

function partRow(design: Design, stageIndex: number, element: FilterElement): PartRow {
  const stage = design.stages[stageIndex]!;
  return {
    stageId: stage.id,
    stageTitle: stageTitle(design, stageIndex),
    id: element.id,
    label: element.label ?? '',
    placement: placementText(element.placement),
    kind: partKindText(element.part),
    value: partValueText(element.part),
    parasitics: partParasiticsText(element.part),
    ratings: partRatingsText(element.part),
    safetyClass: partSafetyClass(element.part) ?? '',
    enabled: element.enabled,
  };
}

function designTables(design: Design): ReportData['designTables'] {
  const { commonMode, differentialMode } = design.noiseSource;
  const source: Statement[] = [
    { title: 'Common mode, Z_CM', text: `${impedanceText(commonMode.impedance)}${commonMode.preset ? `; from the preset “${commonMode.preset}”` : ''}` },
    { title: 'Differential mode, Z_DM', text: `${impedanceText(differentialMode.impedance)}${differentialMode.preset ? `; from the preset “${differentialMode.preset}”` : ''}` },
  ];
  const receivers: Statement[] = [
    { title: 'Line 1', text: receiverText(design.receivers.line1) },
    { title: 'Line 2', text: receiverText(design.receivers.line2) },
  ];
  const plan = design.frequencyPlan;
  const planRows: Statement[] = [
    { title: 'Swept', text: `${q(plan.startHz, 'Hz')} to ${q(plan.stopHz, 'Hz')}, ${plan.pointsPerDecade} points per decade, plus each part’s self-resonances and the located peaks and notches` },
  ];
  const operating: Statement[] = [];
  const op = design.operating;
  if (op?.supply) {
    operating.push({
      title: 'Supply',
      text: op.supply.kind === 'ac-mains' ? `AC mains, up to ${q(op.supply.highestVoltage, 'V')} rms at up to ${q(op.supply.highestFrequencyHz, 'Hz')}` : `DC, up to ${q(op.supply.highestVoltage, 'V')}`,
    });
  }
  if (op?.lineCurrent !== undefined) operating.push({ title: 'Line current at full load', text: `${q(op.lineCurrent, 'A')} rms` });
  if (op?.converter) operating.push({ title: 'Converter', text: `full power down to ${q(op.converter.lowestInputVoltage, 'V')}, up to ${q(op.converter.highestInputPower, 'W')} input power` });
  const stages = design.stages.map((stage, s) => ({ id: stage.id, title: stageTitle(design, s), rows: stage.elements.map((element) => partRow(design, s, element)) }));
  return { source, receivers, plan: planRows, operating, stages };
}

function marginSection(analysis: EmissionsAnalysis, origin: ReportOrigin): MarginSection {
  const { report } = analysis;
  const f = analysis.frequencyHz;
  const bands: BandRow[] = report.bands.map((band) => {
    const worst = band.worst;
    const mode = limitingModeOfBand(analysis, band);
    const need = (column: Float64Array | undefined) => (column ? maxInRange(f, column, band.startHz, band.stopHz) : undefined);
    const cm = need(analysis.requiredAttenuationCmDb);
    const dm = need(analysis.requiredAttenuationDmDb);
    return {
      name: band.name,
      range: `${q(band.startHz, 'Hz')} to ${q(band.stopHz, 'Hz')}`,
      worstMarginDb: worst ? dbNumber(worst.marginDb) : undefined,
      atHz: worst ? hzNumber(worst.frequencyHz) : undefined,
      levelDbuV: worst ? dbNumber(worst.levelDbuV) : undefined,
      limitDbuV: worst ? dbNumber(worst.limitDbuV) : undefined,
      limitName: worst?.maskName ?? '',
      trace: worst?.series ?? '',
      verdict: band.pass === undefined ? 'no limit here' : band.pass ? 'meets target' : 'below target',
      conservative: worst?.conservative ?? false,
      limitingMode: mode.mode,
      limitingReason: mode.reason,
      requiredCmDb: cm ? dbNumber(cm.value) : undefined,
      requiredDmDb: dm ? dbNumber(dm.value) : undefined,
    };
  });
  const required = (
    [
      ['common mode', analysis.requiredAttenuationCmDb],
      ['differential mode', analysis.requiredAttenuationDmDb],
    ] as const
  ).map(([mode, column]) => {
    const most = column && f.length > 0 ? maxInRange(f, column, f[0]!, f[f.length - 1]!) : undefined;
    return { mode, maxDb: most ? dbNumber(most.value) : undefined, atHz: most ? hzNumber(most.frequencyHz) : undefined };
  });
  const scan = analysis.scanPrediction;
  return {
    targetMarginDb: report.targetMarginDb,
    pass: report.pass,
    noise:
      analysis.input === 'scan'
        ? `the scan “${scan?.scanName ?? origin.scanFile ?? 'scan'}” (${f.length} points, ${scan?.traces.map((t) => t.detector).join(', ') ?? ''}), scaled by the filter’s in-circuit transfer`
        : 'the design’s noise estimate (a line spectrum from the switching waveform)',
    limits: analysis.masks.map((mask) => ({ name: mask.name, detector: mask.detector, origin: mask.origin ?? 'entered by the user' })),
    bands,
    worstPeaks: report.worstPeaks.map(pointRow),
    failingRanges: report.failingRanges.map((range) => ({ fromHz: hzNumber(range.startHz), toHz: hzNumber(range.stopHz), worst: pointRow(range.worst) })),
    required,
    notes: [...analysis.notes, ...report.notes],
  };
}

function plotsOf(input: ReportInput): ReportPlot[] {
  const { design, sweep, analysis, variants = [] } = input;
  const plots: ReportPlot[] = [];
  const overlaysSweep = variants.map((v) => ({ variantId: v.variantId, name: v.name, result: v.sweep }));
  if (analysis) {
    const overlays = variants.flatMap((v) => (v.analysis ? [{ variantId: v.variantId, name: v.name, result: v.analysis }] : []));
    plots.push({
      spec: emissionsPlot(analysis, { baselineFitted: (design.emissions?.baseline.kind ?? 'none') !== 'none', noiseFloorDbuV: design.emissions?.noiseFloorDbuV, overlays }),
      caption: 'Predicted emission against the limits. Shaded: where the margin is below the target.',
    });
    const required = requiredAttenuationPlot(analysis, sweep);
    if (required) plots.push({ spec: required, caption: 'Attenuation still needed per mode (no filter, less the limit and the target margin) over what the filter gives in circuit.' });
  }
  plots.push({
    spec: insertionLossPlot(sweep, { overlays: overlaysSweep }),
    caption: 'Insertion loss per mode: in circuit (between the design’s source and receiving networks), 50 Ω/50 Ω, and the worst-case spread between 0.1 Ω/100 Ω and 100 Ω/0.1 Ω.',
  });
  if (sweep.elements.length > 0) plots.push({ spec: partImpedancePlot(sweep), caption: 'Impedance of each part on its own, with its self-resonances marked.' });
  return plots;
}

function assumptions(input: ReportInput): Statement[] {
  const { design, analysis } = input;
  const out: Statement[] = [];
  out.push({
    title: 'Noise source',
    text: `The equipment is modelled as a T network: half of Z_DM in each line from a midpoint, Z_CM from there to ground. Z_CM: ${impedanceText(design.noiseSource.commonMode.impedance)}; Z_DM: ${impedanceText(design.noiseSource.differentialMode.impedance)}. Results are per unit source EMF of each mode unless a scan or an estimate sets the level.`,
  });
  out.push({ title: 'Receiving networks', text: `Line 1: ${receiverText(design.receivers.line1)}. Line 2: ${receiverText(design.receivers.line2)}. The level at the LISN is the voltage across its measuring port.` });
  out.push({
    title: 'Insertion loss',
    text: 'In circuit: 20·log of the mode transfer without the filter over the transfer with it, between the design’s own source and receiving networks. 50 Ω/50 Ω: the CISPR 17 test systems. The 0.1 Ω/100 Ω and 100 Ω/0.1 Ω systems are the approximate worst cases of CISPR 17; a real source and LISN lie somewhere between.',
  });
  if (analysis) {
    const scan = analysis.scanPrediction;
    const emissions = design.emissions;
    if (scan) {
      const baseline = emissions?.baseline;
      out.push({
        title: 'Baseline',
        text:
          baseline && baseline.kind === 'stages'
            ? `The scan was taken with a filter fitted (${baseline.label ?? 'baseline stages'}); predictions scale it by T_new / T_baseline in circuit.`
            : 'The scan was taken with no filter fitted; predictions scale it by the in-circuit transfer with the filter over that without it (never by a 50 Ω insertion loss).',
      });
      out.push({
        title: 'Attribution',
        text:
          scan.attribution === undefined
            ? `The scan measured ${scan.tag === 'common-mode' ? 'common mode' : 'differential mode'} alone, so only that mode’s improvement is applied.`
            : scan.attribution === 'both'
              ? 'The scan’s mode is unknown: at each frequency the filter is credited with the smaller of its CM and DM improvements (worst case).'
              : `The scan’s mode is unknown and is treated as ${scan.attribution === 'common-mode' ? 'common' : 'differential'}-mode noise: only that mode’s improvement is applied.`,
      });
      if (emissions?.noiseFloorDbuV !== undefined) out.push({ title: 'Noise floor', text: `Scan points at or below ${emissions.noiseFloorDbuV} dBµV show the receiver, not the equipment: they carry no margin and no required attenuation.` });
    } else {
      out.push({ title: 'Noise estimate', text: 'Before hardware: a line spectrum from the switching waveform and the coupling the design states; each line reads the same on every detector, and the two modes are added in phase on each line (worst case).' });
    }
    const detectors = analysis.masks.map((mask) => `${mask.name}: ${mask.detector}`).join('; ');
    const conservative = analysis.report.comparisons.some((c) => c.conservative);
    out.push({
      title: 'Detectors',
      text: `Limits and their detectors: ${detectors === '' ? 'none' : detectors}. A peak reading is never below the quasi-peak or average reading of the same signal, so a peak trace judged against a quasi-peak or average limit errs on the safe side: a pass holds, but a failure may still pass when measured with the limit’s own detector. A trace that reads lower than the limit’s detector is not judged against it.${conservative ? ' This report contains such conservative comparisons; they are marked.' : ''}`,
    });
    out.push({ title: 'Target margin', text: `Every band must keep ${analysis.report.targetMarginDb} dB below every limit to count as meeting the target.` });
  }
  out.push({
    title: 'Tolerances',
    text: input.assistants?.yield ? 'Part tolerances were applied in the yield analysis below; every other result uses the nominal values.' : 'Every result uses the nominal part values; no tolerance was applied (a yield analysis was not run).',
  });
  out.push({ title: 'Model', text: 'Each part is modelled with the parasitics the design states and nothing else; layout coupling between stages, which the design does not state, is not included.' });
  return out;
}

function cautions(input: ReportInput): string[] {
  const mains = input.design.operating?.supply?.kind !== 'dc';
  const list = [
    'This report is a planning aid made from a model of the filter. It is not a certification or a test result: only a measurement of the product by a competent laboratory shows compliance.',
  ];
  if (mains) {
    list.push(
      'Use safety-certified X and Y capacitors and parts rated for the working voltage and current. The capacitance from each line to protective earth sets the leakage (touch) current.',
      'Capacitors across the mains keep their charge after the plug is pulled: provide the discharge path the product safety standard requires.',
    );
  }
  list.push('Follow the product safety standard for your equipment, local electrical codes and licensed practice, and have a qualified person review any work on mains-connected equipment.');
  if (!input.safety) list.push('The safety and practical checks were not run for this report: nothing here confirms leakage current, discharge, ratings, losses or saturation.');
  return list;
}

function totalOf(design: Design, pick: (element: FilterElement) => number): number {
  let total = 0;
  for (const stage of design.stages) for (const element of stage.elements) if (element.enabled) total += pick(element);
  return total;
}

function variantRow(name: string, reported: boolean, design: Design, analysis: EmissionsAnalysis | undefined, bandNames: readonly string[]): VariantRow {
  const cm = totalOf(design, (e) => (e.part.kind === 'common-mode-choke' ? e.part.inductance : 0));
  const y = totalOf(design, (e) => (e.part.kind === 'capacitor' && (e.placement === 'line1-to-ground' || e.placement === 'line2-to-ground') ? e.part.capacitance : 0));
  return {
    name,
    reported,
    bandMargins: bandNames.map((bandName) => {
      const worst = analysis?.report.bands.find((b) => b.name === bandName)?.worst;
      return worst ? dbNumber(worst.marginDb) : undefined;
    }),
    partCount: totalOf(design, () => 1),
    totalCmInductance: cm > 0 ? q(cm, 'H') : '–',
    totalYCapacitance: y > 0 ? q(y, 'F') : '–',
  };
}

function summary(input: ReportInput, margin: MarginSection | undefined): Statement[] {
  const out: Statement[] = [];
  const { design, sweep } = input;
  const elements = design.stages.reduce((sum, stage) => sum + stage.elements.length, 0);
  out.push({ title: 'Filter', text: `${design.stages.length} stage${design.stages.length === 1 ? '' : 's'}, ${elements} element${elements === 1 ? '' : 's'}; swept at ${sweep.frequencyHz.length} frequencies.` });
  if (margin) {
    const worst = input.analysis?.report.worst;
    const failing = margin.bands.filter((b) => b.verdict === 'below target').length;
    out.push({
      title: 'Result',
      text: margin.pass
        ? `Every band keeps the ${margin.targetMarginDb} dB target margin${worst ? `; the lowest margin is ${dbNumber(worst.marginDb).text} dB at ${hzNumber(worst.frequencyHz).text}` : ''}.`
        : `${failing} band${failing === 1 ? '' : 's'} below the ${margin.targetMarginDb} dB target${worst ? `; the lowest margin is ${dbNumber(worst.marginDb).text} dB at ${hzNumber(worst.frequencyHz).text} (${worst.maskName})` : ''}.`,
    });
    out.push({ title: 'Noise', text: margin.noise });
  } else {
    out.push({ title: 'Result', text: `Not judged: ${input.analysisAbsentReason ?? 'no emissions analysis was made'}.` });
  }
  if (input.safety) {
    const counts = (['fail', 'warn', 'pass'] as const).map((status) => [status, input.safety!.checks.filter((c) => c.status === status).length] as const);
    out.push({ title: 'Checks', text: counts.map(([status, count]) => `${count} ${status}`).join(', ') });
  }
  return out;
}

export function buildReportData(input: ReportInput): ReportData {
  const { design, analysis } = input;
  const margin = analysis ? marginSection(analysis, input.origin) : undefined;
  const assistantList = input.assistants ? [input.assistants.sizing, input.assistants.damping, input.assistants.stability, input.assistants.yield, input.assistants.map].filter((a): a is AssistantSection => a !== undefined) : [];
  let variants: VariantsSection | undefined;
  if (input.variants && input.variants.length > 0) {
    const bandNames = analysis?.report.bands.map((b) => b.name) ?? [];
    variants = {
      bandNames,
      rows: [variantRow(input.designVariantName ?? design.name, true, design, analysis, bandNames), ...input.variants.map((v) => variantRow(v.name, false, v.design, v.analysis, bandNames))],
    };
  }
  return {
    title: `Filter report: ${design.name}`,
    designName: design.name,
    designDescription: design.description,
    designHash: designHash(design),
    origin: input.origin,
    summary: summary(input, margin),
    ladder: drawLadder(design, { maxRowWidth: 1000, idPrefix: 'report-ladder' }).node,
    designTables: designTables(design),
    plots: plotsOf(input),
    margin,
    marginAbsentReason: analysis ? undefined : (input.analysisAbsentReason ?? 'no emissions analysis was made'),
    assumptions: assumptions(input),
    checks: input.safety,
    assistants: assistantList,
    variants,
    cautions: cautions(input),
  };
}
