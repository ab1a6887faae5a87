import type { Design, FilterElement, Part, Receiver, Stage } from '../model/design.ts';
import { impedanceText, partKindText, partSafetyClass, partValueText, placementText, receiverText } from './part-text.ts';
import type { PlotTheme } from './plot-palette.ts';
import { dotPath, groundSymbolPath, partSymbol, type SymbolPaths, windingPath } from './schematic-symbols.ts';
import { serializeSvg, svg, svgNumber, type SvgNode, svgText } from './svg-node.ts';
import { textWidth, truncateText, wrapText } from './text-metrics.ts';

/**
 * The filter drawn as a two-line ladder, in this project's own plain style: the noise source on the
 * left (its CM and DM impedances as the design states them), the stages left to right with their
 * names, every element where its placement puts it (in series in line 1 or line 2, a common-mode
 * choke across both lines with its coupled windings and dots, line to line, line to ground), and the
 * receiving networks on the right, all returning to the ground rail at the bottom.
 *
 * Every element is one group carrying `data-element-id`, so the page can make it clickable and
 * focusable; the selected one is highlighted and a switched-off one is grey and dashed (a series
 * part switched off is drawn over a plain wire, which is what the sweep uses). Columns are as wide
 * as their labels need; with `maxRowWidth` a long filter continues on further rows, joined by
 * numbered connectors, so 20 elements to a stage stay readable on paper.
 */

export interface LadderOptions {
  /** The element drawn highlighted. */
  readonly selectedElementId?: string;
  /** Make each element a focusable button for the page (tabindex, role, aria-label, aria-pressed). */
  readonly interactive?: boolean;
  /** Wrap onto further rows beyond this width (CSS pixels); default: one row. */
  readonly maxRowWidth?: number;
  readonly theme?: PlotTheme;
  /** Prefix of ids inside the drawing, unique per document (default "ladder"). */
  readonly idPrefix?: string;
}

/** Where things were drawn, for tests and for the page (a popover beside the selected part). */
export interface LadderLayout {
  readonly width: number;
  readonly height: number;
  readonly rows: number;
  /** Each element's column: x, width, and its row's line positions. */
  readonly elements: ReadonlyMap<string, ElementPlace>;
}

export interface ElementPlace {
  readonly stageId: string;
  readonly row: number;
  readonly x: number;
  readonly width: number;
  readonly line1Y: number;
  readonly line2Y: number;
  readonly groundY: number;
}

const INK: Readonly<Record<PlotTheme, { background: string; ink: string; text: string; muted: string; accent: string; accentFill: string; disabled: string; frame: string; stageFill: string }>> = {
  light: { background: '#ffffff', ink: '#27303a', text: '#1b222a', muted: '#5b6572', accent: '#1f5fa8', accentFill: 'rgba(31, 95, 168, 0.1)', disabled: '#a0a8b3', frame: '#c4ccd5', stageFill: '#f7f9fb' },
  dark: { background: '#161b22', ink: '#c9d1db', text: '#e6e9ed', muted: '#9aa4b1', accent: '#79aef2', accentFill: 'rgba(121, 174, 242, 0.14)', disabled: '#5d6773', frame: '#3a434e', stageFill: '#1c222a' },
};

const FONT_FAMILY = 'system-ui, -apple-system, Segoe UI, Roboto, Helvetica, Arial, sans-serif';
const ID_FONT = 11.5;
const VALUE_FONT = 11;
const SMALL_FONT = 10.5;
const MARGIN = 10;
/** Row geometry, from the row's top. */
const LINE1 = 80;
const LINE_GAP = 96;
const GROUND_GAP = 96;
const CAPTION = 74;
const ROW_HEIGHT = LINE1 + LINE_GAP + GROUND_GAP + CAPTION;
const CONNECTOR = 34;

interface Row {
  readonly top: number;
  readonly line1: number;
  readonly line2: number;
  readonly ground: number;
}

type Colours = (typeof INK)['light'];

interface DrawContext {
  readonly colours: Colours;
  readonly options: LadderOptions;
}

