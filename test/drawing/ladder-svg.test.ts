import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { Window } from 'happy-dom';
import { afterAll, describe, expect, it } from 'vitest';
import demoJson from '../../fixtures/demo/adapter-two-stage.design.json';
import { drawLadder, ladderToSvg } from '../../src/drawing/ladder-svg.ts';
import { type Design, requireDesign } from '../../src/model/index.ts';
import { oneElementDesign, twentyElementDesign } from '../support/ladder-designs.ts';

const window = new Window();
afterAll(() => window.happyDOM.close());
const parse = (text: string) => new window.DOMParser().parseFromString(text, 'image/svg+xml');

const examplesDir = join(__dirname, '../../fixtures/examples');
const examples: [string, Design][] = readdirSync(examplesDir)
  .filter((name) => name.endsWith('.design.json'))
  .map((name) => [name, requireDesign(JSON.parse(readFileSync(join(examplesDir, name), 'utf8')))]);
const demo = requireDesign(demoJson);

const allIds = (design: Design) => design.stages.flatMap((stage) => stage.elements.map((element) => element.id));

describe('ladderToSvg', () => {
  it.each([['demo', demo] as [string, Design], ...examples, ['one element', oneElementDesign()], ['twenty elements', twentyElementDesign()]])(
    'draws every element of %s exactly once, as a group with its id, in design order',
    (_name, design) => {
      const doc = parse(ladderToSvg(design, { maxRowWidth: 1100 }));
      const drawn = [...doc.querySelectorAll('g.part')].map((g) => g.getAttribute('data-element-id'));
      expect(drawn).toEqual(allIds(design));
      for (const element of design.stages.flatMap((s) => s.elements)) {
        const group = doc.querySelector(`g.part[data-element-id="${element.id}"]`);
        expect(group?.getAttribute('data-placement')).toBe(element.placement);
        expect(group?.querySelector('text')?.textContent).toBe(element.enabled ? element.id : `${element.id} (off)`);
      }
      expect([...doc.querySelectorAll('g.stage')].map((g) => g.getAttribute('data-stage-id')).filter((id, i, all) => all.indexOf(id) === i)).toEqual(design.stages.map((s) => s.id));
    },
  );

  it('prints the main value in engineering notation beside each part', () => {
    const doc = parse(ladderToSvg(demo));
    const value = (id: string) => doc.querySelector(`g.part[data-element-id="${id}"] .part-label text:nth-of-type(2)`)?.textContent;
    expect(value('CX1')).toBe('100 nF X2');
    expect(value('CY1')).toBe('2.2 nF Y2');
    expect(value('LCM1')).toBe('2.2 mH');
    expect(value('LCM2')).toBe('470 µH');
    expect(value('CX2')).toBe('1 µF X2');
    expect(doc.querySelector('.receivers')?.textContent).toContain('LISN');
    expect(doc.querySelector('.caption')?.textContent?.replace(/\u00a0/gu, ' ')).toContain('Z_CM: capacitor 1.5 pF');
  });

  it('highlights the selected element and only that one', () => {
    const doc = parse(ladderToSvg(demo, { selectedElementId: 'CX2' }));
    expect([...doc.querySelectorAll('g.part.selected')].map((g) => g.getAttribute('data-element-id'))).toEqual(['CX2']);
    const selected = doc.querySelector('g.part.selected');
    expect(selected?.querySelector('rect.hit-area')?.getAttribute('fill')).not.toBe('none');
    expect(selected?.querySelector('path')?.getAttribute('stroke')).toBe('#1f5fa8');
    expect(doc.querySelector('g.part[data-element-id="CX1"] path')?.getAttribute('stroke')).toBe('#27303a');
  });

  it('greys and dashes a switched-off element, and leaves out its junction dots', () => {
    const [, design] = examples.find(([name]) => name.startsWith('unbalanced'))!;
    const doc = parse(ladderToSvg(design));
    const off = doc.querySelector('g.part[data-element-id="CY2"]');
    expect(off?.getAttribute('class')).toContain('disabled');
    expect(off?.querySelector('path')?.getAttribute('stroke-dasharray')).toBe('4 3');
    expect(off?.querySelector('path')?.getAttribute('stroke')).toBe('#a0a8b3');
    expect(off?.querySelector('title')?.textContent).toContain('switched off');
    const on = doc.querySelector('g.part[data-element-id="CY1"] path');
    expect(on?.getAttribute('stroke-dasharray')).toBeNull();
  });

  it('makes parts focusable buttons on request, and not in a static drawing', () => {
    const interactive = parse(ladderToSvg(demo, { interactive: true, selectedElementId: 'LCM1' }));
    const groups = [...interactive.querySelectorAll('g.part')];
    expect(groups.every((g) => g.getAttribute('tabindex') === '0' && g.getAttribute('role') === 'button')).toBe(true);
    expect(groups.filter((g) => g.getAttribute('aria-pressed') === 'true').map((g) => g.getAttribute('data-element-id'))).toEqual(['LCM1']);
    expect(groups[0]?.getAttribute('aria-label')).toBe('CX1 “CX1 X2 100 nF”: X2 capacitor 100 nF, line to line');
    const still = parse(ladderToSvg(demo));
    expect(still.querySelector('g.part')?.hasAttribute('tabindex')).toBe(false);
  });

  it('keeps user text as text: names with markup are escaped', () => {
    const hostile = requireDesign({
      ...(demoJson as object),
      name: '<script>alert(1)</script>',
      stages: [{ id: 'S1', label: '</text><script>x()</script>', elements: [{ id: 'CX1', label: '<b>"bold"</b> & co', placement: 'line-to-line', part: { kind: 'capacitor', capacitance: '1 uF' } }] }],
    });
    const text = ladderToSvg(hostile);
    expect(text).not.toContain('<script');
    expect(text).not.toContain('<b>');
    const doc = parse(text);
    expect(doc.querySelector('g.stage text')?.textContent).toBe('</text><script>x()</script>');
    expect(doc.querySelector('g.part title')?.textContent).toContain('<b>"bold"</b> & co');
  });

  it('grows with the number of elements and wraps onto rows joined by connectors', () => {
    const one = drawLadder(oneElementDesign()).layout;
    const twenty = drawLadder(twentyElementDesign()).layout;
    expect(twenty.width).toBeGreaterThan(one.width + 19 * 55);
    const wrapped = drawLadder(twentyElementDesign(), { maxRowWidth: 900 });
    expect(wrapped.layout.rows).toBeGreaterThan(1);
    expect(wrapped.layout.width).toBeLessThanOrEqual(900);
    const doc = parse(ladderToSvg(twentyElementDesign(), { maxRowWidth: 900 }));
    expect(doc.querySelectorAll('g.connector-out')).toHaveLength(wrapped.layout.rows - 1);
    expect(doc.querySelectorAll('g.connector-in')).toHaveLength(wrapped.layout.rows - 1);
    // No two element columns overlap.
    const places = [...wrapped.layout.elements.values()];
    for (const a of places) for (const b of places) if (a !== b && a.row === b.row) expect(a.x + a.width <= b.x || b.x + b.width <= a.x).toBe(true);
  });

  it('crosses line 2 with a hop where a line-1-to-ground part reaches ground', () => {
    const doc = parse(ladderToSvg(demo));
    expect(ladderToSvg(demo)).toContain('a5 5 0 0 1 10 0');
    expect(doc.querySelector('g.part[data-element-id="CY1"]')?.querySelectorAll('path').length).toBeGreaterThan(1);
  });

  it('is deterministic', () => {
    expect(ladderToSvg(demo, { selectedElementId: 'CX1' })).toBe(ladderToSvg(demo, { selectedElementId: 'CX1' }));
  });
});
