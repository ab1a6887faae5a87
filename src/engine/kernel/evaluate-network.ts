import { type ComplexColumns, complexColumns } from '../complex-columns.ts';
import type { Network, NetworkElement } from '../network.ts';
import { ADMITTANCE_LIMIT_S, PointFlag } from '../point-flags.ts';
import {
  allocateChain,
  appendSeriesInLine,
  appendSeriesModal,
  appendShuntLineToLine,
  appendShuntToGround,
  type ChainBuffer,
  resetToIdentity,
} from './chain-ops.ts';
import { allocateResponse, type NetworkResponse, responseHead } from './network-response.ts';
import { addCoupledPair, addSeriesInLine, addShunt, type ModeImpedance, startAtReceivers, writeInputImpedances } from './input-impedance.ts';
import { terminate, type TerminationImpedances } from './terminate.ts';

/**
 * Scratch storage for sweeping one network on grids of up to `capacity` points. Reusing a
 * workspace keeps repeated sweeps (refinement passes, Monte Carlo, parameter maps) free of
 * allocation; nothing in it outlives the call that filled it except what the caller copies.
 */
export interface Workspace {
  readonly capacity: number;
  readonly chain: ChainBuffer;
  /** Per element: its impedance as evaluated (two-terminal: Z; coupled pair: even and odd). */
  readonly impedance: readonly ElementScratch[];
  readonly terminations: TerminationImpedances;
  /** Mode impedance looking towards the receivers, walked back element by element. */
  readonly lookingIn: ModeImpedance;
}

interface ElementScratch {
  /** Two-terminal: Z. Coupled pair: even (common-mode path) impedance per winding. */
  readonly primary: ComplexColumns;
  /** Coupled pair only: odd (leakage path) impedance per winding. */
  readonly secondary: ComplexColumns;
  /**
   * What the mode-coordinate chain update multiplies by: z/4 (series in one line), y = 1/z
   * (shunt to ground), 4y (line to line), or, for a coupled pair, even/2 here and odd/2 in
   * `operandDifferential`.
   */
  readonly operand: ComplexColumns;
  readonly operandDifferential: ComplexColumns;
}

const EMPTY = complexColumns(0);

export function createWorkspace(network: Network, capacity: number): Workspace {
  return {
    capacity,
    chain: allocateChain(CHAIN_BLOCK),
    impedance: network.elements.map((element) => {
      const coupled = element.kind === 'coupled-pair';
      return {
        primary: complexColumns(capacity),
        secondary: coupled ? complexColumns(capacity) : EMPTY,
        operand: complexColumns(capacity),
        operandDifferential: coupled ? complexColumns(capacity) : EMPTY,
      };
    }),
    terminations: {
      commonModeSource: complexColumns(capacity),
      differentialModeSource: complexColumns(capacity),
      receiverLine1: complexColumns(capacity),
      receiverLine2: complexColumns(capacity),
    },
    lookingIn: { z00: complexColumns(capacity), z01: complexColumns(capacity), z11: complexColumns(capacity) },
  };
}

/** Points per cache block: a 4×4 complex chain of 64 points is 16 KiB and stays in L1. */
export const CHAIN_BLOCK = 64;

/**
 * Sweep the network over `frequencyHz` (any order, all > 0) and write every output into `out`
 * (from index 0). Element impedances are evaluated once over the whole grid; then, block by block,
 * the cascade is built element by element with frequency innermost, and terminated.
 * `out.flags` must start zeroed.
 */
export function evaluateNetwork(
  network: Network,
  frequencyHz: Float64Array,
  workspace: Workspace,
  out: NetworkResponse,
): void {
  const count = frequencyHz.length;
  if (count > workspace.capacity) throw new Error(`grid of ${count} points exceeds workspace capacity ${workspace.capacity}`);
  const flags = out.flags;
  const { terminations, chain } = workspace;
  network.commonModeSource.evaluate(frequencyHz, terminations.commonModeSource, flags);
  network.differentialModeSource.evaluate(frequencyHz, terminations.differentialModeSource, flags);
  network.receiverLine1.evaluate(frequencyHz, terminations.receiverLine1, flags);
  network.receiverLine2.evaluate(frequencyHz, terminations.receiverLine2, flags);
  const elements = network.elements;
  for (let e = 0; e < elements.length; e += 1) prepareOperand(elements[e]!, frequencyHz, workspace.impedance[e]!, flags);

  for (let start = 0; start < count; start += CHAIN_BLOCK) {
    const length = Math.min(CHAIN_BLOCK, count - start);
    resetToIdentity(chain, length);
    for (let e = 0; e < elements.length; e += 1) appendElement(elements[e]!, workspace.impedance[e]!, chain, length, start);
    terminate(chain, length, terminations, network.resistiveSystems, out, start);
  }
  inputImpedance(network, workspace, count, out);
}