interface Column {
  readonly width: number;
  /** The stage a column belongs to (for frames and titles), if any. */
  readonly stage?: { readonly index: number; readonly stage: Stage };
  readonly elementId?: string;
  /** A stretch of plain wire that stays in the row of the column before it (never starts a row by choice). */
  readonly sticky?: boolean;
  /** The padding that opens a stage: it goes to the next row with the stage's first element. */
  readonly leading?: boolean;
  draw(x: number, row: Row, context: DrawContext): SvgNode[];
}

const n = svgNumber;
const hline = (x0: number, x1: number, y: number): string => `M${n(x0)} ${n(y)}H${n(x1)}`;
const vline = (x: number, y0: number, y1: number): string => `M${n(x)} ${n(y0)}V${n(y1)}`;

function wires(d: string, colour: string): SvgNode {
  return svg('path', { d, fill: 'none', stroke: colour, 'stroke-width': 1.5, 'stroke-linecap': 'round', 'stroke-linejoin': 'round' });
}

/** A symbol placed with its lead from (x, y) along +x, or downward when upright. */
function placed(symbol: SymbolPaths, x: number, y: number, upright: boolean, stroke: string, width: number, dashed: boolean): SvgNode[] {
  const transform = upright ? `translate(${n(x)} ${n(y)}) rotate(90)` : `translate(${n(x)} ${n(y)})`;
  const nodes: SvgNode[] = [svg('path', { d: symbol.stroke, transform, fill: 'none', stroke, 'stroke-width': width, 'stroke-linejoin': 'round', 'stroke-dasharray': dashed ? '4 3' : undefined })];
  if (symbol.fill !== '') nodes.push(svg('path', { d: symbol.fill, transform, fill: stroke, 'fill-opacity': dashed ? 0.45 : 1, stroke: 'none' }));
  return nodes;
}

/** "100 nF X2": the value and, for a safety capacitor, its class. */
function valueLine(part: Part): string {
  const safety = partSafetyClass(part);
  return safety ? `${partValueText(part)} ${safety}` : partValueText(part);
}

function labelWidth(element: FilterElement): number {
  const id = element.enabled ? element.id : `${element.id} (off)`;
  return Math.max(textWidth(id, ID_FONT, true), textWidth(valueLine(element.part), VALUE_FONT));
}

function describeElement(element: FilterElement): string {
  const label = element.label !== undefined && element.label !== element.id ? ` “${element.label}”` : '';
  return `${element.id}${label}: ${partKindText(element.part)} ${partValueText(element.part)}, ${placementText(element.placement)}${element.enabled ? '' : ', switched off'}`;
}

function elementLabel(element: FilterElement, x: number, y: number, anchor: 'start' | 'middle', colours: Colours, selected: boolean): SvgNode {
  const colour = !element.enabled ? colours.disabled : selected ? colours.accent : colours.text;
  return svg('g', { class: 'part-label' }, [
    svgText('text', { x, y, 'text-anchor': anchor, 'font-size': ID_FONT, 'font-weight': 650, fill: colour }, element.enabled ? element.id : `${element.id} (off)`),
    svgText('text', { x, y: y + 13, 'text-anchor': anchor, 'font-size': VALUE_FONT, fill: element.enabled ? (selected ? colours.accent : colours.muted) : colours.disabled }, valueLine(element.part)),
  ]);
}

