import { readdirSync, readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import type { Design } from '../../src/model/design.ts';
import { readDesignJson } from '../../src/model/read-design.ts';

/**
 * Every design file shipped in fixtures/ (the demo, the goldens, the examples) and the minimal
 * example in docs/design-format.md read without a single validation problem.
 */

const FIXTURES = new URL('../../fixtures/', import.meta.url);
const DOC = readFileSync(new URL('../../docs/design-format.md', import.meta.url), 'utf8');

/** Paths under fixtures/ of design.json, *.design.json and everything in fixtures/examples/. */
function designFiles(): string[] {
  const all = readdirSync(fileURLToPath(FIXTURES), { recursive: true, encoding: 'utf8' }).map((path) => path.split('\\').join('/'));
  return all
    .filter((path) => path.endsWith('.json'))
    .filter((path) => /(^|\/)design[^/]*\.json$/u.test(path) || path.endsWith('.design.json') || path.startsWith('examples/'))
    .sort();
}

function read(path: string): Design {
  const result = readDesignJson(readFileSync(new URL(path, FIXTURES), 'utf8'));
  if (!result.ok) throw new Error(`fixtures/${path}: ${result.error.message}`);
  return result.value;
}

const files = designFiles();
const examples = files.filter((path) => path.startsWith('examples/'));

describe('design files in fixtures/', () => {
  it('are found: the demo, the goldens and the examples', () => {
    expect(files).toContain('demo/adapter-two-stage.design.json');
    expect(files.filter((path) => path.startsWith('golden/')).length).toBeGreaterThanOrEqual(5);
    expect(examples.length).toBeGreaterThanOrEqual(3);
    expect(examples.length).toBeLessThanOrEqual(4);
  });

  it.each(files)('%s reads without error', (path) => {
    const design = read(path);
    expect(design.format).toBe('chokepoint-design');
    expect(design.version).toBe(2);
  });
});

describe('the examples in fixtures/examples/', () => {
  it.each(examples)('%s says that it is invented', (path) => {
    expect(read(path).description).toMatch(/^INVENTED /u);
  });

  it('are each listed in docs/design-format.md', () => {
    for (const path of examples) expect(DOC).toContain(`\`${path.slice('examples/'.length)}\``);
  });

  const parts = (design: Design) => design.stages.flatMap((stage) => stage.elements.map((element) => ({ ...element, stage: stage.id })));

  it('dc-input-beads-vehicle: ferrite beads in both lines and the 50 Ω ∥ 5 µH networks', () => {
    const design = read('examples/dc-input-beads-vehicle.design.json');
    const beads = parts(design).filter((element) => element.part.kind === 'ferrite-bead');
    expect(beads.map((element) => element.placement).sort()).toEqual(['series-line1', 'series-line2']);
    expect(design.receivers.line1.kind).toBe('vehicle-5uh');
    expect(design.receivers.line2.kind).toBe('vehicle-5uh');
    expect(parts(design).some((element) => element.part.kind === 'damping-rc')).toBe(true);
  });

  it('unbalanced-one-y-capacitor: one enabled Y capacitor, to line 1 only; the default plan', () => {
    const design = read('examples/unbalanced-one-y-capacitor.design.json');
    const toGround = parts(design).filter((element) => element.enabled && element.placement.endsWith('-to-ground'));
    expect(toGround.map((element) => [element.placement, element.part.kind])).toEqual([['line1-to-ground', 'capacitor']]);
    expect(parts(design).filter((element) => !element.enabled).map((element) => element.id)).toEqual(['CY2']);
    expect(design.frequencyPlan).toEqual({ startHz: 9e3, stopHz: 108e6, pointsPerDecade: 200 });
  });

  it('measured-bead-table: measured tables in both lines, covering the whole sweep', () => {
    const design = read('examples/measured-bead-table.design.json');
    const measured = parts(design).filter((element) => element.part.kind === 'measured');
    expect(measured.map((element) => element.placement).sort()).toEqual(['series-line1', 'series-line2']);
    for (const { part } of measured) {
      if (part.kind !== 'measured') continue;
      expect(part.table.frequencyHz[0]).toBeLessThanOrEqual(design.frequencyPlan.startHz);
      expect(part.table.frequencyHz.at(-1)).toBeGreaterThanOrEqual(design.frequencyPlan.stopHz);
    }
  });

  it('engineering-notation: every physical value is text', () => {
    const raw: unknown = JSON.parse(readFileSync(new URL('examples/engineering-notation.design.json', FIXTURES), 'utf8'));
    // Numbers that the format takes as plain JSON numbers only.
    const plainNumbers = new Set(['version', 'pointsPerDecade', 'couplingFactor', 'frequencyHz', 'magnitudeOhm', 'phaseDeg', 'levelDbuV', 'targetMarginDb', 'noiseFloorDbuV', 'duty']);
    const numbersAt: string[] = [];
    const walk = (value: unknown, path: string, key: string): void => {
      if (typeof value === 'number' && !plainNumbers.has(key)) numbersAt.push(path);
      else if (Array.isArray(value)) value.forEach((item: unknown, i) => walk(item, `${path}[${i}]`, key));
      else if (typeof value === 'object' && value !== null) {
        for (const [name, item] of Object.entries(value)) walk(item, path === '' ? name : `${path}.${name}`, name);
      }
    };
    walk(raw, '', '');
    expect(numbersAt).toEqual([]);
    const design = read('examples/engineering-notation.design.json');
    const choke = parts(design).find((element) => element.id === 'LCM1')!.part;
    expect(choke).toMatchObject({ kind: 'common-mode-choke', inductance: 4.7e-3, windingCapacitance: 12e-12, parallelResistance: 4700 });
    expect(parts(design).find((element) => element.id === 'RB1')!.part).toMatchObject({ kind: 'resistor', resistance: 1e6 });
  });
});

describe('the JSON in docs/design-format.md', () => {
  const blocks = [...DOC.matchAll(/^```json([^\n]*)\n([\s\S]*?)^```\s*$/gmu)].map((match) => ({ info: match[1]!.trim(), text: match[2]! }));

  it('the minimal example reads, with its defaults filled in', () => {
    const minimal = blocks.filter((block) => block.info === 'minimal-example');
    expect(minimal).toHaveLength(1);
    const result = readDesignJson(minimal[0]!.text);
    if (!result.ok) throw result.error;
    expect(result.value.frequencyPlan).toEqual({ startHz: 9e3, stopHz: 108e6, pointsPerDecade: 200 });
    expect(result.value.stages[0]!.elements[0]).toMatchObject({ id: 'CX1', enabled: true, part: { kind: 'capacitor', capacitance: 220e-9, esr: 0 } });
  });

  it('every JSON block is JSON', () => {
    expect(blocks.length).toBeGreaterThanOrEqual(2);
    for (const block of blocks) expect(() => JSON.parse(block.text) as unknown, block.text.slice(0, 60)).not.toThrow();
  });
});
