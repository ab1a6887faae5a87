import { describe, expect, it } from 'vitest';
import { serializeSvg, svg, type SvgNode, svgText } from '../../../src/drawing/svg-node.ts';
import { svgToDom } from '../../../src/ui/drawing/svg-to-dom.ts';

const HOSTILE = '<script>alert("x")</script> & \'quotes\'';

const tree: SvgNode = svg('svg', { viewBox: '0 0 100 50', width: 100.004, role: 'img' }, [
  svgText('title', {}, `Filter ${HOSTILE}`),
  svg('g', { 'data-element-id': HOSTILE, class: 'part' }, [svg('path', { d: 'M0 0L10 10', stroke: '#222' }), svgText('text', { x: 3.14159, y: 2 }, HOSTILE)]),
  svg('circle', { cx: 1, cy: 2, r: 3, fill: undefined }),
]);

/** The tree an element holds, in the node model's shape, for comparison. */
function shapeOf(element: Element): unknown {
  const text = [...element.childNodes].filter((n) => n.nodeType === 3).map((n) => n.textContent).join('');
  return {
    tag: element.localName,
    namespace: element.namespaceURI,
    attributes: Object.fromEntries([...element.attributes].map((a) => [a.name, a.value])),
    text: text === '' ? undefined : text,
    children: [...element.children].map(shapeOf),
  };
}

describe('svgToDom', () => {
  it('builds the same tree as the serialiser writes, in the SVG namespace', () => {
    const built = svgToDom(tree, document);
    const parsed = new DOMParser().parseFromString(serializeSvg(tree), 'image/svg+xml').documentElement;
    const expected = shapeOf(parsed) as { attributes: Record<string, string> };
    delete expected.attributes['xmlns'];
    expect(shapeOf(built)).toEqual(expected);
    expect(built.namespaceURI).toBe('http://www.w3.org/2000/svg');
  });

  it('keeps user text as text: no element is made from it', () => {
    const built = svgToDom(tree, document);
    document.body.append(built);
    expect(document.querySelectorAll('script')).toHaveLength(0);
    expect(built.querySelector('text')?.textContent).toBe(HOSTILE);
    expect(built.querySelector('g')?.getAttribute('data-element-id')).toBe(HOSTILE);
    expect(built.querySelector('title')?.textContent).toBe(`Filter ${HOSTILE}`);
    expect(built.getAttribute('width')).toBe('100');
    expect(built.querySelector('circle')?.hasAttribute('fill')).toBe(false);
    built.remove();
  });

  it('refuses the names the serialiser refuses', () => {
    expect(() => svgToDom(svg('g', { onclick: 'x()' }), document)).toThrow(RangeError);
    expect(() => svgToDom(svg('bad tag'), document)).toThrow(RangeError);
  });
});
