import { contours } from 'd3-contour';
import type { Design } from '../../model/design.ts';
import { allElements, DEFAULT_SCALING, locateElement, readValue, type ScalingModel, targetValue, type ValueTarget, withTargetValue } from '../design-edit/part-values.ts';
import { AssistInputError, type AssistProblem } from '../margin/assist-problem.ts';
import { compileMarginEvaluator, type MarginEvaluator } from '../margin/margin-evaluator.ts';
import { maximumYCapacitance } from '../sizing/leakage-limit.ts';

/**
 * The two-value map (docs/assistants.md, "Two-value map"): the worst margin over a grid of two
 * part values (log spaced on each axis), every cell a full engine evaluation, split into chunks of
 * cells for the worker pool. The pass region's outline at the target margin comes from marching
 * squares (d3-contour) on the cell grid, mapped back to part values; the current design is marked;
 * when an axis is a Y capacitance and a leakage-current limit is given, its largest allowed value is
 * drawn as a boundary. Any cell becomes a design with `mapCellDesign`.
 */

export interface MapAxis {
  readonly target: ValueTarget;
  readonly fromValue: number;
  readonly toValue: number;
  /** Cells along the axis (default 40). */
  readonly steps?: number;
}

export interface MapSettings {
  readonly x: MapAxis;
  readonly y: MapAxis;
  readonly scaling?: ScalingModel;
  /** Draw the leakage-current boundary on a Y-capacitance axis. */
  readonly leakage?: { readonly leakageLimitA: number; readonly lineVoltageV: number; readonly lineFrequencyHz: number; readonly tolerance: number };
}

export interface MapContext {
  readonly problem: AssistProblem;
  readonly evaluator: MarginEvaluator;
  readonly settings: MapSettings;
  readonly xValues: Float64Array;
  readonly yValues: Float64Array;
  readonly scaling: ScalingModel;
}

export interface MapChunk {
  readonly start: number;
  readonly count: number;
  readonly worstMarginDb: Float64Array;
  readonly worstFrequencyHz: Float64Array;
}

/** A ring of the pass outline, in part values: x[k], y[k]. */
export interface ValueRing {
  readonly x: Float64Array;
  readonly y: Float64Array;
}

export interface MapResult {
  readonly xTarget: ValueTarget;
  readonly yTarget: ValueTarget;
  readonly xValues: Float64Array;
  readonly yValues: Float64Array;
  /** Worst margin per cell, row-major by y then x (index = iy·nx + ix), dB; NaN where the values make no part. */
  readonly worstMarginDb: Float64Array;
  readonly worstFrequencyHz: Float64Array;
  readonly targetMarginDb: number;
  /** The pass region's outline: polygons (each an outer ring then holes) at the target margin. */
  readonly passOutline: readonly (readonly ValueRing[])[];
  readonly passingCells: number;
  readonly current: { readonly x: number; readonly y: number; readonly marginDb: number };
  /** The largest Y capacitance the leakage limit allows, on whichever axis is a Y capacitance. */
  readonly leakageBoundary: { readonly axis: 'x' | 'y'; readonly value: number } | undefined;
  readonly notes: readonly string[];
}

export const DEFAULT_MAP_STEPS = 40;
/** Cells per chunk: one row of a 40×40 map. */
const CELLS_PER_CHUNK = 40;

function axisValues(axis: MapAxis): Float64Array {
  const steps = axis.steps ?? DEFAULT_MAP_STEPS;
  if (!(axis.fromValue > 0 && axis.toValue > axis.fromValue)) throw new AssistInputError('a map axis runs from a positive value up to a larger one');
  if (!(Number.isInteger(steps) && steps >= 2 && steps <= 400)) throw new AssistInputError('a map axis has 2 to 400 steps');
  return Float64Array.from({ length: steps }, (_, k) => axis.fromValue * (axis.toValue / axis.fromValue) ** (k / (steps - 1)));
}

export function prepareMap(problem: AssistProblem, settings: MapSettings): MapContext {
  for (const axis of [settings.x, settings.y]) {
    for (const id of axis.target.elementIds) {
      if (!locateElement(problem.design, id)) throw new AssistInputError(`no element "${id}" in the design`);
    }
    if (targetValue(problem.design, axis.target) === undefined) throw new AssistInputError(`${axis.target.elementIds.join('+')} has no ${axis.target.quantity}`);
  }
  return {
    problem,
    evaluator: compileMarginEvaluator(problem),
    settings,
    xValues: axisValues(settings.x),
    yValues: axisValues(settings.y),
    scaling: settings.scaling ?? DEFAULT_SCALING,
  };
}

export function mapChunkRanges(context: MapContext): { start: number; count: number }[] {
  const total = context.xValues.length * context.yValues.length;
  const ranges: { start: number; count: number }[] = [];
  for (let start = 0; start < total; start += CELLS_PER_CHUNK) ranges.push({ start, count: Math.min(CELLS_PER_CHUNK, total - start) });
  return ranges;
}

/** The design at one cell: both axes' values set (in that order: x, then y). */
export function mapCellDesign(design: Design, settings: MapSettings, x: number, y: number): Design | undefined {
  const scaling = settings.scaling ?? DEFAULT_SCALING;
  const withX = withTargetValue(design, settings.x.target, x, scaling);
  return withX ? withTargetValue(withX, settings.y.target, y, scaling) : undefined;
}

