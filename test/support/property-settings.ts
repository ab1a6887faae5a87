import type fc from 'fast-check';

/**
 * Property tests are seeded: the same seed replays the same cases. A failure prints the seed and
 * the shrunk counter-example (fast-check does); rerun with CHOKEPOINT_SEED=<seed> to replay.
 */
const fromEnvironment = Number(process.env['CHOKEPOINT_SEED']);
export const PROPERTY_SEED = Number.isInteger(fromEnvironment) ? fromEnvironment : 20261201;

export function propertySettings(numRuns: number): fc.Parameters<unknown> {
  return { seed: PROPERTY_SEED, numRuns };
}
