import { DESIGN_VERSION } from './design-schema.ts';
import { ValidationError } from './validation-error.ts';

type Migration = (older: Record<string, unknown>) => Record<string, unknown>;

/**
 * MIGRATIONS[v] turns a version-v document into version v + 1, so files of every earlier version
 * keep opening. Each step is a pure function of the document and says what changed.
 */
const MIGRATIONS: Readonly<Record<number, Migration>> = {
  /**
   * 1 → 2: version 2 only adds optional fields (layout coupling, part models, operating conditions,
   * tolerances, safety inputs; docs/design-format.md lists them). Every version-1 document means
   * the same in version 2, so the step changes nothing but the number.
   */
  1: (older) => ({ ...older }),
};

export function migrateDesign(
  document: Record<string, unknown>,
): { ok: true; value: Record<string, unknown> } | { ok: false; error: ValidationError } {
  const version = document['version'];
  if (typeof version !== 'number' || !Number.isInteger(version) || version < 1) {
    return refuse(`expected a whole version number from 1 to ${DESIGN_VERSION}, got ${JSON.stringify(version) ?? 'nothing'}`);
  }
  if (version > DESIGN_VERSION) {
    return refuse(`version ${version} is newer than this program understands (${DESIGN_VERSION}); update chokepoint`);
  }
  let current = document;
  for (let v = version; v < DESIGN_VERSION; v += 1) {
    const step = MIGRATIONS[v];
    if (!step) return refuse(`no migration from version ${v}`);
    current = { ...step(current), version: v + 1 };
  }
  return { ok: true, value: current };
}

function refuse(message: string): { ok: false; error: ValidationError } {
  return { ok: false, error: new ValidationError('invalid design', [{ path: 'version', code: 'unsupported-version', message }]) };
}
