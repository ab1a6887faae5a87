import type { Design } from '../../model/design.ts';
import { type ComplexColumns, complexColumns } from '../complex-columns.ts';
import { baseGrid, logSpace, mergeIntoGrid, PointOrigin, type TaggedGrid } from '../grid.ts';
import { createWorkspace, evaluateNetwork, type Workspace } from '../kernel/evaluate-network.ts';
import { allocateResponse, type NetworkResponse, responseHead } from '../kernel/network-response.ts';
import { CISPR17_SYSTEMS, compileNetwork, type Network, type NetworkElement } from '../network.ts';
import { PointFlag, powerRatioToDb } from '../point-flags.ts';
import { findExtremumCandidates, MAX_REFINED_EXTREMA, type RefinedExtremum, refineExtrema } from './refine-extrema.ts';
import { modeColumn, type ModeQuantity } from './response-curves.ts';
import { findSelfResonances, type ImpedanceFunction } from './self-resonance.ts';
import type { SweepScratch } from './sweep-scratch.ts';
import {
  type ElementSweep,
  type ImpedanceView,
  type ResonanceMark,
  type SelfResonance,
  SWEEP_COLUMNS,
  type SweepColumnId,
  type SweepResult,
  type SweepWarning,
  TRANSFER_IDS,
  type TransferId,
} from './sweep-result.ts';

export interface SweepOptions {
  /** Locate peaks and notches between grid points (default true). Monte Carlo loops may turn it off. */
  readonly refine?: boolean;
  /** Frequencies to include besides the plan's grid (limit-mask corners, scan points), in Hz. */
  readonly extraFrequencyHz?: readonly number[];
  /** Working memory kept between sweeps by a caller that sweeps repeatedly (sweep-scratch.ts). */
  readonly scratch?: SweepScratch;
}

/**
 * Sweep a validated design over its frequency plan:
 * 1. the log grid, plus every element's self-resonance (found by reactance sign changes);
 * 2. one pass of the kernel; peaks and notches of the insertion-loss and transfer curves are
 *    then located by a batched golden-section search and added to the grid;
 * 3. a final pass on the merged grid, assembled into columns in one transferable buffer.
 */
export function sweepDesign(design: Design, options: SweepOptions = {}): SweepResult {
  const network = compileNetwork(design, CISPR17_SYSTEMS);
  const plan = design.frequencyPlan;
  let grid: TaggedGrid = baseGrid(logSpace(plan.startHz, plan.stopHz, plan.pointsPerDecade));
  if (options.extraFrequencyHz?.length) grid = mergeIntoGrid(grid, options.extraFrequencyHz, PointOrigin.Base);

  const warnings: SweepWarning[] = idealPartWarnings(network);
  const selfResonances = elementSelfResonances(network, grid.frequencyHz, options.scratch);
  const resonanceHz = selfResonances.flatMap((element) => element.views.flatMap((view) => view.resonances.map((r) => r.frequencyHz)));
  grid = mergeIntoGrid(grid, resonanceHz, PointOrigin.ElementResonance);

  // One workspace for every pass: the first pass, the refinement batches and the final pass
  // (which may hold up to MAX_REFINED_EXTREMA more points than the first).
  const refine = options.refine ?? true;
  const capacity = grid.frequencyHz.length + (refine ? 2 * MAX_REFINED_EXTREMA : 0);
  const workspace = options.scratch ? options.scratch.workspaceFor(network, capacity) : createWorkspace(network, capacity);
  const response = options.scratch ? options.scratch.responseFor(capacity, network.resistiveSystems.length) : allocateResponse(capacity, network.resistiveSystems.length);
  const sweepInto = (frequencyHz: Float64Array): NetworkResponse => {
    response.flags.fill(0, 0, frequencyHz.length);
    evaluateNetwork(network, frequencyHz, workspace, response);
    return responseHead(response, frequencyHz.length);
  };

  let refined: RefinedExtremum[] = [];
  if (refine) {
    const onGrid = sweepInto(grid.frequencyHz);
    const { candidates, capped } = findExtremumCandidates(onGrid, grid.frequencyHz.length);
    if (capped) {
      warnings.push({
        code: 'refinement-capped',
        message: `more than ${MAX_REFINED_EXTREMA} peaks and notches; only the most prominent were located precisely`,
      });
    }
    const frequencies = Float64Array.from(grid.frequencyHz);
    refined = refineExtrema(candidates, frequencies, sweepInto);
    grid = mergeIntoGrid(
      grid,
      refined.map((r) => r.frequencyHz),
      PointOrigin.ResponseExtremum,
    );
  }

  const finalResponse = sweepInto(grid.frequencyHz);
  return assemble(design, network, grid, finalResponse, workspace, selfResonances, refined, warnings, options.scratch);
}

