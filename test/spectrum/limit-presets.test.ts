import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { limitMaskSchema } from '../../src/model/emissions-schema.ts';
import { limitAt } from '../../src/spectrum/limit-mask.ts';
import { copyPreset, findPreset, LIMIT_PRESETS, type LimitPreset } from '../../src/spectrum/limit-presets.ts';

/**
 * The shipped limit lines, checked against references.md §1.1 point by point. Each row
 * of EXPECTED names its source and status tag (V: read in the text; V2: secondary source). Only V
 * and V2 values may be presets: CISPR 25 and CISPR 11 class A above 20 kVA are M there and must not
 * appear.
 */

const MHz = 1e6;

/** Class B, QP and AV: 66→56 (log f) / 56 / 60 and 56→46 / 46 / 50 dBµV over 0.15–0.5 / 0.5–5 / 5–30 MHz. */
const CLASS_B_F = [0.15 * MHz, 0.5 * MHz, 5 * MHz, 5 * MHz, 30 * MHz];
const CLASS_B = { qp: [66, 56, 56, 60, 60], av: [56, 46, 46, 50, 50] };
/** Class A, QP and AV: 79 / 73 and 66 / 60 dBµV over 0.15–0.5 / 0.5–30 MHz. */
const CLASS_A_F = [0.15 * MHz, 0.5 * MHz, 0.5 * MHz, 30 * MHz];
const CLASS_A = { qp: [79, 79, 73, 73], av: [66, 66, 60, 60] };

interface Expected {
  readonly id: string;
  readonly source: string;
  readonly status: 'V' | 'V2';
  readonly frequencyHz: readonly number[];
  readonly levelDbuV: readonly number[];
}

function rows(prefix: string, source: (c: 'A' | 'B') => string, status: 'V' | 'V2'): Expected[] {
  return [
    { id: `${prefix}-class-b-qp`, source: source('B'), status, frequencyHz: CLASS_B_F, levelDbuV: CLASS_B.qp },
    { id: `${prefix}-class-b-av`, source: source('B'), status, frequencyHz: CLASS_B_F, levelDbuV: CLASS_B.av },
    { id: `${prefix}-class-a-qp`, source: source('A'), status, frequencyHz: CLASS_A_F, levelDbuV: CLASS_A.qp },
    { id: `${prefix}-class-a-av`, source: source('A'), status, frequencyHz: CLASS_A_F, levelDbuV: CLASS_A.av },
  ];
}

const EXPECTED: readonly Expected[] = [
  // 47 CFR §15.107(a) class B and (b) class A, CFR text as revised October 2008: V.
  ...rows('fcc-15.107', (c) => (c === 'B' ? '47 CFR §15.107(a)' : '47 CFR §15.107(b)'), 'V'),
  // CISPR 22 ed. 6 (2008) / EN 55022 mains-terminal table, class A and B: V2 (EN 55022 table as reproduced on a course page).
  ...rows('cispr22', (c) => `CISPR 22 / EN 55022 mains terminals, class ${c}`, 'V2'),
  // CISPR 32:2015 Annex A AC mains power port, class A and B: V2 for the values (those of the EN 55022 table);
  // that CISPR 32 prints them, and its table numbers, are M in references.md §1.1.
  ...rows('cispr32', (c) => `CISPR 32 / EN 55032 AC mains power port, class ${c}`, 'V2'),
  // CISPR 11 / EN 55011 group 1: class A ≤ 20 kVA (ed. 6, 2015; product manual quoting EN 55011) and class B
  // (open-source code encoding EN 55011 class B): V2.
  ...rows('cispr11-group-1', (c) => `CISPR 11 / EN 55011 group 1 class ${c}${c === 'A' ? ' (≤ 20 kVA)' : ''}`, 'V2'),
];

