import type { SweepError } from '../../client/sweep-outcome.ts';
import type { SweepResult } from '../../engine/index.ts';
import { readDesignHash } from '../../io/design-url.ts';
import type { Design } from '../../model/design.ts';
import { formatIssue, readDesign, ValidationError } from '../../model/index.ts';
import { formatFrequency } from '../../drawing/frequency-ticks.ts';

/** Where the design on screen came from: the built-in invented demo, or a link's #design=. */
export type DesignOrigin = 'demo' | 'link';

export type DesignState =
  | { readonly kind: 'ready'; readonly origin: DesignOrigin; readonly document: unknown; readonly design: Design }
  | { readonly kind: 'unreadable'; readonly origin: DesignOrigin; readonly error: ValidationError };

export type SweepState =
  | { readonly kind: 'idle' }
  | { readonly kind: 'running' }
  | { readonly kind: 'done'; readonly result: SweepResult; readonly elapsedMs: number }
  | { readonly kind: 'failed'; readonly error: SweepError };

/** The design a location hash asks for: the link's own, or the demo when the hash names none. */
export function designFromHash(hash: string, demoDocument: unknown): DesignState {
  const reading = readDesignHash(hash);
  if (reading.status === 'invalid') return { kind: 'unreadable', origin: 'link', error: reading.error };
  if (reading.status === 'found') return { kind: 'ready', origin: 'link', document: reading.document, design: reading.design };
  const demo = readDesign(demoDocument);
  if (!demo.ok) return { kind: 'unreadable', origin: 'demo', error: new ValidationError('invalid demo design', demo.error.issues) };
  return { kind: 'ready', origin: 'demo', document: demoDocument, design: demo.value };
}

export interface StatusLine {
  readonly tone: 'idle' | 'busy' | 'done' | 'error';
  readonly text: string;
  /** One line per problem, "path: message", for errors that have them. */
  readonly issues: readonly string[];
}

/** The one line under the title that says what the page is doing or why nothing is drawn. */
export function statusLine(design: DesignState, sweep: SweepState): StatusLine {
  if (design.kind === 'unreadable') {
    const what = design.origin === 'link' ? 'The design in the link cannot be used' : 'The built-in demo design cannot be read';
    return { tone: 'error', text: `${what}, so nothing is drawn.`, issues: design.error.issues.map(formatIssue) };
  }
  switch (sweep.kind) {
    case 'idle':
      return { tone: 'idle', text: 'Waiting to sweep.', issues: [] };
    case 'running':
      return { tone: 'busy', text: `Sweeping “${design.design.name}”…`, issues: [] };
    case 'done': {
      const f = sweep.result.frequencyHz;
      const span = f.length > 0 ? `, ${formatFrequency(f[0]!)} to ${formatFrequency(f[f.length - 1]!)}` : '';
      return {
        tone: 'done',
        text: `Swept ${f.length} points${span}, in ${formatElapsed(sweep.elapsedMs)} in the worker.`,
        issues: [],
      };
    }
    case 'failed': {
      const error = sweep.error;
      const text =
        error.kind === 'invalid-design'
          ? 'The design is invalid, so nothing is drawn.'
          : error.kind === 'invalid-request'
            ? 'The page sent the sweep worker a malformed request; nothing is drawn.'
            : `The sweep failed, so nothing is drawn: ${error.message}`;
      return { tone: 'error', text, issues: error.issues.map(formatIssue) };
    }
  }
}

function formatElapsed(ms: number): string {
  return ms < 10 ? `${ms.toFixed(1)} ms` : ms < 10_000 ? `${Math.round(ms)} ms` : `${(ms / 1000).toFixed(1)} s`;
}
