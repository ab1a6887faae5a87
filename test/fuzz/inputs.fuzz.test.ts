import fc from 'fast-check';
import { describe, it } from 'vitest';
import { propertySettings } from '../support/property-settings.ts';
import { fuzzRunners } from './fuzz-targets.ts';

/**
 * Every way in, fuzzed: scans, limit masks, impedance tables, Touchstone files, design JSON, share
 * links and command-line arguments, each with inputs built from the format's pieces and edits of the
 * real fixture files. The properties are listed in fuzz-targets.ts. A few hundred cases per format
 * here; `npm run fuzz` runs at least 10 000 per format. Seeded: a failure prints the seed and the
 * shrunk input; replay with CHOKEPOINT_SEED=<seed> (DEVELOPERS.md, "Fuzzing").
 */
const CASES = 300;

describe('every way in, fuzzed (property and mutation)', () => {
  for (const runner of fuzzRunners()) {
    it(`${runner.name}: ${CASES} inputs, nothing thrown, every rejection typed, located and readable`, async () => {
      await fc.assert(runner.property, propertySettings(CASES));
    }, 120_000);
  }
});