describe('the preset catalogue', () => {
  it('holds exactly the expected presets, QP and AV of each class', () => {
    expect(LIMIT_PRESETS.map((p) => p.id).sort()).toEqual(EXPECTED.map((e) => e.id).sort());
    expect(new Set(LIMIT_PRESETS.map((p) => p.id)).size).toBe(LIMIT_PRESETS.length);
  });

  it.each(EXPECTED.map((e) => [e.id, e] as const))('%s has the values of its source and says how sure they are', (_id, expected) => {
    const preset = findPreset(expected.id)!;
    expect(preset, expected.source).toBeDefined();
    expect([...preset.frequencyHz]).toEqual(expected.frequencyHz);
    expect([...preset.levelDbuV]).toEqual(expected.levelDbuV);
    expect(preset.status).toBe(expected.status);
    expect(preset.detector).toBe(expected.id.endsWith('-qp') ? 'quasi-peak' : 'average');
    expect(preset.equipmentClass).toBe(expected.id.includes('-class-a-') ? 'A' : 'B');
  });

  it('ships nothing that references.md marks M or unverified (CISPR 25, CISPR 11 class A above 20 kVA)', () => {
    for (const preset of LIMIT_PRESETS) {
      expect(['V', 'V2']).toContain(preset.status);
      expect(preset.id).not.toMatch(/cispr-?25|kva|heavy/iu);
      expect(`${preset.standard} ${preset.clause}`).not.toMatch(/CISPR 25|above 20 kVA|> ?20 kVA/u);
    }
  });

  it('every preset names its standard, edition, clause and status', () => {
    for (const preset of LIMIT_PRESETS) {
      expect(preset.standard.length, preset.id).toBeGreaterThan(5);
      expect(preset.edition.length, preset.id).toBeGreaterThan(3);
      expect(preset.clause.length, preset.id).toBeGreaterThan(5);
      expect(preset.statusNote, preset.id).toMatch(new RegExp(`^${preset.status}\\b`, 'u'));
    }
  });

  it('every preset and every copy validates with limitMaskSchema', () => {
    for (const preset of LIMIT_PRESETS) {
      const asMask = { id: preset.id, name: preset.name, detector: preset.detector, frequencyHz: [...preset.frequencyHz], levelDbuV: [...preset.levelDbuV] };
      expect(limitMaskSchema.safeParse(asMask).success, preset.id).toBe(true);
      const copy = copyPreset(preset.id);
      const parsed = limitMaskSchema.safeParse(copy);
      expect(parsed.success, `${preset.id}: ${parsed.error?.message ?? ''}`).toBe(true);
    }
  });

  it('the CISPR presets give the FCC numbers at the interpolated check points (references.md §1.2, C, from the V FCC table)', () => {
    for (const prefix of ['cispr22', 'cispr32', 'cispr11-group-1']) {
      expect(Math.abs(limitAt(findPreset(`${prefix}-class-b-qp`)!, 0.3 * MHz)! - 60.2428)).toBeLessThanOrEqual(1e-3);
      expect(Math.abs(limitAt(findPreset(`${prefix}-class-b-av`)!, 0.2 * MHz)! - 53.6106)).toBeLessThanOrEqual(1e-3);
      expect(limitAt(findPreset(`${prefix}-class-a-qp`)!, 0.5 * MHz)).toBe(73);
    }
  });
});

