import { assertName, attributeText, type SvgNode } from '../../drawing/svg-node.ts';
import { svgToDom } from './svg-to-dom.ts';

/**
 * Bring live SVG elements (made by svgToDom) in line with a new drawing, changing only what differs:
 * an attribute set or removed, a text replaced, a child element rebuilt where its tag changed, extra
 * children added or dropped. Typing a part value redraws the filter on every keystroke, and
 * rebuilding its few hundred elements each time costs the page a fresh style and layout pass of the
 * whole drawing; a patch touches the handful of labels that changed. Returns the element that now
 * shows `node`: `current` itself when its tag matches, otherwise a new one put in its place.
 * The same names are refused as by svgToDom, and text stays text.
 */
export function patchSvgDom(current: Element, node: SvgNode, ownerDocument: Document = document): Element {
  if (current.localName !== node.tag) {
    const fresh = svgToDom(node, ownerDocument);
    current.replaceWith(fresh);
    return fresh;
  }
  patchAttributes(current, node);
  patchText(current, node.text, ownerDocument);
  const children = [...current.children];
  node.children.forEach((child, index) => {
    const existing = children[index];
    if (existing) patchSvgDom(existing, child, ownerDocument);
    else current.append(svgToDom(child, ownerDocument));
  });
  for (const extra of children.slice(node.children.length)) extra.remove();
  return current;
}

function patchAttributes(element: Element, node: SvgNode): void {
  const wanted = new Map<string, string>();
  for (const [name, value] of Object.entries(node.attributes)) {
    if (value === undefined || name === 'xmlns') continue;
    assertName(name, 'attribute');
    wanted.set(name, attributeText(value));
  }
  for (const name of element.getAttributeNames()) if (!wanted.has(name)) element.removeAttribute(name);
  for (const [name, text] of wanted) if (element.getAttribute(name) !== text) element.setAttribute(name, text);
}

/** svgToDom writes a node's text as one text node before its child elements. */
function patchText(element: Element, text: string | undefined, ownerDocument: Document): void {
  const first = element.firstChild;
  const existing = first?.nodeType === 3 ? (first as Text) : undefined;
  if (text === undefined) {
    existing?.remove();
    return;
  }
  if (existing) {
    if (existing.data !== text) existing.data = text;
  } else element.prepend(ownerDocument.createTextNode(text));
}
