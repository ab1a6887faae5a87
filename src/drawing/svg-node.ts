/**
 * A tiny SVG document model with no DOM: plain nodes `{ tag, attributes, children, text }` that the
 * drawing code builds, a serialiser to markup (file export, the printable report, Node), and, on the
 * page, src/ui/drawing/svg-to-dom.ts, which turns the same nodes into elements.
 *
 * Everything a user typed (part names, mask names, variant names, notes) travels as `text` or as an
 * attribute value, never as markup: the serialiser escapes every text and every attribute, and tag
 * and attribute names must be plain names written by this program (anything else throws).
 */

export type SvgAttributeValue = string | number | undefined;

export interface SvgNode {
  readonly tag: string;
  /** Written in insertion order; an undefined value is left out. Numbers go through `svgNumber`. */
  readonly attributes: Readonly<Record<string, SvgAttributeValue>>;
  readonly children: readonly SvgNode[];
  /** Character data, written before the children. */
  readonly text?: string;
}

export const SVG_NAMESPACE = 'http://www.w3.org/2000/svg';

/** A node with children. */
export function svg(tag: string, attributes: Readonly<Record<string, SvgAttributeValue>> = {}, children: readonly SvgNode[] = []): SvgNode {
  return { tag, attributes, children };
}

/** A node holding text (a <text>, <tspan>, <title> or <desc>). */
export function svgText(tag: string, attributes: Readonly<Record<string, SvgAttributeValue>>, text: string, children: readonly SvgNode[] = []): SvgNode {
  return { tag, attributes, children, text };
}

/**
 * Coordinates and lengths as short, stable text: at most two decimals (a hundredth of a pixel),
 * no trailing zeros, no "-0". The same number always prints the same, so a drawing can be hashed.
 */
export function svgNumber(value: number): string {
  if (!Number.isFinite(value)) throw new RangeError(`not a finite coordinate: ${value}`);
  const rounded = Math.round(value * 100) / 100;
  if (rounded === 0) return '0';
  return String(rounded);
}

const NAME = /^[A-Za-z][A-Za-z0-9_.:-]*$/u;

/**
 * Characters XML 1.0 cannot hold (C0 controls other than tab, line feed and carriage return, lone
 * surrogates, U+FFFE and U+FFFF) become U+FFFD, so any user text still makes a well-formed file.
 */
// eslint-disable-next-line no-control-regex
const NOT_XML = /[\u0000-\u0008\u000B\u000C\u000E-\u001F\uFFFE\uFFFF]|[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/gu;

/** Text as XML character data: & < > escaped, impossible characters replaced. */
export function escapeSvgText(text: string): string {
  return text.replace(NOT_XML, '\uFFFD').replace(/&/gu, '&amp;').replace(/</gu, '&lt;').replace(/>/gu, '&gt;');
}

/** Text as a double-quoted attribute value: also " ' and the white space an attribute would fold. */
export function escapeSvgAttribute(text: string): string {
  return escapeSvgText(text).replace(/"/gu, '&quot;').replace(/'/gu, '&#39;').replace(/\t/gu, '&#9;').replace(/\n/gu, '&#10;').replace(/\r/gu, '&#13;');
}

/** The attribute's text as the serialiser and the DOM converter both write it. */
export function attributeText(value: string | number): string {
  return typeof value === 'number' ? svgNumber(value) : value;
}

export function assertName(name: string, what: 'tag' | 'attribute'): void {
  if (!NAME.test(name) || /^on/iu.test(name)) throw new RangeError(`not an allowed SVG ${what} name: ${JSON.stringify(name)}`);
}

export interface SerializeOptions {
  /** Prefix `<?xml …?>` (a standalone .svg file); off for SVG inlined in HTML. */
  readonly xmlDeclaration?: boolean;
}

/**
 * Markup for a node tree. A root <svg> without an `xmlns` gets one, so the text is a valid .svg
 * file as well as inline SVG. Deterministic: the same tree gives the same bytes.
 */
export function serializeSvg(root: SvgNode, options: SerializeOptions = {}): string {
  const parts: string[] = [];
  if (options.xmlDeclaration) parts.push('<?xml version="1.0" encoding="UTF-8"?>\n');
  const withNamespace = root.tag === 'svg' && root.attributes['xmlns'] === undefined ? { ...root, attributes: { xmlns: SVG_NAMESPACE, ...root.attributes } } : root;
  write(withNamespace, parts);
  return parts.join('');
}

function write(node: SvgNode, parts: string[]): void {
  assertName(node.tag, 'tag');
  parts.push('<', node.tag);
  for (const [name, value] of Object.entries(node.attributes)) {
    if (value === undefined) continue;
    assertName(name, 'attribute');
    parts.push(' ', name, '="', escapeSvgAttribute(attributeText(value)), '"');
  }
  if (node.text === undefined && node.children.length === 0) {
    parts.push('/>');
    return;
  }
  parts.push('>');
  if (node.text !== undefined) parts.push(escapeSvgText(node.text));
  for (const child of node.children) write(child, parts);
  parts.push('</', node.tag, '>');
}