describe('presets are frozen; copies are the design’s own', () => {
  it('the list, each preset and its arrays are frozen', () => {
    expect(Object.isFrozen(LIMIT_PRESETS)).toBe(true);
    for (const preset of LIMIT_PRESETS) {
      expect(Object.isFrozen(preset)).toBe(true);
      expect(Object.isFrozen(preset.frequencyHz)).toBe(true);
      expect(Object.isFrozen(preset.levelDbuV)).toBe(true);
    }
    const preset = findPreset('fcc-15.107-class-b-qp')!;
    // Modules run in strict mode: writing to a frozen object throws.
    expect(() => {
      (preset.levelDbuV as number[])[0] = 99;
    }).toThrow(TypeError);
    expect(() => {
      (preset as { name: string }).name = 'changed';
    }).toThrow(TypeError);
    expect(() => {
      (LIMIT_PRESETS as LimitPreset[]).pop();
    }).toThrow(TypeError);
    expect(preset.levelDbuV[0]).toBe(66);
  });

  it('changing a copy never changes the preset or another copy', () => {
    const preset = findPreset('fcc-15.107-class-b-qp')!;
    const before = { frequencyHz: [...preset.frequencyHz], levelDbuV: [...preset.levelDbuV], name: preset.name };
    const copy = copyPreset('fcc-15.107-class-b-qp');
    const other = copyPreset('fcc-15.107-class-b-qp');
    copy.levelDbuV[0] = 60;
    copy.levelDbuV.push(70);
    copy.frequencyHz.push(40e6);
    copy.name = 'Internal: 6 dB below class B';
    expect([...preset.frequencyHz]).toEqual(before.frequencyHz);
    expect([...preset.levelDbuV]).toEqual(before.levelDbuV);
    expect(preset.name).toBe(before.name);
    expect(other.levelDbuV).toEqual(before.levelDbuV);
    expect(other.frequencyHz).not.toBe(copy.frequencyHz);
  });

  it('a copy carries the preset’s id (or the one asked for), name and detector, and an origin naming standard and clause', () => {
    const copy = copyPreset('fcc-15.107-class-a-av');
    expect(copy).toMatchObject({ id: 'fcc-15.107-class-a-av', detector: 'average' });
    expect(copy.origin).toContain('47 CFR Part 15');
    expect(copy.origin).toContain('§15.107(b)');
    expect(copy.origin).toContain('values from the published table');
    expect(copyPreset('cispr32-class-b-qp').origin).toContain('values from a secondary source: check against the standard before relying on it');
    for (const preset of LIMIT_PRESETS) expect(copyPreset(preset.id).origin!).not.toMatch(/status V|not confirmed/u);
    expect(copyPreset('cispr22-class-b-qp', 'cispr22-b-qp-2').id).toBe('cispr22-b-qp-2');
    for (const preset of LIMIT_PRESETS) {
      const origin = copyPreset(preset.id).origin!;
      expect(origin).toContain(preset.standard);
      expect(origin).toContain(preset.clause);
      expect(origin.length).toBeLessThanOrEqual(500);
    }
  });

  it('an unknown id is refused with the known ids', () => {
    expect(() => copyPreset('cispr25-class-5-av')).toThrow(/no limit preset "cispr25-class-5-av" \(known: fcc-15\.107-class-b-qp/u);
    expect(findPreset('cispr25-class-5-av')).toBeUndefined();
  });
});

describe('docs/limits.md lists every preset', () => {
  const doc = readFileSync(new URL('../../docs/limits.md', import.meta.url), 'utf8');
  const cells = (line: string): string[] =>
    line
      .trim()
      .replace(/^\||\|$/gu, '')
      .split('|')
      .map((cell) => cell.trim());
  // Tables whose first header cell is "preset": contiguous lines starting with "|".
  const tables: string[][][] = [];
  let current: string[] = [];
  for (const line of [...doc.split('\n'), '']) {
    if (line.trim().startsWith('|')) current.push(line);
    else {
      if (current.length > 2 && cells(current[0]!)[0] === 'preset') tables.push(current.slice(2).map(cells));
      current = [];
    }
  }
  const byId = new Map(
    tables.flat().flatMap((row) => {
      const id = /^`([^`]+)`$/u.exec(row[0] ?? '')?.[1];
      return id === undefined ? [] : [[id, row] as const];
    }),
  );

  it('one row per preset with its standard, edition, clause, detector and status, and no row for anything else', () => {
    for (const preset of LIMIT_PRESETS) {
      const row = byId.get(preset.id);
      expect(row, `docs/limits.md has no row for \`${preset.id}\``).toBeDefined();
      const [, standard, edition, clause, detector, status] = row!;
      expect(standard, preset.id).toBe(preset.standard);
      expect(edition, preset.id).toBe(preset.edition);
      expect(clause, preset.id).toBe(preset.clause);
      expect(detector, preset.id).toBe(`\`${preset.detector}\``);
      expect(status, preset.id).toBe(preset.status);
    }
    expect(tables.length).toBeGreaterThan(0);
    expect([...byId.keys()].filter((id) => !findPreset(id))).toEqual([]);
  });
});
