import { describe, expect, it } from 'vitest';
import { svg, type SvgNode, svgText } from '../../../src/drawing/svg-node.ts';
import { patchSvgDom } from '../../../src/ui/drawing/svg-patch.ts';
import { svgToDom } from '../../../src/ui/drawing/svg-to-dom.ts';
import { drawLadder } from '../../../src/drawing/ladder-svg.ts';
import { buildDesign, capacitor, element, inductor } from '../../support/design-builders.ts';

/** The tree an element holds, in the node model's shape, for comparison. */
function shapeOf(node: Element): unknown {
  return {
    tag: node.localName,
    namespace: node.namespaceURI,
    attributes: Object.fromEntries([...node.attributes].map((a) => [a.name, a.value]).sort()),
    text: [...node.childNodes].filter((n) => n.nodeType === 3).map((n) => n.textContent).join(''),
    children: [...node.children].map(shapeOf),
  };
}

/** Patch `from` (as shown) into `to`, and compare with `to` built afresh. */
function patched(from: SvgNode, to: SvgNode): { shown: Element; fresh: Element } {
  const host = document.createElement('div');
  host.append(svgToDom(from, document));
  const shown = patchSvgDom(host.firstElementChild!, to, document);
  return { shown, fresh: svgToDom(to, document) };
}

describe('patchSvgDom', () => {
  it('turns one drawing into another exactly: attributes set and removed, texts, children added, dropped and re-tagged', () => {
    const before = svg('svg', { viewBox: '0 0 10 10', class: 'old' }, [
      svgText('title', {}, 'before'),
      svg('g', { 'data-element-id': 'a' }, [svg('path', { d: 'M0 0' }), svgText('text', { x: 1 }, 'C1 100 nF')]),
      svg('circle', { r: 1 }),
      svg('rect', { width: 2 }),
    ]);
    const after = svg('svg', { viewBox: '0 0 20 10' }, [
      svgText('title', {}, 'after <b>'),
      svg('g', { 'data-element-id': 'a', opacity: 0.5 }, [svg('path', { d: 'M0 1' }), svgText('text', { x: 1 }, 'C1 220 nF'), svg('line', { x1: 0 })]),
      svg('rect', { width: 3 }),
    ]);
    const { shown, fresh } = patched(before, after);
    expect(shapeOf(shown)).toEqual(shapeOf(fresh));
    const { shown: back, fresh: freshBack } = patched(after, before);
    expect(shapeOf(back)).toEqual(shapeOf(freshBack));
  });

  it('keeps the elements of a drawn filter when only a part value changes, and still matches a fresh drawing', () => {
    const design = (nanofarads: number) =>
      buildDesign({ elements: [element('line-to-line', capacitor(nanofarads * 1e-9), 'CX1'), element('series-line1', inductor(1e-3), 'L1')] });
    const before = drawLadder(design(100), { interactive: true, theme: 'light', maxRowWidth: 760, idPrefix: 'filter' }).node;
    const after = drawLadder(design(470), { interactive: true, theme: 'light', maxRowWidth: 760, idPrefix: 'filter' }).node;
    const host = document.createElement('div');
    const first = svgToDom(before, document);
    host.append(first);
    const group = first.querySelector('[data-element-id="CX1"]');
    const shown = patchSvgDom(first, after, document);
    expect(shown).toBe(first);
    expect(first.querySelector('[data-element-id="CX1"]')).toBe(group);
    expect(shapeOf(shown)).toEqual(shapeOf(svgToDom(after, document)));
    expect(first.textContent).not.toEqual(svgToDom(before, document).textContent);
  });

  it('replaces the root when its tag differs', () => {
    const host = document.createElement('div');
    host.append(svgToDom(svg('g', {}), document));
    const shown = patchSvgDom(host.firstElementChild!, svg('svg', { width: 1 }), document);
    expect(host.firstElementChild).toBe(shown);
    expect(shown.localName).toBe('svg');
  });
});