/** The element's group: highlight, hit area, symbol and label, with the attributes the page needs. */
function partGroup(element: FilterElement, x: number, width: number, row: Row, context: DrawContext, content: (stroke: string, strokeWidth: number, dashed: boolean) => SvgNode[]): SvgNode {
  const selected = context.options.selectedElementId === element.id;
  const { colours } = context;
  const stroke = !element.enabled ? colours.disabled : selected ? colours.accent : colours.ink;
  const strokeWidth = selected ? 2.2 : 1.5;
  const top = row.line1 - 46;
  const height = row.ground + 8 - top;
  const description = describeElement(element);
  const interactive = context.options.interactive === true;
  return svg(
    'g',
    {
      class: `part${selected ? ' selected' : ''}${element.enabled ? '' : ' disabled'}`,
      'data-element-id': element.id,
      'data-part-kind': element.part.kind,
      'data-placement': element.placement,
      tabindex: interactive ? 0 : undefined,
      role: interactive ? 'button' : undefined,
      'aria-label': interactive ? description : undefined,
      'aria-pressed': interactive ? (selected ? 'true' : 'false') : undefined,
      cursor: interactive ? 'pointer' : undefined,
    },
    [
      svgText('title', {}, description),
      svg('rect', {
        class: 'hit-area',
        x: x + 2,
        y: top,
        width: width - 4,
        height,
        rx: 5,
        fill: selected ? colours.accentFill : 'none',
        stroke: selected ? colours.accent : 'none',
        'stroke-width': selected ? 1 : undefined,
        'pointer-events': 'all',
      }),
      ...content(stroke, strokeWidth, !element.enabled),
    ],
  );
}

/** One element's column. Each column draws its own stretch of line 1, line 2 and the ground rail. */
function elementColumn(element: FilterElement, stageIndex: number, stage: Stage): Column {
  const text = labelWidth(element);
  const placement = element.placement;
  const upright = placement === 'line-to-line' || placement === 'line1-to-ground' || placement === 'line2-to-ground';
  const width = Math.ceil(upright ? Math.max(62, 28 + text + 10) : Math.max(placement === 'both-lines-coupled' ? 76 : 64, text + 14));
  return {
    width,
    stage: { index: stageIndex, stage },
    elementId: element.id,
    draw(x, row, context) {
      const { colours } = context;
      const right = x + width;
      const cx = x + width / 2;
      const plain: string[] = [];
      const dots: string[] = [];
      const symbolX = x + 16;
      const selected = context.options.selectedElementId === element.id;
      let group: SvgNode;
      switch (placement) {
        case 'series-line1':
        case 'series-line2': {
          const y = placement === 'series-line1' ? row.line1 : row.line2;
          const other = placement === 'series-line1' ? row.line2 : row.line1;
          plain.push(hline(x, right, other));
          // A switched-off series part is a plain connection: the wire runs through its ghost.
          if (!element.enabled) plain.push(hline(x, right, y));
          group = partGroup(element, x, width, row, context, (stroke, strokeWidth, dashed) => [
            ...placed(partSymbol(element.part, width), x, y, false, stroke, strokeWidth, dashed),
            elementLabel(element, cx, y - 30, 'middle', colours, selected),
          ]);
          break;
        }
        case 'both-lines-coupled': {
          const jog = 30;
          const inset = 9;
          if (!element.enabled) plain.push(hline(x, right, row.line1), hline(x, right, row.line2));
          group = partGroup(element, x, width, row, context, (stroke, strokeWidth, dashed) => {
            const w0 = x + inset + 5;
            const w1 = right - inset - 5;
            const y1 = row.line1 + jog;
            const y2 = row.line2 - jog;
            const middle = (row.line1 + row.line2) / 2;
            const windings =
              `M${n(x)} ${n(row.line1)}H${n(x + inset)}V${n(y1)}H${n(w0)}${windingPath(w0, w1 - w0, 4, 1, y1)}H${n(right - inset)}V${n(row.line1)}H${n(right)}` +
              `M${n(x)} ${n(row.line2)}H${n(x + inset)}V${n(y2)}H${n(w0)}${windingPath(w0, w1 - w0, 4, -1, y2)}H${n(right - inset)}V${n(row.line2)}H${n(right)}`;
            const core = `${hline(w0 - 2, w1 + 2, middle - 3)}${hline(w0 - 2, w1 + 2, middle + 3)}`;
            // Dots at the same end of both windings: common-mode current makes aiding flux.
            const windingDots = `${dotPath(w0 + 2, y1 - 7, 2.3)}${dotPath(w0 + 2, y2 + 7, 2.3)}`;
            return [
              svg('path', { d: windings, fill: 'none', stroke, 'stroke-width': strokeWidth, 'stroke-linejoin': 'round', 'stroke-dasharray': dashed ? '4 3' : undefined }),
              svg('path', { d: core, fill: 'none', stroke, 'stroke-width': strokeWidth * 0.9, 'stroke-dasharray': dashed ? '4 3' : undefined }),
              svg('path', { d: windingDots, fill: stroke, stroke: 'none' }),
              elementLabel(element, cx, row.line1 - 30, 'middle', colours, selected),
            ];
          });
          break;
        }
        default: {
          // Upright: across the lines, or to ground.
          const from = placement === 'line2-to-ground' ? row.line2 : row.line1;
          const to = placement === 'line-to-line' ? row.line2 : placement === 'line1-to-ground' ? row.line2 : row.ground;
          const reachesGround = placement !== 'line-to-line';
          plain.push(hline(x, right, row.line1));
          if (placement === 'line1-to-ground') {
            // Its wire to ground crosses line 2 without joining it: line 2 hops over.
            plain.push(`${hline(x, symbolX - 5, row.line2)}a5 5 0 0 1 10 0${hline(symbolX + 5, right, row.line2)}`);
          } else plain.push(hline(x, right, row.line2));
          if (element.enabled) {
            dots.push(dotPath(symbolX, from));
            if (placement === 'line-to-line') dots.push(dotPath(symbolX, row.line2));
            if (reachesGround) dots.push(dotPath(symbolX, row.ground));
          }
          group = partGroup(element, x, width, row, context, (stroke, strokeWidth, dashed) => [
            ...placed(partSymbol(element.part, to - from), symbolX, from, true, stroke, strokeWidth, dashed),
            ...(placement === 'line1-to-ground'
              ? [svg('path', { d: vline(symbolX, row.line2, row.ground), fill: 'none', stroke, 'stroke-width': strokeWidth, 'stroke-dasharray': dashed ? '4 3' : undefined })]
              : []),
            elementLabel(element, symbolX + 14, (from + to) / 2 - 2, 'start', colours, selected),
          ]);
        }
      }
      plain.push(hline(x, right, row.ground));
      return [wires(plain.join(''), colours.ink), group, ...(dots.length > 0 ? [svg('path', { d: dots.join(''), fill: colours.ink, stroke: 'none' })] : [])];
    },
  };
}

