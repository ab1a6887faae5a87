import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import { SWEEP_COLUMNS, sweepDesign, type SweepResult } from '../../src/engine/index.ts';
import {
  exportColumns,
  POINT_COLUMNS,
  pointFlagNames,
  pointOriginName,
  ROWS_PER_CHUNK,
  type SweepJson,
  sweepCsvChunks,
  sweepJsonChunks,
  sweepToCsv,
  sweepToJson,
} from '../../src/io/sweep-export.ts';
import { buildDesign, capacitor, element, inductor } from '../support/design-builders.ts';

/** A small two-stage LC filter with parasitics: resonances, refined extrema, a few hundred points. */
function sweep(): SweepResult {
  const design = buildDesign({
    elements: [
      element('line-to-line', capacitor(100e-9, { esl: 10e-9, esr: 0.03 })),
      element('series-line1', inductor(100e-6, { dcr: 0.05, windingCapacitance: 5e-12 })),
      element('series-line2', inductor(120e-6, { dcr: 0.05, windingCapacitance: 4e-12 })),
      element('line1-to-ground', capacitor(2.2e-9, { esl: 6e-9, esr: 0.2 })),
      element('line2-to-ground', capacitor(2.2e-9)),
    ],
    frequencyPlan: { startHz: 9e3, stopHz: 30e6, pointsPerDecade: 40 },
  });
  return sweepDesign(design);
}

const result = sweep();

function parseCsv(text: string): string[][] {
  const parsed = Papa.parse<string[]>(text.trimEnd(), { delimiter: ',', header: false });
  expect(parsed.errors).toEqual([]);
  return parsed.data;
}

function phaseOf(id: 'line1FromCm' | 'line2FromCm' | 'line1FromDm' | 'line2FromDm', i: number): number {
  const t = result.transfers[id];
  return (Math.atan2(t.im[i]!, t.re[i]!) * 180) / Math.PI;
}

describe('sweep export as CSV', () => {
  it('has a header with units and parses back to exactly the engine’s numbers', () => {
    const rows = parseCsv(sweepToCsv(result));
    const header = rows[0]!;
    expect(header).toEqual([
      'frequency_Hz',
      'cm_insertion_loss_50ohm_dB',
      'dm_insertion_loss_50ohm_dB',
      'cm_insertion_loss_in_circuit_dB',
      'dm_insertion_loss_in_circuit_dB',
      'line1_from_cm_dB',
      'line1_from_cm_deg',
      'line2_from_cm_dB',
      'line2_from_cm_deg',
      'line1_from_dm_dB',
      'line1_from_dm_deg',
      'line2_from_dm_dB',
      'line2_from_dm_deg',
      'point_origin',
      'point_flags',
    ]);
    expect(rows).toHaveLength(result.frequencyHz.length + 1);
    const column = (name: string): number[] => rows.slice(1).map((row) => Number(row[header.indexOf(name)]));
    expect(column('frequency_Hz')).toEqual(Array.from(result.frequencyHz));
    expect(column('cm_insertion_loss_50ohm_dB')).toEqual(Array.from(result.columns.insertionLoss50Cm));
    expect(column('dm_insertion_loss_in_circuit_dB')).toEqual(Array.from(result.columns.insertionLossInCircuitDm));
    expect(column('line2_from_dm_dB')).toEqual(Array.from(result.columns.line2FromDm));
    expect(column('line1_from_cm_deg')).toEqual(Array.from(result.frequencyHz, (_, i) => phaseOf('line1FromCm', i)));
    expect(column('line2_from_dm_deg')).toEqual(Array.from(result.frequencyHz, (_, i) => phaseOf('line2FromDm', i)));
    const origins = rows.slice(1).map((row) => row[header.indexOf('point_origin')]);
    expect(origins).toEqual(Array.from(result.pointOrigin, pointOriginName));
    expect(new Set(origins)).toEqual(new Set(['grid', 'element-resonance', 'response-extremum']));
  });

  it('with every column: one per engine column plus the four line phases, all round-tripping', () => {
    const rows = parseCsv(sweepToCsv(result, { columns: 'all' }));
    const header = rows[0]!;
    expect(header).toHaveLength(1 + SWEEP_COLUMNS.length + 4 + POINT_COLUMNS.length);
    const columns = exportColumns('all');
    expect(header.slice(0, columns.length)).toEqual(columns.map((c) => c.name));
    for (const info of SWEEP_COLUMNS) {
      const name = columns.find((c) => c.label === info.label)!.name;
      const values = rows.slice(1).map((row) => Number(row[header.indexOf(name)]));
      expect(values, name).toEqual(Array.from(result.columns[info.id]));
    }
  });

  it('names columns uniquely in snake_case with the unit last', () => {
    const names = exportColumns('all').map((c) => c.name);
    expect(new Set(names).size).toBe(names.length);
    for (const column of exportColumns('all')) {
      const suffix = { Hz: '_Hz', dB: '_dB', 'Ω': '_ohm', '°': '_deg' }[column.unit];
      expect(column.name).toMatch(/^[a-z0-9_]+_(Hz|dB|ohm|deg)$/u);
      expect(column.name.endsWith(suffix)).toBe(true);
    }
  });

  it('writes point flags by name', () => {
    expect(pointFlagNames(0)).toEqual([]);
    expect(pointFlagNames(1 | 4)).toEqual(['ideal-resonance-limited', 'not-finite']);
  });
});

