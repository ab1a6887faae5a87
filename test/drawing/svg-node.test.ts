import { describe, expect, it } from 'vitest';
import { escapeSvgAttribute, escapeSvgText, serializeSvg, svg, svgNumber, svgText } from '../../src/drawing/svg-node.ts';

// Escaping follows XML 1.0 (W3C Recommendation, 5th edition): §2.4 character data may not hold a
// literal "<" or "&"; §3.1 an attribute value may not hold its own quote, "<" or "&"; §3.3.3
// attribute-value normalisation turns a literal tab or line break into a space unless written as
// a character reference; §2.2 characters below U+0020 other than tab, LF and CR are not allowed.

const HOSTILE = ['<script>alert(1)</script>', 'a "quoted" & \'single\' name', '</text><script>x()</script>', 'R&D <b>bold</b>', ']]> end'];

describe('serializeSvg', () => {
  it('writes an empty element self-closed, attributes in order, numbers shortened', () => {
    expect(serializeSvg(svg('rect', { x: 1.234567, y: -0.001, width: 10, height: undefined, fill: 'none' }))).toBe('<rect x="1.23" y="0" width="10" fill="none"/>');
  });

  it('adds the SVG namespace to a root <svg> and an XML declaration on request', () => {
    const text = serializeSvg(svg('svg', { width: 10 }), { xmlDeclaration: true });
    expect(text).toBe('<?xml version="1.0" encoding="UTF-8"?>\n<svg xmlns="http://www.w3.org/2000/svg" width="10"/>');
  });

  it.each(HOSTILE)('escapes hostile text in text content: %s', (hostile) => {
    const text = serializeSvg(svg('g', {}, [svgText('text', {}, hostile), svgText('title', {}, hostile), svgText('desc', {}, hostile)]));
    expect(text).not.toContain('<script');
    expect(text).not.toContain('<b>');
    expect(text).not.toMatch(/&(?!amp;|lt;|gt;|quot;|#39;)/u);
    // Exactly three text-bearing elements, so no markup leaked out of the text.
    expect(text.match(/<[a-z]/gu)).toHaveLength(4);
  });

  it.each(HOSTILE)('escapes hostile text in attribute values: %s', (hostile) => {
    const text = serializeSvg(svg('g', { 'data-element-id': hostile, 'aria-label': hostile }));
    expect(text.match(/"/gu)).toHaveLength(4);
    expect(text).not.toContain('<script');
    expect(text).not.toContain("'");
  });

  it('round-trips escaped text through an XML reader to the original string', async () => {
    const { Window } = await import('happy-dom');
    const window = new Window();
    const hostile = 'CX1 <470 nF> & "X2" \'a\'\ttab\nline';
    const text = serializeSvg(svg('svg', {}, [svgText('text', { 'data-name': hostile }, hostile)]));
    const parsed = new window.DOMParser().parseFromString(text, 'image/svg+xml');
    const node = parsed.querySelector('text');
    expect(node?.textContent).toBe(hostile);
    expect(node?.getAttribute('data-name')).toBe(hostile);
    await window.happyDOM.close();
  });

  it('replaces characters XML cannot hold', () => {
    expect(escapeSvgText('a\u0000b\u0007c\uFFFEd\uD800e')).toBe('a\uFFFDb\uFFFDc\uFFFDd\uFFFDe');
    expect(escapeSvgText('tab\tand\nline')).toBe('tab\tand\nline');
    expect(escapeSvgAttribute('tab\tline\n')).toBe('tab&#9;line&#10;');
    expect(escapeSvgText('emoji 😀 stays')).toBe('emoji 😀 stays');
  });

  it('refuses tag and attribute names that are not plain names, and event handlers', () => {
    expect(() => serializeSvg(svg('script onload="x"'))).toThrow(RangeError);
    expect(() => serializeSvg(svg('g', { 'x"y': 1 }))).toThrow(RangeError);
    expect(() => serializeSvg(svg('g', { onclick: 'alert(1)' }))).toThrow(RangeError);
    expect(() => serializeSvg(svg('g', { OnLoad: 'alert(1)' }))).toThrow(RangeError);
  });

  it('prints coordinates to a hundredth, never as -0 or in exponent form', () => {
    expect(svgNumber(1e-9)).toBe('0');
    expect(svgNumber(-0.004)).toBe('0');
    expect(svgNumber(12.345)).toBe('12.35');
    expect(svgNumber(-7.1)).toBe('-7.1');
    expect(svgNumber(123456.7)).toBe('123456.7');
    expect(() => svgNumber(Number.NaN)).toThrow(RangeError);
  });

  it('is deterministic: the same tree gives the same bytes', () => {
    const tree = () => svg('svg', { viewBox: '0 0 10 10' }, [svg('path', { d: 'M0 0L10 10', stroke: '#000' }), svgText('text', { x: 1 }, 'α & ω')]);
    expect(serializeSvg(tree())).toBe(serializeSvg(tree()));
  });
});
