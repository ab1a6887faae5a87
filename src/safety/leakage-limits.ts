import type { LeakageLimitId } from '../model/safety-schema.ts';
import { type Confirmation, type SourceNote, sourceNote } from './source-confirmation.ts';

/**
 * Commonly used leakage (touch) current limits, each with its standard, clause and how sure the
 * value is. The values were read in secondary sources (forum and mailing-list reproductions of the
 * clause lists, medical-device service manuals) or are quoted from memory; none was read in the
 * standard itself, and every result that uses one says so. A user with the standard at hand enters
 * the value instead (safety.leakageLimit of kind "entered-limit").
 */

export interface LeakageLimit {
  readonly id: LeakageLimitId;
  /** What the limit is for, in plain words. */
  readonly name: string;
  /** The limit in normal condition, A rms. */
  readonly normalConditionA: number;
  /** The limit in single-fault condition, when this source gives a separate one. */
  readonly singleFaultA?: number;
  readonly source: SourceNote;
  /** Anything a user must know about using this value. */
  readonly note?: string;
}

const mA = 1e-3;

function limit(
  id: LeakageLimitId,
  name: string,
  normalConditionMa: number,
  standard: string,
  clause: string,
  confirmation: Confirmation,
  extra: { singleFaultMa?: number; note?: string } = {},
): LeakageLimit {
  return {
    id,
    name,
    normalConditionA: normalConditionMa * mA,
    ...(extra.singleFaultMa === undefined ? {} : { singleFaultA: extra.singleFaultMa * mA }),
    source: sourceNote(standard, clause, confirmation),
    ...(extra.note === undefined ? {} : { note: extra.note }),
  };
}

const IEC60335 = 'IEC 60335-1 (ed. 4/5)';
const IEC60950 = 'IEC 60950-1 (withdrawn; replaced by IEC 62368-1)';
const WITHDRAWN = 'IEC 60950-1 has been withdrawn and replaced by IEC 62368-1; use it only where it still applies.';

export const LEAKAGE_LIMITS: readonly LeakageLimit[] = [
  limit('iec60335-1-class-ii', 'household appliance, class II', 0.25, IEC60335, 'cl. 13.2', 'secondary-source'),
  limit('iec60335-1-class-0-0i-iii', 'household appliance, class 0, 0I or III', 0.5, IEC60335, 'cl. 13.2', 'secondary-source'),
  limit('iec60335-1-class-i-portable', 'household appliance, class I, portable', 0.75, IEC60335, 'cl. 13.2', 'secondary-source'),
  limit('iec60335-1-class-i-stationary-motor', 'household appliance, class I, stationary, motor-operated', 3.5, IEC60335, 'cl. 13.2', 'secondary-source'),
  limit('iec60335-1-class-i-stationary-heating', 'household appliance, class I, stationary heating', 0.75, IEC60335, 'cl. 13.2', 'secondary-source', {
    note: 'the clause allows 0.75 mA or 0.75 mA per kW of rated power input, whichever is greater, up to 5 mA: for a heater above 1 kW enter that value instead',
  }),
  limit('iec60950-1-not-earthed', 'IT equipment, parts not connected to protective earth (class II)', 0.25, IEC60950, 'Table 5A', 'secondary-source', { note: WITHDRAWN }),
  limit('iec60950-1-class-i-hand-held', 'IT equipment, class I, hand-held', 0.75, IEC60950, 'Table 5A', 'secondary-source', { note: WITHDRAWN }),
  limit('iec60950-1-class-i-pluggable-a', 'IT equipment, class I, other pluggable type A', 3.5, IEC60950, 'Table 5A', 'secondary-source', {
    note: `${WITHDRAWN} Above 3.5 mA the standard allows more only with a protective-conductor current of at most 5 % of the input current and a "high leakage current" label (cl. 5.1.7).`,
  }),
  limit('iec62368-1-class-i-pluggable-a', 'audio/video and IT equipment, class I, pluggable type A (protective-conductor current)', 3.5, 'IEC 62368-1', 'cl. 5.7 (clause not confirmed)', 'not-confirmed'),
  limit('iec62368-1-es1', 'audio/video and IT equipment, touch current of an ES1 part (up to 1 kHz)', 0.5, 'IEC 62368-1', 'cl. 5.2.2, Table 4', 'not-confirmed'),
  limit('iec60601-1-touch', 'medical electrical equipment, enclosure (touch) current', 0.1, 'IEC 60601-1 (edition not stated by the source)', 'touch current', 'secondary-source', {
    singleFaultMa: 0.5,
  }),
  limit('iec60601-1-earth-2nd-edition', 'medical electrical equipment, earth leakage current (2nd edition)', 0.5, 'IEC 60601-1 (2nd edition: not confirmed)', 'earth leakage current', 'secondary-source', {
    singleFaultMa: 1,
    note: 'the values are from service manuals; that they are those of the 2nd edition is not confirmed',
  }),
  limit('iec60601-1-2005-earth', 'medical electrical equipment, earth leakage current (3rd edition, 2005)', 5, 'IEC 60601-1:2005', 'Table 3', 'not-confirmed', { singleFaultMa: 10 }),
];

export function findLeakageLimit(id: LeakageLimitId): LeakageLimit {
  const found = LEAKAGE_LIMITS.find((l) => l.id === id);
  if (!found) throw new Error(`no leakage limit "${id}"`);
  return found;
}
