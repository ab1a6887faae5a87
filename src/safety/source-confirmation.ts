/**
 * How sure a value is, told to the user in plain words. Every limit, requirement and rating the
 * checks use carries one, and a result repeats it wherever such a value decides a verdict.
 */

export type Confirmation = 'published-text' | 'secondary-source' | 'not-confirmed' | 'common-practice';

export const CONFIRMATION_WORDS: Readonly<Record<Confirmation, string>> = {
  'published-text': 'from the published text of the standard or a faithful reproduction of it',
  'secondary-source': 'from a secondary source: check it against the standard before relying on it',
  'not-confirmed': 'not confirmed: quoted from memory; check it against the standard, do not rely on it as it is',
  'common-practice': 'common engineering practice, no single published source',
};

/** Where a value that decides a verdict comes from. */
export interface SourceNote {
  /** "IEC 60335-1". */
  readonly standard: string;
  /** "cl. 13.2", "Table 5A"; '' when the clause is not known. */
  readonly clause: string;
  readonly confirmation: Confirmation;
  /** CONFIRMATION_WORDS[confirmation], so a renderer needs no table. */
  readonly confirmationText: string;
}

export function sourceNote(standard: string, clause: string, confirmation: Confirmation): SourceNote {
  return { standard, clause, confirmation, confirmationText: CONFIRMATION_WORDS[confirmation] };
}

/** "IEC 60335-1 cl. 13.2 (from a secondary source: …)". */
export function describeSource(source: SourceNote): string {
  const where = source.clause === '' ? source.standard : `${source.standard} ${source.clause}`;
  return `${where} (${source.confirmationText})`;
}
