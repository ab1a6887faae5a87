// @vitest-environment node
import { describe, expect, it } from 'vitest';
import { readDesign } from '../../../src/model/index.ts';
import { findPreset, LIMIT_PRESETS } from '../../../src/spectrum/limit-presets.ts';
import {
  addPresetMask,
  emissionsOf,
  masksOf,
  presetGroups,
  readNumberInput,
  removeMask,
  setAttribution,
  uniqueMaskId,
  withEmissions,
} from '../../../src/ui/emissions/emissions-state.ts';
import { emissionsDesignDocument } from '../support/emissions-fixtures.ts';

describe('design edits from the emissions section', () => {
  it('adds a copy of a preset: the design owns its points, the catalogue stays as it was', () => {
    const before = emissionsDesignDocument({ masks: [] });
    const preset = findPreset('cispr32-class-a-qp')!;
    const after = addPresetMask(before, 'cispr32-class-a-qp');
    const [mask] = masksOf(after) as { id: string; frequencyHz: number[]; origin: string }[];
    expect(mask).toMatchObject({ id: 'cispr32-class-a-qp', name: preset.name, detector: 'quasi-peak', levelDbuV: [...preset.levelDbuV] });
    expect(mask?.frequencyHz).not.toBe(preset.frequencyHz);
    expect(mask?.origin).toContain('CISPR 32');
    mask!.frequencyHz[0] = 1;
    expect(preset.frequencyHz[0]).toBe(150e3);
    expect(Object.isFrozen(preset)).toBe(true);
    // The document it started from is untouched, and the new one reads as a design.
    expect(masksOf(before)).toEqual([]);
    expect(readDesign(after).ok).toBe(true);
  });

  it('gives a second copy of one preset its own id', () => {
    const twice = addPresetMask(addPresetMask(emissionsDesignDocument({ masks: [] }), 'fcc-15.107-class-b-qp'), 'fcc-15.107-class-b-qp');
    expect((masksOf(twice) as { id: string }[]).map((m) => m.id)).toEqual(['fcc-15.107-class-b-qp', 'fcc-15.107-class-b-qp-2']);
    expect(readDesign(twice).ok).toBe(true);
    expect(uniqueMaskId(['a', 'a-2'], 'a')).toBe('a-3');
  });

  it('removes a mask by id and keeps the others', () => {
    const after = removeMask(emissionsDesignDocument(), 'fcc-15.107-class-b-qp');
    expect((masksOf(after) as { id: string }[]).map((m) => m.id)).toEqual(['fcc-15.107-class-b-av']);
  });

  it('sets and clears emissions fields, and adds an emissions block to a design without one', () => {
    const document = emissionsDesignDocument();
    expect(emissionsOf(setAttribution(document, 'common-mode'))['attribution']).toBe('common-mode');
    expect(emissionsOf(withEmissions(document, { noiseFloorDbuV: undefined }))).not.toHaveProperty('noiseFloorDbuV');
    expect(emissionsOf(withEmissions(document, { targetMarginDb: 3 }))['targetMarginDb']).toBe(3);
    const { emissions: _unused, ...bare } = document;
    expect(emissionsOf(withEmissions(bare, { targetMarginDb: 3 }))).toEqual({ targetMarginDb: 3 });
    expect(emissionsOf(document)['targetMarginDb']).toBe(6);
  });

  it('reads number fields: bounds, empty when optional, a decimal comma', () => {
    const margin = { min: -40, max: 60, optional: false };
    expect(readNumberInput(' 4,5 ', 'Target margin', margin)).toEqual({ ok: true, value: 4.5 });
    expect(readNumberInput('', 'Target margin', margin)).toEqual({ ok: false, message: 'Target margin: enter a number' });
    expect(readNumberInput('99', 'Target margin', margin)).toEqual({ ok: false, message: 'Target margin: from -40 to 60' });
    expect(readNumberInput('six', 'Target margin', margin)).toEqual({ ok: false, message: 'Target margin: “six” is not a number' });
    expect(readNumberInput('', 'Noise floor', { min: -200, max: 300, optional: true })).toEqual({ ok: true, value: undefined });
  });

  it('offers every preset, grouped by standard', () => {
    const groups = presetGroups();
    expect(groups.flatMap((g) => g.presets)).toHaveLength(LIMIT_PRESETS.length);
    expect(groups.map((g) => g.standard)).toContain('47 CFR Part 15 (FCC), §15.107 Conducted limits');
  });
});
