import { readFileSync } from 'node:fs';
import { readScanText } from '../../src/io/scan-csv.ts';
import type { Design, DesignInput } from '../../src/model/design.ts';
import { requireDesign } from '../../src/model/read-design.ts';
import type { Scan } from '../../src/spectrum/spectrum-types.ts';

/** The invented demo (docs/emissions.md): the two-stage adapter filter and its invented no-filter line-1 scan. */
export const demoInput = JSON.parse(readFileSync(new URL('../../fixtures/demo/adapter-two-stage.design.json', import.meta.url), 'utf8')) as DesignInput;

export function demoDesign(): Design {
  return requireDesign(demoInput);
}

export function demoScan(): Scan {
  const read = readScanText(readFileSync(new URL('../../fixtures/scans/invented-adapter-no-filter.csv', import.meta.url), 'utf8'), {
    tag: 'line1',
    name: 'invented-adapter-no-filter.csv',
  });
  if (!read.ok) throw new Error(read.error.message);
  return read.scan;
}
