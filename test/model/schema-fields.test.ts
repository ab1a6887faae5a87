import { describe, expect, it } from 'vitest';
import { capacitorSchema, commonModeChokeSchema, elementSchema, frequencyPlanSchema, partSchema, PLACEMENTS } from '../../src/model/design-schema.ts';
import { limitMaskSchema, trapezoidSchema } from '../../src/model/emissions-schema.ts';
import { describeField, fieldsOf, kindOf } from '../../src/model/schema-fields.ts';

/** The editor's view of the schema must say what the schema does (units, defaults, bounds, kinds). */
describe('fieldsOf reads the schema', () => {
  it('a capacitor: quantities with units and their defaults, the safety class as a choice', () => {
    const fields = fieldsOf(capacitorSchema);
    expect(fields.map((f) => f.name)).toEqual(['kind', 'capacitance', 'esr', 'esl', 'safetyClass', 'ratedVoltage']);
    const byName = new Map(fields.map((f) => [f.name, f]));
    expect(byName.get('kind')?.field).toEqual({ type: 'literal', value: 'capacitor' });
    expect(byName.get('capacitance')).toMatchObject({ field: { type: 'quantity', unit: 'F', rule: 'positive' }, presence: { kind: 'required' } });
    expect(byName.get('esl')).toMatchObject({ field: { type: 'quantity', unit: 'H', rule: 'non-negative' }, presence: { kind: 'default', value: 0 } });
    expect(byName.get('ratedVoltage')).toMatchObject({ field: { type: 'quantity', unit: 'V' }, presence: { kind: 'optional' } });
    const safety = byName.get('safetyClass')?.field;
    expect(safety?.type).toBe('choice');
    if (safety?.type === 'choice') expect(safety.values).toContain('Y2');
  });

  it('a choke: the coupling is a choice of kinds, each an object with its own fields', () => {
    const coupling = fieldsOf(commonModeChokeSchema).find((f) => f.name === 'coupling')!;
    expect(coupling.field.type).toBe('kinds');
    if (coupling.field.type !== 'kinds') return;
    expect([...coupling.field.options.keys()]).toEqual(['leakage-inductance', 'coupling-factor']);
    const factor = fieldsOf(coupling.field.options.get('coupling-factor')!).find((f) => f.name === 'couplingFactor')!;
    expect(factor.field).toMatchObject({ type: 'number', min: 0, max: 1, exclusiveMin: true, exclusiveMax: false });
  });

  it('whole numbers and exclusive bounds', () => {
    const ppd = fieldsOf(frequencyPlanSchema).find((f) => f.name === 'pointsPerDecade')!;
    expect(ppd.field).toMatchObject({ type: 'number', integer: true });
    expect(ppd.presence).toEqual({ kind: 'default', value: 200 });
    const duty = fieldsOf(trapezoidSchema).find((f) => f.name === 'duty')!;
    expect(duty.field).toMatchObject({ type: 'number', min: 0, max: 1, exclusiveMin: true, exclusiveMax: true });
  });

  it('an element (a refined object): placement choices, enabled flag, the part as kinds', () => {
    const fields = fieldsOf(elementSchema);
    const placement = fields.find((f) => f.name === 'placement')!.field;
    expect(placement).toEqual({ type: 'choice', values: [...PLACEMENTS] });
    expect(fields.find((f) => f.name === 'enabled')).toMatchObject({ field: { type: 'boolean' }, presence: { kind: 'default', value: true } });
    const part = describeField(partSchema);
    expect(part.type).toBe('kinds');
    if (part.type === 'kinds') expect([...part.options.keys()]).toContain('common-mode-choke');
  });

  it('lists and text lengths (a limit mask)', () => {
    const fields = new Map(fieldsOf(limitMaskSchema).map((f) => [f.name, f.field]));
    expect(fields.get('frequencyHz')?.type).toBe('list');
    expect(fields.get('name')).toMatchObject({ type: 'text', maxLength: 200 });
  });

  it('kindOf names an object by its kind literal', () => {
    expect(kindOf(capacitorSchema)).toBe('capacitor');
    expect(kindOf(frequencyPlanSchema)).toBeUndefined();
  });
});
