import type { Part } from '../model/design.ts';
import { svgNumber } from './svg-node.ts';

/**
 * Schematic symbols in a plain style of this project: each is drawn along a straight lead from
 * (0, 0) to (length, 0) with its body in the middle, as path data for the stroked lines and, where
 * a symbol has one, a filled shape. The ladder drawing turns them upright with a rotation for parts
 * across the lines or to ground. Sizes in CSS pixels.
 */

export interface SymbolPaths {
  /** Stroked (no fill): leads, plates, windings, zigzags, outlines. */
  readonly stroke: string;
  /** Filled with the stroke colour (a ferrite bead's block, junction dots); may be empty. */
  readonly fill: string;
}

const n = svgNumber;

function leads(length: number, body: number): { start: number; end: number; d: string } {
  const start = (length - body) / 2;
  const end = start + body;
  return { start, end, d: `M0 0H${n(start)}M${n(end)} 0H${n(length)}` };
}

/** Two plates across the lead. */
export function capacitorSymbol(length: number): SymbolPaths {
  const gap = 6;
  const half = 10;
  const { start, end, d } = leads(length, gap);
  return { stroke: `${d}M${n(start)} ${-half}V${half}M${n(end)} ${-half}V${half}`, fill: '' };
}

/** Humps on one side of the lead: side −1 bulges towards negative y (up when drawn along x). */
export function windingPath(from: number, width: number, humps: number, side: 1 | -1, y = 0): string {
  const r = width / humps / 2;
  let d = `M${n(from)} ${n(y)}`;
  for (let k = 0; k < humps; k += 1) d += `a${n(r)} ${n(r)} 0 0 ${side < 0 ? 1 : 0} ${n(2 * r)} 0`;
  return d;
}

export function inductorSymbol(length: number, side: 1 | -1 = -1): SymbolPaths {
  const body = 32;
  const { start, d } = leads(length, body);
  return { stroke: `${d}${windingPath(start, body, 4, side)}`, fill: '' };
}

function zigzagPath(from: number, width: number, amplitude: number, y = 0): string {
  const steps = 6;
  const step = width / steps;
  let d = `M${n(from)} ${n(y)}l${n(step / 2)} ${n(-amplitude)}`;
  for (let k = 1; k < steps; k += 1) d += `l${n(step)} ${n(k % 2 === 1 ? 2 * amplitude : -2 * amplitude)}`;
  return `${d}l${n(step / 2)} ${n(amplitude)}`;
}

export function resistorSymbol(length: number): SymbolPaths {
  const body = 24;
  const { start, d } = leads(length, body);
  return { stroke: `${d}${zigzagPath(start, body, 5)}`, fill: '' };
}

/** A solid block on the lead. */
export function ferriteBeadSymbol(length: number): SymbolPaths {
  const body = 22;
  const { start, d } = leads(length, body);
  return { stroke: d, fill: `M${n(start)} -4.5h${body}v9h${-body}Z` };
}

/** An outlined box: a part known only by its measured impedance. */
export function measuredSymbol(length: number): SymbolPaths {
  const body = 26;
  const { start, d } = leads(length, body);
  // A small sine inside says "impedance from a measurement", whichever way the box is turned.
  const wave = `M${n(start + 6)} 0q3 -4 7 0t7 0`;
  return { stroke: `${d}M${n(start)} -7h${body}v14h${-body}Z${wave}`, fill: '' };
}

/** A resistor and a capacitor in series along one lead. */
export function dampingRcSymbol(length: number): SymbolPaths {
  const body = 40;
  const { start, end, d } = leads(length, body);
  const zig = zigzagPath(start, 20, 5);
  const plateA = start + 28;
  const plateB = plateA + 6;
  return { stroke: `${d}${zig}M${n(start + 20)} 0H${n(plateA)}M${n(plateA)} -9V9M${n(plateB)} -9V9M${n(plateB)} 0H${n(end)}`, fill: '' };
}

/** A resistor and an inductor in parallel: the lead splits into two branches and joins again. */
export function dampingRlSymbol(length: number): SymbolPaths {
  const body = 40;
  const { start, end, d } = leads(length, body);
  const offset = 9;
  const inner = start + 6;
  const innerEnd = end - 6;
  const branchWidth = innerEnd - inner;
  const top = `M${n(start)} 0V${-offset}H${n(inner)}${windingPath(inner, branchWidth, 3, -1, -offset)}H${n(end)}V0`;
  const bottom = `M${n(start)} 0V${offset}H${n(inner)}${zigzagPath(inner, branchWidth, 4, offset)}H${n(end)}V0`;
  return { stroke: `${d}${top}${bottom}`, fill: `${dotPath(start, 0, 2.2)}${dotPath(end, 0, 2.2)}` };
}

/** The symbol of a two-terminal part (a choke is drawn by the ladder itself: it spans both lines). */
export function partSymbol(part: Part, length: number): SymbolPaths {
  switch (part.kind) {
    case 'capacitor':
      return capacitorSymbol(length);
    case 'inductor':
    case 'common-mode-choke':
      return inductorSymbol(length);
    case 'resistor':
      return resistorSymbol(length);
    case 'ferrite-bead':
      return ferriteBeadSymbol(length);
    case 'damping-rc':
      return dampingRcSymbol(length);
    case 'damping-rl':
      return dampingRlSymbol(length);
    case 'measured':
      return measuredSymbol(length);
  }
}

/** The three bars of a ground (reference) symbol hanging below (x, y). */
export function groundSymbolPath(x: number, y: number): string {
  return `M${n(x)} ${n(y)}v8M${n(x - 9)} ${n(y + 8)}h18M${n(x - 6)} ${n(y + 12)}h12M${n(x - 3)} ${n(y + 16)}h6`;
}

/** A filled dot (a junction) at (x, y). */
export function dotPath(x: number, y: number, r = 2.6): string {
  return `M${n(x - r)} ${n(y)}a${n(r)} ${n(r)} 0 1 0 ${n(2 * r)} 0a${n(r)} ${n(r)} 0 1 0 ${n(-2 * r)} 0Z`;
}
