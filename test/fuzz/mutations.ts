import fc from 'fast-check';

/**
 * Mutation fuzzing: start from a real file and flip, insert and delete characters, lines and
 * fields. A mutation is plain data (kind, where, what) so that fast-check can shrink a failing list
 * to the few edits that matter and print it; `applyMutations` replays it on the seed.
 */

export type Mutation =
  | { readonly kind: 'flip'; readonly at: number; readonly text: string }
  | { readonly kind: 'insert'; readonly at: number; readonly text: string }
  | { readonly kind: 'delete'; readonly at: number; readonly length: number }
  | { readonly kind: 'delete-line'; readonly line: number }
  | { readonly kind: 'duplicate-line'; readonly line: number }
  | { readonly kind: 'swap-lines'; readonly line: number; readonly other: number }
  | { readonly kind: 'insert-line'; readonly line: number; readonly text: string }
  | { readonly kind: 'replace-field'; readonly line: number; readonly field: number; readonly text: string }
  | { readonly kind: 'delete-field'; readonly line: number; readonly field: number }
  | { readonly kind: 'duplicate-field'; readonly line: number; readonly field: number };

/** Characters and words that readers of these files treat specially. */
const SPECIAL_CHARACTERS = ['\n', '\r', '\r\n', '\t', ' ', ',', ';', '.', '"', "'", '!', '#', '%', '/', '[', ']', '{', '}', ':', '-', '+', 'e', 'E', 'j', '\0', '\uFEFF', '\uFFFD', 'é', 'µ', 'Ω', '\u2028'];
export const SPECIAL_TOKENS = [
  '0',
  '-0',
  '-1',
  '1e309',
  '-1e309',
  '1e-320',
  '5e-324',
  'NaN',
  'Infinity',
  '0x10',
  '1,5',
  '1.5',
  '1e3',
  '9007199254740993',
  '',
  ' ',
  '""',
  '"a,b"',
  'null',
  'true',
  '[]',
  '{}',
  '# Hz S RI R 50',
  '#',
  '[Version] 2.0',
  '[Number of Ports] 2',
  '[Network Data]',
  '[End]',
  '! Port Impedance 50 0',
  'Frequency (MHz),Level (dBuV)',
  'Frequency [Hz];Peak [dBµV]',
  '# detector: quasi-peak',
  '# id: x',
  'MHz',
  'dBm',
  'R (50+50j)',
];

const text = fc.oneof(
  { weight: 3, arbitrary: fc.constantFrom(...SPECIAL_CHARACTERS) },
  { weight: 3, arbitrary: fc.constantFrom(...SPECIAL_TOKENS) },
  { weight: 1, arbitrary: fc.string({ maxLength: 8 }) },
  { weight: 1, arbitrary: fc.string({ maxLength: 4, unit: 'binary' }) },
  { weight: 1, arbitrary: fc.double({ noNaN: false }).map(String) },
);

const where = fc.nat({ max: 1_000_000 });

export const mutationArbitrary: fc.Arbitrary<Mutation> = fc.oneof(
  fc.record({ kind: fc.constant('flip' as const), at: where, text }),
  fc.record({ kind: fc.constant('insert' as const), at: where, text }),
  fc.record({ kind: fc.constant('delete' as const), at: where, length: fc.integer({ min: 1, max: 16 }) }),
  fc.record({ kind: fc.constant('delete-line' as const), line: where }),
  fc.record({ kind: fc.constant('duplicate-line' as const), line: where }),
  fc.record({ kind: fc.constant('swap-lines' as const), line: where, other: where }),
  fc.record({ kind: fc.constant('insert-line' as const), line: where, text }),
  fc.record({ kind: fc.constant('replace-field' as const), line: where, field: fc.nat({ max: 20 }), text }),
  fc.record({ kind: fc.constant('delete-field' as const), line: where, field: fc.nat({ max: 20 }) }),
  fc.record({ kind: fc.constant('duplicate-field' as const), line: where, field: fc.nat({ max: 20 }) }),
);

const FIELD_SEPARATOR = /([,;\t]| +)/u;

/** The seed with the mutations applied in order; positions wrap around the current text. */
export function applyMutations(seed: string, mutations: readonly Mutation[]): string {
  let current = seed;
  for (const mutation of mutations) {
    if (mutation.kind === 'flip' || mutation.kind === 'insert' || mutation.kind === 'delete') {
      const at = current.length === 0 ? 0 : mutation.at % (current.length + (mutation.kind === 'insert' ? 1 : 0));
      if (mutation.kind === 'flip') current = current.slice(0, at) + mutation.text + current.slice(at + 1);
      else if (mutation.kind === 'insert') current = current.slice(0, at) + mutation.text + current.slice(at);
      else current = current.slice(0, at) + current.slice(at + mutation.length);
      continue;
    }
    const lines = current.split('\n');
    const line = mutation.line % lines.length;
    switch (mutation.kind) {
      case 'delete-line':
        lines.splice(line, 1);
        break;
      case 'duplicate-line':
        lines.splice(line, 0, lines[line]!);
        break;
      case 'swap-lines': {
        const other = mutation.other % lines.length;
        [lines[line], lines[other]] = [lines[other]!, lines[line]!];
        break;
      }
      case 'insert-line':
        lines.splice(line, 0, mutation.text);
        break;
      default: {
        // Fields with their separators kept, so that the line is rebuilt as it was.
        const parts = lines[line]!.split(FIELD_SEPARATOR);
        const fields = parts.flatMap((part, index) => (index % 2 === 0 ? [index] : []));
        const target = fields[mutation.field % fields.length]!;
        if (mutation.kind === 'replace-field') parts[target] = mutation.text;
        else if (mutation.kind === 'delete-field') parts.splice(target, 2);
        else parts.splice(target, 0, parts[target]!, parts[target + 1] ?? ',');
        lines[line] = parts.join('');
      }
    }
    current = lines.join('\n');
  }
  return current;
}

/** A seed (one of the real files) and up to `maxEdits` edits of it. */
export function mutatedFrom(seeds: readonly string[], maxEdits = 8): fc.Arbitrary<string> {
  return fc
    .tuple(fc.constantFrom(...seeds), fc.array(mutationArbitrary, { minLength: 1, maxLength: maxEdits }))
    .map(([seed, mutations]) => applyMutations(seed, mutations));
}

/** Text assembled from the pieces files of a format are made of, so that deep branches are reached. */
export function piecesText(pieces: readonly string[], maxPieces = 120): fc.Arbitrary<string> {
  return fc
    .array(
      fc.oneof(
        { weight: 4, arbitrary: fc.constantFrom(...pieces) },
        { weight: 2, arbitrary: fc.constantFrom(...SPECIAL_CHARACTERS) },
        { weight: 2, arbitrary: fc.double({ noNaN: true, min: -1e12, max: 1e12 }).map((v) => String(Number(v.toPrecision(6)))) },
        { weight: 1, arbitrary: fc.constantFrom(...SPECIAL_TOKENS) },
        { weight: 1, arbitrary: fc.string({ maxLength: 4 }) },
      ),
      { maxLength: maxPieces },
    )
    .map((parts) => parts.join(''));
}
