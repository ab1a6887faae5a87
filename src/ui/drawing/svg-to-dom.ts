import { assertName, attributeText, SVG_NAMESPACE, type SvgNode } from '../../drawing/svg-node.ts';

/**
 * A drawing from src/drawing (the filter, a plot) as live SVG elements for the page, built with
 * createElementNS, setAttribute and text nodes: user text stays text, and no markup is ever parsed
 * (no innerHTML). The same names are refused as by the serialiser, so both ways agree.
 */
export function svgToDom(node: SvgNode, ownerDocument: Document = document): SVGElement {
  assertName(node.tag, 'tag');
  const element = ownerDocument.createElementNS(SVG_NAMESPACE, node.tag);
  for (const [name, value] of Object.entries(node.attributes)) {
    // The namespace comes from createElementNS; an xmlns attribute would be a namespace declaration.
    if (value === undefined || name === 'xmlns') continue;
    assertName(name, 'attribute');
    element.setAttribute(name, attributeText(value));
  }
  if (node.text !== undefined) element.append(ownerDocument.createTextNode(node.text));
  for (const child of node.children) element.append(svgToDom(child, ownerDocument));
  return element;
}