describe('sweep export as JSON', () => {
  it('survives JSON text unchanged, with columns, data, warnings and resonances', () => {
    const exported = sweepToJson(result, { generator: 'chokepoint test' });
    const back = JSON.parse(JSON.stringify(exported)) as SweepJson;
    expect(back).toEqual(exported);
    expect(back).toMatchObject({ format: 'chokepoint-sweep', version: 1, generator: 'chokepoint test', designName: 'test design' });
    expect(back.pointCount).toBe(result.frequencyHz.length);
    expect(back.columns.map((c) => c.name)).toEqual(exportColumns().map((c) => c.name));
    expect(back.data['frequency_Hz']).toEqual(Array.from(result.frequencyHz));
    expect(back.data['cm_insertion_loss_50ohm_dB']).toEqual(Array.from(result.columns.insertionLoss50Cm));
    expect(back.data['line1_from_dm_deg']).toEqual(Array.from(result.frequencyHz, (_, i) => phaseOf('line1FromDm', i)));
    expect(back.warnings).toEqual(result.warnings);
    expect(back.warnings.some((w) => w.code === 'ideal-part')).toBe(true);
    expect(back.resonances).toEqual(result.resonances);
    expect(back.pointOrigin).toHaveLength(result.frequencyHz.length);
    expect(back.columns[1]).toEqual({
      name: 'cm_insertion_loss_50ohm_dB',
      unit: 'dB',
      label: SWEEP_COLUMNS[0].label,
      description: SWEEP_COLUMNS[0].description,
    });
  });

  it('holds every engine column with "all"', () => {
    const exported = sweepToJson(result, { columns: 'all' });
    expect(Object.keys(exported.data)).toHaveLength(1 + SWEEP_COLUMNS.length + 4);
    expect(exported.data['dm_input_impedance_ohm']).toEqual(Array.from(result.columns.inputImpedanceDmOhm));
  });
});

describe('sweep export in pieces (streamed by chokepoint sweep)', () => {
  it('the CSV pieces join to the whole, each piece whole lines, at most ROWS_PER_CHUNK rows', () => {
    const pieces = [...sweepCsvChunks(result, { columns: 'all' })];
    expect(pieces.join('')).toBe(sweepToCsv(result, { columns: 'all' }));
    expect(pieces.length).toBe(1 + Math.ceil(result.frequencyHz.length / ROWS_PER_CHUNK));
    for (const piece of pieces) expect(piece.endsWith('\n')).toBe(true);
    for (const piece of pieces.slice(1)) expect(piece.split('\n').length - 1).toBeLessThanOrEqual(ROWS_PER_CHUNK);
  });

  it('the JSON pieces are, to the byte, JSON.stringify of the object form', () => {
    for (const columns of ['standard', 'all'] as const) {
      const text = [...sweepJsonChunks(result, { columns, generator: 'chokepoint test' })].join('');
      expect(text).toBe(JSON.stringify(sweepToJson(result, { columns, generator: 'chokepoint test' })));
    }
  });

  it('a sweep longer than one piece: many pieces, still the same text; NaN is written as null as JSON.stringify does', () => {
    const long = sweepDesign(
      buildDesign({
        elements: [element('line-to-line', capacitor(100e-9, { esl: 10e-9, esr: 0.03 })), element('series-line1', inductor(100e-6, { dcr: 0.05 }))],
        frequencyPlan: { startHz: 9e3, stopHz: 30e6, pointsPerDecade: 2000 },
      }),
      { refine: false },
    );
    expect(long.frequencyHz.length).toBeGreaterThan(3 * ROWS_PER_CHUNK);
    const pieces = [...sweepJsonChunks(long)];
    expect(pieces.length).toBeGreaterThan(3 * 13);
    expect(pieces.join('')).toBe(JSON.stringify(sweepToJson(long)));
    const withNaN: SweepResult = { ...long, frequencyHz: Float64Array.from(long.frequencyHz, (f, i) => (i === 5 ? Number.NaN : f)) };
    expect((JSON.parse([...sweepJsonChunks(withNaN)].join('')) as SweepJson).data['frequency_Hz']![5]).toBeNull();
  });
});
