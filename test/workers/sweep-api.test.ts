import { describe, expect, it } from 'vitest';
import demo from '../../fixtures/demo/adapter-two-stage.design.json';
import { SWEEP_COLUMNS, transferables } from '../../src/engine/index.ts';
import { sweepApi } from '../../workers/sweep-api.ts';
import type { SweepFailure, SweepReply, SweepSuccess } from '../../workers/sweep-protocol.ts';

function expectFailure(reply: SweepReply): SweepFailure {
  if (reply.ok) throw new Error('expected the request to be refused');
  return reply;
}

function expectSuccess(reply: SweepReply): SweepSuccess {
  if (!reply.ok) throw new Error(`expected a result, got: ${reply.error.message}`);
  return reply;
}

const smallDesign = {
  format: 'chokepoint-design',
  version: 2,
  name: 'one X capacitor',
  frequencyPlan: { startHz: '150 kHz', stopHz: '30 MHz', pointsPerDecade: 20 },
  noiseSource: {
    commonMode: { impedance: { kind: 'resistor', resistance: 50 } },
    differentialMode: { impedance: { kind: 'resistor', resistance: 100 } },
  },
  receivers: { line1: { kind: 'resistive' }, line2: { kind: 'resistive' } },
  stages: [{ id: 's1', elements: [{ id: 'CX', placement: 'line-to-line', part: { kind: 'capacitor', capacitance: '100 nF', esl: '10 nH' } }] }],
};

describe('sweepApi.sweep', () => {
  it.each([
    ['not an object', 'hello', null, ''],
    ['a missing request id', { design: smallDesign }, null, 'requestId'],
    ['a negative request id', { requestId: -1, design: smallDesign }, null, 'requestId'],
    ['a fractional request id', { requestId: 1.5, design: smallDesign }, null, 'requestId'],
    ['a wrong option type', { requestId: 4, design: smallDesign, options: { refine: 'yes' } }, 4, 'options.refine'],
    ['an unknown option', { requestId: 5, design: smallDesign, options: { fast: true } }, 5, 'options'],
  ])('refuses %s without throwing, naming the field', (_what, request, requestId, path) => {
    const reply = expectFailure(sweepApi.sweep(request));
    expect(reply.requestId).toBe(requestId);
    expect(reply.error.kind).toBe('invalid-request');
    expect(reply.error.message).toMatch(/^invalid sweep request/u);
    expect(reply.error.issues.map((issue) => issue.path)).toContain(path);
  });

  it('refuses an invalid design with the paths of the bad fields', () => {
    const broken = structuredClone(smallDesign);
    broken.stages[0]!.elements[0]!.part.capacitance = '-3 nF';
    const reply = expectFailure(sweepApi.sweep({ requestId: 7, design: broken }));
    expect(reply.requestId).toBe(7);
    expect(reply.error.kind).toBe('invalid-design');
    expect(reply.error.issues).toEqual([expect.objectContaining({ path: 'stages[0].elements[0].part.capacitance', code: 'out-of-range' })]);
    expect(reply.error.message).toContain('stages[0].elements[0].part.capacitance');
  });

  it('refuses a request without a design as a malformed request', () => {
    const reply = expectFailure(sweepApi.sweep({ requestId: 8 }));
    expect(reply.error).toEqual({
      kind: 'invalid-request',
      message: 'invalid sweep request: design: missing',
      issues: [{ path: 'design', code: 'missing-field', message: 'missing' }],
    });
  });

  it('says what it got when the request is not an object', () => {
    const reply = expectFailure(sweepApi.sweep('hello'));
    expect(reply.error.message).toBe('invalid sweep request: expected object, got "hello"');
  });

  it('refuses a design that is not a design document', () => {
    const reply = expectFailure(sweepApi.sweep({ requestId: 3, design: { format: 'something-else' } }));
    expect(reply.error.kind).toBe('invalid-design');
    expect(reply.error.issues).toEqual([expect.objectContaining({ path: 'format', code: 'not-a-design' })]);
  });

  it('sweeps a valid design into full columns on one frequency axis', () => {
    const reply = expectSuccess(sweepApi.sweep({ requestId: 9, design: smallDesign, options: { refine: false } }));
    expect(reply.requestId).toBe(9);
    expect(reply.elapsedMs).toBeGreaterThanOrEqual(0);
    const { result } = reply;
    expect(result.designName).toBe('one X capacitor');
    expect(result.frequencyHz[0]).toBe(150e3);
    expect(result.frequencyHz[result.frequencyHz.length - 1]).toBe(30e6);
    for (const column of SWEEP_COLUMNS) {
      expect(result.columns[column.id], column.id).toBeInstanceOf(Float64Array);
      expect(result.columns[column.id].length, column.id).toBe(result.frequencyHz.length);
    }
    // An X capacitor does nothing to common mode and attenuates differential mode more with frequency.
    const cm = result.columns.insertionLoss50Cm;
    const dm = result.columns.insertionLoss50Dm;
    expect(Math.max(...cm.map(Math.abs))).toBeLessThan(1e-6);
    expect(dm[dm.length - 1]!).toBeGreaterThan(dm[0]!);
  });

  it('sweeps the invented demo design with element resonances and without failing', () => {
    const reply = expectSuccess(sweepApi.sweep({ requestId: 0, design: demo }));
    expect(reply.result.frequencyHz.length).toBeGreaterThan(400);
    expect(reply.result.resonances.some((mark) => mark.kind === 'element')).toBe(true);
    expect(transferables(reply.result).length).toBeGreaterThan(0);
  });
});