interface ElementResonances {
  readonly element: NetworkElement;
  readonly views: readonly { name: ImpedanceView['name']; resonances: readonly SelfResonance[] }[];
}

/** Self-resonances of each element's impedance (each mode of a choke), from the base grid. */
function elementSelfResonances(network: Network, grid: Float64Array, scratch: SweepScratch | undefined): ElementResonances[] {
  const flags = new Uint8Array(grid.length);
  // Only resonance frequencies leave this function, so the impedances on the grid may be scratch.
  const columns = (index: number): ComplexColumns => (scratch ? scratch.temporaryColumns(index, grid.length) : complexColumns(grid.length));
  return network.elements.map((element) => {
    if (element.kind === 'two-terminal') {
      const onGrid = columns(0);
      element.impedance.evaluate(grid, onGrid, flags);
      const impedance: ImpedanceFunction = (f, out, probeFlags) => element.impedance.evaluate(f, out, probeFlags);
      return { element, views: [{ name: 'impedance', resonances: findSelfResonances(impedance, grid, onGrid) }] };
    }
    const even = columns(0);
    const odd = columns(1);
    element.eigenImpedances(grid, even, odd, flags);
    const scratchOther = complexColumns(1);
    const evenOnly: ImpedanceFunction = (f, out, probeFlags) => element.eigenImpedances(f, out, scratchOther, probeFlags);
    const oddOnly: ImpedanceFunction = (f, out, probeFlags) => element.eigenImpedances(f, scratchOther, out, probeFlags);
    return {
      element,
      views: [
        { name: 'common-mode', resonances: findSelfResonances(evenOnly, grid, even) },
        { name: 'differential-mode', resonances: findSelfResonances(oddOnly, grid, odd) },
      ],
    };
  });
}

function idealPartWarnings(network: Network): SweepWarning[] {
  const warnings: SweepWarning[] = [];
  for (const element of network.elements) {
    const part = element.part;
    if (part.kind === 'capacitor' && part.esl === 0) {
      warnings.push({
        code: 'ideal-part',
        elementId: element.id,
        message: `${element.label}: no ESL, so its attenuation keeps rising with frequency; real capacitors turn inductive above their SRF`,
      });
    }
    if ((part.kind === 'inductor' || part.kind === 'common-mode-choke') && part.windingCapacitance === 0) {
      warnings.push({
        code: 'ideal-part',
        elementId: element.id,
        message: `${element.label}: no winding capacitance, so its impedance keeps rising with frequency; real windings turn capacitive above their SRF`,
      });
    }
  }
  return warnings;
}

/** Doubles handed out from one buffer, so the whole result transfers as one ArrayBuffer. */
class Arena {
  private offset = 0;
  constructor(
    private readonly storage: Float64Array,
    private readonly length: number,
  ) {}
  take(): Float64Array {
    const view = this.storage.subarray(this.offset, this.offset + this.length);
    this.offset += this.length;
    return view;
  }
}