/** Walk from the receivers back to the source, element by element (see input-impedance.ts). */
function inputImpedance(network: Network, workspace: Workspace, count: number, out: NetworkResponse): void {
  const state = workspace.lookingIn;
  startAtReceivers(state, workspace.terminations.receiverLine1, workspace.terminations.receiverLine2, count);
  for (let e = network.elements.length - 1; e >= 0; e -= 1) {
    const element = network.elements[e]!;
    const scratch = workspace.impedance[e]!;
    if (element.kind === 'coupled-pair') {
      addCoupledPair(state, scratch.primary, scratch.secondary, count);
      continue;
    }
    switch (element.placement) {
      case 'series-line1':
        addSeriesInLine(state, scratch.primary, 1, count);
        break;
      case 'series-line2':
        addSeriesInLine(state, scratch.primary, -1, count);
        break;
      case 'line1-to-ground':
        addShunt(state, scratch.operand, 1, 1, count, out.flags);
        break;
      case 'line2-to-ground':
        addShunt(state, scratch.operand, 1, -1, count, out.flags);
        break;
      case 'line-to-line':
        addShunt(state, scratch.operand, 0, 1, count, out.flags);
        break;
    }
  }
  writeInputImpedances(state, out.inputImpedanceCm, out.inputImpedanceDm, count, out.flags);
}

/** Evaluate an element's impedance over the grid and the operand its chain update needs. */
function prepareOperand(element: NetworkElement, f: Float64Array, scratch: ElementScratch, flags: Uint8Array): void {
  const count = f.length;
  const { operand } = scratch;
  if (element.kind === 'coupled-pair') {
    const { primary: even, secondary: odd, operandDifferential } = scratch;
    element.eigenImpedances(f, even, odd, flags);
    scaleInto(even, operand, 0.5, count);
    scaleInto(odd, operandDifferential, 0.5, count);
    return;
  }
  const z = scratch.primary;
  element.impedance.evaluate(f, z, flags);
  switch (element.placement) {
    case 'series-line1':
    case 'series-line2':
      scaleInto(z, operand, 0.25, count);
      return;
    case 'line1-to-ground':
    case 'line2-to-ground':
      invertInto(z, operand, count, flags, 1);
      return;
    case 'line-to-line':
      invertInto(z, operand, count, flags, 4);
      return;
  }
}

function scaleInto(source: ComplexColumns, target: ComplexColumns, factor: number, count: number): void {
  for (let i = 0; i < count; i += 1) {
    target.re[i] = factor * source.re[i]!;
    target.im[i] = factor * source.im[i]!;
  }
}

function appendElement(element: NetworkElement, scratch: ElementScratch, chain: ChainBuffer, count: number, offset: number): void {
  const { operand } = scratch;
  if (element.kind === 'coupled-pair') {
    const differential = scratch.operandDifferential;
    appendSeriesModal(chain, count, operand.re, operand.im, differential.re, differential.im, offset);
    return;
  }
  switch (element.placement) {
    case 'series-line1':
      appendSeriesInLine(chain, count, 0, operand.re, operand.im, offset);
      return;
    case 'series-line2':
      appendSeriesInLine(chain, count, 1, operand.re, operand.im, offset);
      return;
    case 'line1-to-ground':
      appendShuntToGround(chain, count, 0, operand.re, operand.im, offset);
      return;
    case 'line2-to-ground':
      appendShuntToGround(chain, count, 1, operand.re, operand.im, offset);
      return;
    case 'line-to-line':
      appendShuntLineToLine(chain, count, operand.re, operand.im, offset);
      return;
  }
}

const ADMITTANCE_LIMIT_SQUARED = ADMITTANCE_LIMIT_S * ADMITTANCE_LIMIT_S;

/**
 * y = factor/z. Only a lossless short is limited (and its point flagged): z exactly 0, or purely
 * reactive (re exactly 0) with |1/z| beyond ADMITTANCE_LIMIT_S, which an ideal part reaches only at
 * its series resonance. A part with losses has |z| ≥ its resistance > 0 and is inverted exactly,
 * however small (docs/engine-math.md §6).
 */
function invertInto(z: ComplexColumns, y: ComplexColumns, count: number, flags: Uint8Array, factor: number): void {
  for (let i = 0; i < count; i += 1) {
    const zr = z.re[i]!;
    const zi = z.im[i]!;
    const z2 = zr * zr + zi * zi;
    if (z2 > 0 && (zr !== 0 || z2 * ADMITTANCE_LIMIT_SQUARED >= 1)) {
      y.re[i] = (factor * zr) / z2;
      y.im[i] = (-factor * zi) / z2;
    } else {
      flags[i]! |= PointFlag.IdealResonanceLimited;
      // A perfect short keeps no direction; a real one would be resistive.
      y.re[i] = factor * (zi === 0 ? ADMITTANCE_LIMIT_S : 0);
      y.im[i] = factor * (zi === 0 ? 0 : -Math.sign(zi) * ADMITTANCE_LIMIT_S);
    }
  }
}

/** Convenience for one-off sweeps: allocate, evaluate, return a response sized to the grid. */
export function evaluateNetworkOnce(network: Network, frequencyHz: Float64Array): NetworkResponse {
  const workspace = createWorkspace(network, frequencyHz.length);
  const response = allocateResponse(frequencyHz.length, network.resistiveSystems.length);
  evaluateNetwork(network, frequencyHz, workspace, response);
  return responseHead(response, frequencyHz.length);
}