export function runMapChunk(context: MapContext, start: number, count: number): MapChunk {
  const nx = context.xValues.length;
  const worstMarginDb = new Float64Array(count);
  const worstFrequencyHz = new Float64Array(count);
  for (let c = 0; c < count; c += 1) {
    const cell = start + c;
    const candidate = mapCellDesign(context.problem.design, context.settings, context.xValues[cell % nx]!, context.yValues[Math.floor(cell / nx)]!);
    const outcome = candidate ? context.evaluator.evaluate(candidate) : undefined;
    worstMarginDb[c] = outcome?.worstMarginDb ?? Number.NaN;
    worstFrequencyHz[c] = outcome?.worstFrequencyHz ?? Number.NaN;
  }
  return { start, count, worstMarginDb, worstFrequencyHz };
}

export function mergeMap(context: MapContext, chunks: readonly MapChunk[]): MapResult {
  const { xValues, yValues, problem, settings } = context;
  const nx = xValues.length;
  const ny = yValues.length;
  const worstMarginDb = new Float64Array(nx * ny).fill(Number.NaN);
  const worstFrequencyHz = new Float64Array(nx * ny).fill(Number.NaN);
  for (const chunk of chunks) {
    worstMarginDb.set(chunk.worstMarginDb, chunk.start);
    worstFrequencyHz.set(chunk.worstFrequencyHz, chunk.start);
  }
  const target = problem.targetMarginDb;
  // Marching squares needs numbers everywhere: a cell with no valid part counts as failing.
  const filled = Array.from(worstMarginDb, (m) => (Number.isNaN(m) ? target - 1000 : m));
  const [polygon] = contours().size([nx, ny]).thresholds([target])(filled);
  // Grid coordinates: cell (i, j) has its centre at (i + 0.5, j + 0.5); values are log spaced.
  const toValue = (values: Float64Array, g: number): number => {
    const t = Math.min(values.length - 1, Math.max(0, g - 0.5));
    return values[0]! * (values[values.length - 1]! / values[0]!) ** (t / (values.length - 1));
  };
  const passOutline = (polygon?.coordinates ?? []).map((rings) =>
    rings.map((ring) => ({ x: Float64Array.from(ring, (p) => toValue(xValues, p[0]!)), y: Float64Array.from(ring, (p) => toValue(yValues, p[1]!)) })),
  );
  const currentX = targetValue(problem.design, settings.x.target)!;
  const currentY = targetValue(problem.design, settings.y.target)!;
  const notes: string[] = [];
  let leakageBoundary: MapResult['leakageBoundary'];
  if (settings.leakage) {
    for (const [axis, name] of [
      [settings.x, 'x'],
      [settings.y, 'y'],
    ] as const) {
      const boundary = yCapacitanceBoundary(problem.design, axis.target, settings.leakage);
      if (boundary !== undefined) leakageBoundary = { axis: name, value: boundary };
    }
    if (!leakageBoundary) notes.push('neither axis is a Y capacitance (capacitors from a line to ground): no leakage boundary');
  }
  return {
    xTarget: settings.x.target,
    yTarget: settings.y.target,
    xValues,
    yValues,
    worstMarginDb,
    worstFrequencyHz,
    targetMarginDb: target,
    passOutline,
    passingCells: worstMarginDb.filter((m) => m >= target).length,
    current: { x: currentX, y: currentY, marginDb: context.evaluator.evaluate(problem.design).worstMarginDb },
    leakageBoundary,
    notes,
  };
}

/**
 * For an axis whose elements are all capacitors to ground: the axis value at which the line with
 * more capacitance to earth reaches C_Y,max (the axis moves its elements together, the others stay).
 */
function yCapacitanceBoundary(design: Design, target: ValueTarget, leakage: NonNullable<MapSettings['leakage']>): number | undefined {
  if (target.quantity !== 'capacitance') return undefined;
  const elements = allElements(design).filter((l) => l.element.enabled);
  const moved = new Set(target.elementIds);
  const isY = (placement: string): boolean => placement === 'line1-to-ground' || placement === 'line2-to-ground';
  for (const id of moved) {
    const location = elements.find((l) => l.element.id === id);
    if (!location || location.element.part.kind !== 'capacitor' || !isY(location.element.placement)) return undefined;
  }
  const reference = targetValue(design, target)!;
  const limit = maximumYCapacitance(leakage.leakageLimitA, leakage.lineVoltageV, leakage.lineFrequencyHz, leakage.tolerance);
  // Per line: fixed part + (moved part per unit of the axis value) · value.
  let best: number | undefined;
  for (const line of ['line1-to-ground', 'line2-to-ground'] as const) {
    let fixed = 0;
    let perUnit = 0;
    for (const { element } of elements) {
      if (element.placement !== line || element.part.kind !== 'capacitor') continue;
      const c = readValue(element.part, 'capacitance')!;
      if (moved.has(element.id)) perUnit += c / reference;
      else fixed += c;
    }
    if (perUnit === 0) continue;
    const value = (limit - fixed) / perUnit;
    if (best === undefined || value < best) best = value;
  }
  return best !== undefined && best > 0 ? best : undefined;
}