function assemble(
  design: Design,
  network: Network,
  grid: TaggedGrid,
  response: NetworkResponse,
  workspace: Workspace,
  selfResonances: readonly ElementResonances[],
  refined: readonly RefinedExtremum[],
  warnings: SweepWarning[],
  scratch: SweepScratch | undefined,
): SweepResult {
  const n = grid.frequencyHz.length;
  const viewCount = network.elements.reduce((sum, e) => sum + (e.kind === 'coupled-pair' ? 2 : 1), 0);
  const doubles = n * (1 + SWEEP_COLUMNS.length + 2 * TRANSFER_IDS.length + 2 * viewCount);
  const arena = new Arena(scratch ? scratch.resultStorage(doubles) : new Float64Array(doubles), n);
  const frequencyHz = arena.take();
  frequencyHz.set(grid.frequencyHz);

  const transfers = {} as Record<TransferId, ComplexColumns>;
  for (const id of TRANSFER_IDS) transfers[id] = { re: arena.take(), im: arena.take() };
  const copy = (target: ComplexColumns, source: ComplexColumns): void => {
    target.re.set(source.re.subarray(0, n));
    target.im.set(source.im.subarray(0, n));
  };
  copy(transfers.line1FromCm, response.line1FromCm);
  copy(transfers.line2FromCm, response.line2FromCm);
  copy(transfers.line1FromDm, response.line1FromDm);
  copy(transfers.line2FromDm, response.line2FromDm);
  copy(transfers.inputImpedanceCm, response.inputImpedanceCm);
  copy(transfers.inputImpedanceDm, response.inputImpedanceDm);
  const modes: readonly ModeQuantity[] = ['transferCm', 'transferDm', 'conversionCmToDm', 'conversionDmToCm', 'bareTransferCm', 'bareTransferDm'];
  for (const mode of modes) copy(transfers[mode], modeColumn(response, mode));

  const columns = {} as Record<SweepColumnId, Float64Array>;
  for (const column of SWEEP_COLUMNS) columns[column.id] = arena.take();
  powerRatiosToDb(columns.insertionLoss50Cm, response.resistiveCmLoss[0]!, n);
  powerRatiosToDb(columns.insertionLoss50Dm, response.resistiveDmLoss[0]!, n);
  powerRatiosToDb(columns.insertionLossLowHighCm, response.resistiveCmLoss[1]!, n);
  powerRatiosToDb(columns.insertionLossLowHighDm, response.resistiveDmLoss[1]!, n);
  powerRatiosToDb(columns.insertionLossHighLowCm, response.resistiveCmLoss[2]!, n);
  powerRatiosToDb(columns.insertionLossHighLowDm, response.resistiveDmLoss[2]!, n);
  const magnitudeDb = (c: ComplexColumns, i: number): number => powerRatioToDb(c.re[i]! * c.re[i]! + c.im[i]! * c.im[i]!);
  for (let i = 0; i < n; i += 1) {
    const cm = magnitudeDb(transfers.transferCm, i);
    const dm = magnitudeDb(transfers.transferDm, i);
    columns.transferCm[i] = cm;
    columns.transferDm[i] = dm;
    columns.insertionLossInCircuitCm[i] = magnitudeDb(transfers.bareTransferCm, i) - cm;
    columns.insertionLossInCircuitDm[i] = magnitudeDb(transfers.bareTransferDm, i) - dm;
    columns.conversionCmToDm[i] = magnitudeDb(transfers.conversionCmToDm, i);
    columns.conversionDmToCm[i] = magnitudeDb(transfers.conversionDmToCm, i);
    columns.line1FromCm[i] = magnitudeDb(transfers.line1FromCm, i);
    columns.line2FromCm[i] = magnitudeDb(transfers.line2FromCm, i);
    columns.line1FromDm[i] = magnitudeDb(transfers.line1FromDm, i);
    columns.line2FromDm[i] = magnitudeDb(transfers.line2FromDm, i);
    columns.inputImpedanceCmOhm[i] = magnitude(transfers.inputImpedanceCm, i);
    columns.inputImpedanceCmDeg[i] = degrees(transfers.inputImpedanceCm, i);
    columns.inputImpedanceDmOhm[i] = magnitude(transfers.inputImpedanceDm, i);
    columns.inputImpedanceDmDeg[i] = degrees(transfers.inputImpedanceDm, i);
  }

  const elements: ElementSweep[] = network.elements.map((element, index) => {
    const scratch = workspace.impedance[index]!;
    const found = selfResonances[index]!.views;
    const view = (name: ImpedanceView['name'], source: ComplexColumns, factor: number): ImpedanceView => {
      const magnitudeOhm = arena.take();
      const phaseDeg = arena.take();
      for (let i = 0; i < n; i += 1) {
        magnitudeOhm[i] = factor * magnitude(source, i);
        phaseDeg[i] = degrees(source, i);
      }
      return { name, magnitudeOhm, phaseDeg, selfResonances: found.find((v) => v.name === name)?.resonances ?? [] };
    };
    const common = { id: element.id, stageId: element.stageId, label: element.label, placement: element.placement, partKind: element.part.kind };
    if (element.kind === 'two-terminal') return { ...common, views: [view('impedance', scratch.primary, 1)] };
    // Choke: joined lines see both windings in parallel (even/2); the line-to-line loop sees 2·odd.
    return { ...common, views: [view('common-mode', scratch.primary, 0.5), view('differential-mode', scratch.secondary, 2)] };
  });

  const resonances: ResonanceMark[] = [
    ...selfResonances.flatMap((entry) =>
      entry.views.flatMap((view) =>
        view.resonances.map(
          (r): ResonanceMark => ({ kind: 'element', elementId: entry.element.id, view: view.name, frequencyHz: r.frequencyHz, type: r.type }),
        ),
      ),
    ),
    ...refined.map((r): ResonanceMark => ({ kind: 'response', column: r.curve, frequencyHz: r.frequencyHz, valueDb: r.valueDb, type: r.type })),
  ].sort((a, b) => a.frequencyHz - b.frequencyHz);

  const pointFlags = Uint8Array.from(response.flags.subarray(0, n));
  warnings.push(...flagWarnings(pointFlags, frequencyHz));

  return {
    designName: design.name,
    frequencyHz,
    pointOrigin: Uint8Array.from(grid.origin),
    pointFlags,
    columns,
    transfers,
    elements,
    resonances,
    warnings,
    resistiveSystems: network.resistiveSystems.map((s) => ({ ...s })),
  };
}