/** Plain wires across all three conductors. */
function wireColumn(width: number, stage?: { index: number; stage: Stage }, note?: string, leading = false): Column {
  return {
    width,
    ...(stage ? { stage } : {}),
    sticky: note === undefined && !leading,
    leading,
    draw(x, row, context) {
      const nodes = [wires(`${hline(x, x + width, row.line1)}${hline(x, x + width, row.line2)}${hline(x, x + width, row.ground)}`, context.colours.ink)];
      if (note) nodes.push(svgText('text', { x: x + width / 2, y: (row.line1 + row.line2) / 2 + 4, 'text-anchor': 'middle', 'font-size': SMALL_FONT, 'font-style': 'italic', fill: context.colours.muted }, note));
      return nodes;
    },
  };
}

function circleWithWave(x: number, y: number): string {
  return `M${n(x - 9)} ${n(y)}a9 9 0 1 0 18 0a9 9 0 1 0 -18 0M${n(x - 5)} ${n(y)}q2.5 -5 5 0t5 0`;
}

/** The equipment's noise source: half the DM impedance in each line from a midpoint, the CM impedance from there to ground. */
function sourceColumn(design: Design): Column {
  // A value and its unit stay on one line ("300 mΩ"): the space between them does not break.
  const keepUnits = (text: string): string => text.replace(/(\d) (?=[^\d\s(])/gu, '$1\u00a0');
  const captionLines = (width: number) => [
    ...wrapText(keepUnits(`Z_CM: ${impedanceText(design.noiseSource.commonMode.impedance)}`), width, SMALL_FONT),
    ...wrapText(keepUnits(`Z_DM: ${impedanceText(design.noiseSource.differentialMode.impedance)}`), width, SMALL_FONT),
  ];
  const width = 196;
  return {
    width,
    draw(x, row, { colours }) {
      const xc = x + 24;
      const xs = x + 76;
      const middle = (row.line1 + row.line2) / 2;
      const boxLeft = xs + 26;
      const boxRight = xs + 70;
      const lines =
        `${vline(xs, row.line1, row.line1 + 15)}${vline(xs, row.line1 + 33, row.line2 - 33)}${vline(xs, row.line2 - 15, row.line2)}` +
        `${hline(xs, boxLeft, row.line1)}${hline(boxRight, x + width, row.line1)}${hline(xs, boxLeft, row.line2)}${hline(boxRight, x + width, row.line2)}` +
        `${hline(xc, xs, middle)}${vline(xc, middle, middle + 16)}${vline(xc, middle + 48, middle + 80)}${vline(xc, middle + 98, row.ground)}${hline(xc, x + width, row.ground)}`;
      const boxes = `M${n(boxLeft)} ${n(row.line1 - 7)}h${n(boxRight - boxLeft)}v14h${n(boxLeft - boxRight)}Z` + `M${n(boxLeft)} ${n(row.line2 - 7)}h${n(boxRight - boxLeft)}v14h${n(boxLeft - boxRight)}Z` + `M${n(xc - 7)} ${n(middle + 16)}h14v32h-14Z`;
      const emfs = `${circleWithWave(xs, row.line1 + 24)}${circleWithWave(xs, row.line2 - 24)}${circleWithWave(xc, middle + 89)}`;
      const label = (text: string, lx: number, ly: number, anchor: 'start' | 'middle' | 'end' = 'middle') => svgText('text', { x: lx, y: ly, 'text-anchor': anchor, 'font-size': SMALL_FONT, fill: colours.muted }, text);
      const frameBottom = row.ground - 14;
      const all = captionLines(width - 12);
      // Four lines at most; the design tables hold the rest.
      const caption = all.length <= 4 ? all : [...all.slice(0, 3), truncateText(`${all[3]!}…`, width - 12, SMALL_FONT)];
      return [
        svg('rect', { x: x + 4, y: row.line1 - 44, width: width - 14, height: frameBottom - (row.line1 - 44), rx: 6, fill: 'none', stroke: colours.frame, 'stroke-dasharray': '5 4' }),
        svgText('text', { x: x + 12, y: row.line1 - 28, 'font-size': ID_FONT, 'font-weight': 650, fill: colours.text }, 'Noise source'),
        svgText('text', { x: x + 12, y: row.line1 - 15, 'font-size': SMALL_FONT, fill: colours.muted }, 'the equipment'),
        svg('g', { class: 'noise-source' }, [
          wires(lines, colours.ink),
          svg('path', { d: `${boxes}${emfs}`, fill: 'none', stroke: colours.ink, 'stroke-width': 1.5 }),
          svg('path', { d: `${dotPath(xs, middle)}${dotPath(xc, row.ground)}`, fill: colours.ink }),
          svg('path', { d: groundSymbolPath(xc, row.ground), fill: 'none', stroke: colours.ink, 'stroke-width': 1.5 }),
          label('½ Z_DM', (boxLeft + boxRight) / 2, row.line1 - 11),
          label('½ Z_DM', (boxLeft + boxRight) / 2, row.line2 + 19),
          label('DM', xs + 13, row.line1 + 28, 'start'),
          label('DM', xs + 13, row.line2 - 20, 'start'),
          label('Z_CM', xc + 11, middle + 36, 'start'),
          label('CM', xc + 14, middle + 93, 'start'),
        ]),
        svg(
          'g',
          { class: 'caption' },
          caption.map((line, i) => svgText('text', { x: x + 8, y: row.ground + 30 + i * 13, 'font-size': SMALL_FONT, fill: colours.muted }, line)),
        ),
      ];
    },
  };
}

function receiverBoxText(receiver: Receiver): string {
  switch (receiver.kind) {
    case 'cispr16-mains-50uh':
    case 'vehicle-5uh':
      return 'LISN';
    case 'resistive':
      return 'R';
    case 'custom':
      return 'Z';
  }
}

/** The receiving networks: line 2's first, so line 1's drop to ground crosses nothing. */
function receiversColumn(design: Design): Column {
  const { line1, line2 } = design.receivers;
  const same = receiverText(line1) === receiverText(line2);
  const captions = same ? [`each line: ${receiverText(line1)}`] : [`line 1: ${receiverText(line1)}`, `line 2: ${receiverText(line2)}`];
  const width = Math.ceil(Math.max(150, ...captions.map((c) => textWidth(c, SMALL_FONT) + 16)));
  return {
    width,
    draw(x, row, { colours }) {
      const x2 = x + 56;
      const x1 = x + 118;
      const box = (bx: number, top: number, bottom: number): string => {
        const middle = (top + bottom) / 2;
        return `M${n(bx - 16)} ${n(middle - 20)}h32v40h-32Z`;
      };
      const mid2 = (row.line2 + row.ground) / 2;
      const mid1 = (row.line1 + row.ground) / 2;
      const lines =
        `${hline(x, x1, row.line1)}${hline(x, x2, row.line2)}${hline(x, x1, row.ground)}` +
        `${vline(x2, row.line2, mid2 - 20)}${vline(x2, mid2 + 20, row.ground)}${vline(x1, row.line1, mid1 - 20)}${vline(x1, mid1 + 20, row.ground)}`;
      const boxText = (bx: number, by: number, text: string, line: string) => [
        svgText('text', { x: bx, y: by - 2, 'text-anchor': 'middle', 'font-size': 9.5, 'font-weight': 650, fill: colours.text }, text),
        svgText('text', { x: bx, y: by + 10, 'text-anchor': 'middle', 'font-size': 9.5, fill: colours.muted }, line),
      ];
      return [
        svg('g', { class: 'receivers' }, [
          wires(lines, colours.ink),
          svg('path', { d: `${box(x2, row.line2, row.ground)}${box(x1, row.line1, row.ground)}`, fill: colours.background, stroke: colours.ink, 'stroke-width': 1.5 }),
          svg('path', { d: `${dotPath(x2, row.ground)}${dotPath(x1, row.ground)}`, fill: colours.ink }),
          ...boxText(x2, mid2, receiverBoxText(line2), 'line 2'),
          ...boxText(x1, mid1, receiverBoxText(line1), 'line 1'),
          svgText('text', { x: x1 - 8, y: row.line1 - 8, 'text-anchor': 'end', 'font-size': SMALL_FONT, fill: colours.muted }, 'line 1'),
          svgText('text', { x: x2 - 8, y: row.line2 - 8, 'text-anchor': 'end', 'font-size': SMALL_FONT, fill: colours.muted }, 'line 2'),
          svgText('text', { x: x + 8, y: row.ground + 16, 'font-size': SMALL_FONT, fill: colours.muted }, 'ground'),
        ]),
        svgText('text', { x: x + 8, y: row.line1 - 30, 'font-size': ID_FONT, 'font-weight': 650, fill: colours.text }, 'Receiving networks'),
        svg(
          'g',
          { class: 'caption' },
          captions.map((line, i) => svgText('text', { x: x + 8, y: row.ground + 30 + i * 13, 'font-size': SMALL_FONT, fill: colours.muted }, line)),
        ),
      ];
    },
  };
}

function stageTitle(stage: Stage, index: number): string {
  return stage.label ?? `Stage ${index + 1}`;
}

/** Every column, left to right. */
function columnsOf(design: Design): Column[] {
  const columns: Column[] = [sourceColumn(design), wireColumn(14)];
  design.stages.forEach((stage, index) => {
    const owner = { index, stage };
    const titleWidth = Math.max(textWidth(stageTitle(stage, index), ID_FONT, true), textWidth(stage.id, SMALL_FONT)) + 20;
    const inner: Column[] = [wireColumn(8, owner, undefined, true)];
    if (stage.elements.length === 0) inner.push(wireColumn(Math.max(100, titleWidth - 16), owner, 'no elements'));
    for (const element of stage.elements) inner.push(elementColumn(element, index, stage));
    const used = inner.reduce((sum, column) => sum + column.width, 0) + 8;
    inner.push(wireColumn(8 + Math.max(0, Math.ceil(titleWidth - used)), owner));
    columns.push(...inner, wireColumn(14));
  });
  columns.push(receiversColumn(design));
  return columns;
}

/**
 * Rows of about equal width: as many rows as the widest allowed row needs, each broken where the
 * next column's middle would pass the row's share, so a long filter does not end in a row holding
 * only the receivers. No row is wider than allowed (connectors included).
 */
function packRows(columns: readonly Column[], maxRowWidth: number | undefined): Column[][] {
  const total = columns.reduce((sum, column) => sum + column.width, 0);
  if (maxRowWidth === undefined || total + 2 * MARGIN <= maxRowWidth) return [columns.slice()];
  const usable = maxRowWidth - 2 * MARGIN - 2 * CONNECTOR;
  const count = Math.max(1, Math.ceil(total / Math.max(1, usable)));
  const share = total / count;
  const rows: Column[][] = [];
  let current: Column[] = [];
  let used = 0;
  for (const column of columns) {
    const room = maxRowWidth - 2 * MARGIN - (rows.length > 0 ? CONNECTOR : 0) - CONNECTOR;
    const pastShare = rows.length < count - 1 && used + column.width / 2 > share && column.sticky !== true;
    if (current.length > 0 && (used + column.width > room || pastShare)) {
      // A stage's opening padding moves down with its first element.
      const carried = current.length > 1 && current[current.length - 1]!.leading ? current.pop()! : undefined;
      rows.push(current);
      current = carried ? [carried] : [];
      used = carried ? carried.width : 0;
    }
    current.push(column);
    used += column.width;
  }
  if (current.length > 0) rows.push(current);
  return rows;
}

/** Numbered flags where a row ends and the next begins: 1, 2 for the lines and ⏚ for ground. */
function connectors(x: number, row: Row, pointing: 'out' | 'in', number: number, colours: Colours): SvgNode {
  const flags = [
    { y: row.line1, text: '1' },
    { y: row.line2, text: '2' },
    { y: row.ground, text: 'G' },
  ];
  const nodes: SvgNode[] = [];
  for (const flag of flags) {
    const x0 = pointing === 'out' ? x : x + CONNECTOR - 22;
    const wire = pointing === 'out' ? hline(x, x + 6, flag.y) : hline(x + CONNECTOR - 6, x + CONNECTOR, flag.y);
    const body = `M${n(x0 + 6)} ${n(flag.y - 7)}h11l6 7l-6 7h-11Z`;
    nodes.push(svg('path', { d: `${wire}${body}`, fill: colours.background, stroke: colours.ink, 'stroke-width': 1.25 }));
    nodes.push(svgText('text', { x: x0 + 12.5, y: flag.y + 3.5, 'text-anchor': 'middle', 'font-size': 9.5, 'font-weight': 650, fill: colours.text }, flag.text));
  }
  const caption = pointing === 'out' ? `continues at ${String.fromCharCode(64 + number)}` : `from ${String.fromCharCode(64 + number)}`;
  nodes.push(svgText('text', { x: pointing === 'out' ? x + CONNECTOR : x, y: row.ground + 30, 'text-anchor': pointing === 'out' ? 'end' : 'start', 'font-size': 9.5, fill: colours.muted }, caption));
  return svg('g', { class: `connector connector-${pointing}` }, nodes);
}

/**
 * Layout couplings between elements (capacitance across stages, mutual inductance, a shared ground
 * return) are drawn in their own layer over the ladder once the design format carries them; the
 * element places in `LadderLayout` are what they will be drawn between.
 */
function couplingLayer(): SvgNode {
  return svg('g', { class: 'couplings' });
}

export function drawLadder(design: Design, options: LadderOptions = {}): { node: SvgNode; layout: LadderLayout } {
  const colours = INK[options.theme ?? 'light'];
  const context: DrawContext = { colours, options };
  const rows = packRows(columnsOf(design), options.maxRowWidth);
  const body: SvgNode[] = [];
  const places = new Map<string, ElementPlace>();
  let width = 0;
  rows.forEach((columns, r) => {
    const top = MARGIN + r * ROW_HEIGHT;
    const row: Row = { top, line1: top + LINE1, line2: top + LINE1 + LINE_GAP, ground: top + LINE1 + LINE_GAP + GROUND_GAP };
    let x = MARGIN;
    if (r > 0) {
      body.push(connectors(x, row, 'in', r, colours));
      x += CONNECTOR;
    }
    // Stage frames behind their columns, with the stage's name on top.
    const spans = new Map<number, { stage: Stage; from: number; to: number }>();
    let cursor = x;
    for (const column of columns) {
      if (column.stage) {
        const span = spans.get(column.stage.index);
        if (span) span.to = cursor + column.width;
        else spans.set(column.stage.index, { stage: column.stage.stage, from: cursor, to: cursor + column.width });
      }
      cursor += column.width;
    }
    for (const [index, span] of spans) {
      const continued = rows.slice(0, r).some((earlier) => earlier.some((column) => column.stage?.index === index));
      const title = `${stageTitle(span.stage, index)}${continued ? ' (continued)' : ''}`;
      body.push(
        svg('g', { class: 'stage', 'data-stage-id': span.stage.id }, [
          svg('rect', { x: span.from, y: top + 2, width: span.to - span.from, height: row.ground + 22 - (top + 2), rx: 7, fill: colours.stageFill, stroke: colours.frame }),
          svgText('text', { x: span.from + 8, y: top + 17, 'font-size': ID_FONT, 'font-weight': 650, fill: colours.text }, truncateText(title, span.to - span.from - 14, ID_FONT)),
          svgText('text', { x: span.from + 8, y: top + 30, 'font-size': SMALL_FONT, fill: colours.muted }, truncateText(span.stage.id, span.to - span.from - 14, SMALL_FONT)),
        ]),
      );
    }
    for (const column of columns) {
      body.push(...column.draw(x, row, context));
      if (column.elementId !== undefined && column.stage) {
        places.set(column.elementId, { stageId: column.stage.stage.id, row: r, x, width: column.width, line1Y: row.line1, line2Y: row.line2, groundY: row.ground });
      }
      x += column.width;
    }
    if (r < rows.length - 1) {
      body.push(connectors(x, row, 'out', r + 1, colours));
      x += CONNECTOR;
    }
    width = Math.max(width, x + MARGIN);
  });
  const height = MARGIN + rows.length * ROW_HEIGHT;
  const prefix = (options.idPrefix ?? 'ladder').replace(/[^A-Za-z0-9_-]/gu, '-');
  const elementCount = design.stages.reduce((sum, stage) => sum + stage.elements.length, 0);
  const node = svg(
    'svg',
    {
      width,
      height,
      viewBox: `0 0 ${n(width)} ${n(height)}`,
      role: 'img',
      'aria-labelledby': `${prefix}-title ${prefix}-desc`,
      'font-family': FONT_FAMILY,
      'font-size': VALUE_FONT,
      class: 'ladder',
    },
    [
      svgText('title', { id: `${prefix}-title` }, `The filter of ${design.name}`),
      svgText(
        'desc',
        { id: `${prefix}-desc` },
        `Two-line ladder: noise source, ${design.stages.length} stage${design.stages.length === 1 ? '' : 's'} with ${elementCount} element${elementCount === 1 ? '' : 's'}, receiving networks.`,
      ),
      svg('rect', { x: 0, y: 0, width, height, fill: colours.background }),
      ...body,
      couplingLayer(),
    ],
  );
  return { node, layout: { width, height, rows: rows.length, elements: places } };
}

export function ladderToSvg(design: Design, options: LadderOptions & { readonly standalone?: boolean } = {}): string {
  return serializeSvg(drawLadder(design, options).node, { xmlDeclaration: options.standalone ?? false });
}
