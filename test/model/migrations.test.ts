import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { DESIGN_VERSION } from '../../src/model/design-schema.ts';
import { migrateDesign } from '../../src/model/migrations.ts';
import { readDesignJson } from '../../src/model/read-design.ts';

/**
 * Every older design version keeps opening, and means what it meant. Each migration step has a
 * test here with a file kept at its old version in fixtures/migrations/.
 */

const read = (path: string): string => readFileSync(new URL(`../../fixtures/${path}`, import.meta.url), 'utf8');

describe('version 1 → 2', () => {
  const v1Text = read('migrations/v1-engineering-notation.design.json');
  const v2Text = read('examples/engineering-notation.design.json');

  it('the kept file really is version 1', () => {
    expect((JSON.parse(v1Text) as { version: unknown }).version).toBe(1);
    expect(DESIGN_VERSION).toBe(2);
  });

  it('a version-1 file reads as the same design as its version-2 twin', () => {
    const v1 = readDesignJson(v1Text);
    const v2 = readDesignJson(v2Text);
    if (!v1.ok || !v2.ok) throw new Error('both files must read');
    expect(v1.value.version).toBe(2);
    expect(v1.value).toEqual(v2.value);
  });

  it('changes only the version number of the document', () => {
    const document = JSON.parse(v1Text) as Record<string, unknown>;
    const migrated = migrateDesign(document);
    if (!migrated.ok) throw new Error(migrated.error.message);
    expect(migrated.value).toEqual({ ...document, version: 2 });
    expect(document['version']).toBe(1);
  });

  it('a version newer than this program is refused by name, not half-read', () => {
    const migrated = migrateDesign({ ...(JSON.parse(v2Text) as Record<string, unknown>), version: 3 });
    expect(migrated.ok).toBe(false);
    if (!migrated.ok) expect(migrated.error.issues[0]).toMatchObject({ path: 'version', code: 'unsupported-version' });
  });
});