function powerRatiosToDb(target: Float64Array, ratios: Float64Array, n: number): void {
  for (let i = 0; i < n; i += 1) target[i] = powerRatioToDb(ratios[i]!);
}

/** |c[i]|; Math.hypot is several times slower and its overflow care is not needed below 1e150. */
function magnitude(c: ComplexColumns, i: number): number {
  return Math.sqrt(c.re[i]! * c.re[i]! + c.im[i]! * c.im[i]!);
}

function degrees(c: ComplexColumns, i: number): number {
  return (Math.atan2(c.im[i]!, c.re[i]!) * 180) / Math.PI;
}

function flagWarnings(flags: Uint8Array, frequencyHz: Float64Array): SweepWarning[] {
  const warnings: SweepWarning[] = [];
  const describe = (bit: number): string | undefined => {
    const hits: number[] = [];
    flags.forEach((value, i) => {
      if (value & bit) hits.push(frequencyHz[i]!);
    });
    if (hits.length === 0) return undefined;
    return `${hits.length} point${hits.length > 1 ? 's' : ''} from ${hits[0]!.toPrecision(4)} Hz to ${hits[hits.length - 1]!.toPrecision(4)} Hz`;
  };
  const limited = describe(PointFlag.IdealResonanceLimited);
  if (limited) {
    warnings.push({
      code: 'ideal-resonance-limited',
      message: `a lossless part sits exactly on its resonance at ${limited}; its impedance was limited to stay finite (add ESR or DCR)`,
    });
  }
  const outside = describe(PointFlag.OutsideMeasuredRange);
  if (outside) {
    warnings.push({ code: 'outside-measured-range', message: `measured impedance held at its end value outside the measured range at ${outside}` });
  }
  const notFinite = describe(PointFlag.NotFinite);
  if (notFinite) warnings.push({ code: 'not-finite', message: `the network has no finite solution at ${notFinite}; those values are placeholders` });
  return warnings;
}
