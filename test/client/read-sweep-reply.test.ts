import { describe, expect, it } from 'vitest';
import { readSweepReply } from '../../src/client/read-sweep-reply.ts';
import { sweepApi } from '../../workers/sweep-api.ts';
import type { SweepSuccess } from '../../workers/sweep-protocol.ts';

const design = {
  format: 'chokepoint-design',
  version: 2,
  name: 'tiny',
  frequencyPlan: { startHz: 1e5, stopHz: 1e6, pointsPerDecade: 5 },
  noiseSource: {
    commonMode: { impedance: { kind: 'resistor', resistance: 50 } },
    differentialMode: { impedance: { kind: 'resistor', resistance: 100 } },
  },
  receivers: { line1: { kind: 'resistive' }, line2: { kind: 'resistive' } },
  stages: [],
};

function goodReply(requestId = 5): SweepSuccess {
  const reply = sweepApi.sweep({ requestId, design });
  if (!reply.ok) throw new Error(reply.error.message);
  return reply;
}

function issuePaths(outcome: ReturnType<typeof readSweepReply>): string[] {
  if (outcome.status !== 'error') throw new Error(`expected an error, got ${outcome.status}`);
  expect(outcome.error.kind).toBe('worker-failure');
  expect(outcome.error.message).toMatch(/^the sweep worker sent a malformed reply: /u);
  return outcome.error.issues.map((issue) => issue.path);
}

describe('readSweepReply', () => {
  it('passes a good result through untouched, extra fields and all', () => {
    const reply = goodReply();
    const outcome = readSweepReply(reply, 5);
    expect(outcome.status === 'done' && outcome.result).toBe(reply.result);
    expect(outcome).toMatchObject({ status: 'done', requestId: 5, elapsedMs: reply.elapsedMs });
  });

  it('passes a refusal through with its issues', () => {
    const reply = sweepApi.sweep({ requestId: 2, design: { ...design, name: '' } });
    const outcome = readSweepReply(reply, 2);
    expect(outcome).toMatchObject({ status: 'error', error: { kind: 'invalid-design', issues: [expect.objectContaining({ path: 'name' })] } });
  });

  it('refuses a reply for another request', () => {
    expect(issuePaths(readSweepReply(goodReply(5), 6))).toEqual(['requestId']);
  });

  it('names the column whose length does not match the frequency axis', () => {
    const reply = goodReply();
    const columns = { ...reply.result.columns, transferDm: new Float64Array(1) };
    expect(issuePaths(readSweepReply({ ...reply, result: { ...reply.result, columns } }, 5))).toEqual(['result.columns.transferDm']);
  });

  it('names a field of the wrong type', () => {
    const reply = goodReply();
    const broken = { ...reply, result: { ...reply.result, frequencyHz: [1, 2, 3] } };
    expect(issuePaths(readSweepReply(broken, 5))).toContain('result.frequencyHz');
  });

  it('refuses something that is not a reply at all', () => {
    expect(issuePaths(readSweepReply(undefined, 1))).toEqual(['']);
    expect(issuePaths(readSweepReply({ ok: 'yes' }, 1))).toEqual(['ok']);
  });
});
