import type { ResonanceMark, SweepResult } from '../../engine/index.ts';
import { type InsertionLossSeries, seriesForColumn } from './insertion-loss-series.ts';

/** A resonance the page points out: an element's own SRF, or a peak/notch of a drawn curve. */
export type ResonanceNote =
  | {
      readonly kind: 'self-resonance';
      readonly frequencyHz: number;
      readonly elementId: string;
      readonly elementLabel: string;
      /** Which impedance resonates: a choke has a CM and a DM view. */
      readonly view: Extract<ResonanceMark, { kind: 'element' }>['view'];
      readonly type: 'series' | 'parallel';
    }
  | {
      readonly kind: 'response';
      readonly frequencyHz: number;
      readonly valueDb: number;
      readonly type: 'peak' | 'notch';
      readonly series: InsertionLossSeries;
    };

/**
 * The resonances worth showing beside the insertion-loss chart, by frequency: every element
 * self-resonance, and the peaks and notches the engine located on the curves the chart draws
 * (peaks on other columns, e.g. the worst-case systems, belong to views not built yet).
 */
export function resonanceNotes(result: SweepResult): ResonanceNote[] {
  const labels = new Map(result.elements.map((element) => [element.id, element.label]));
  const notes: ResonanceNote[] = [];
  for (const mark of result.resonances) {
    if (mark.kind === 'element') {
      notes.push({
        kind: 'self-resonance',
        frequencyHz: mark.frequencyHz,
        elementId: mark.elementId,
        elementLabel: labels.get(mark.elementId) ?? mark.elementId,
        view: mark.view,
        type: mark.type,
      });
      continue;
    }
    const series = seriesForColumn(mark.column);
    if (series) notes.push({ kind: 'response', frequencyHz: mark.frequencyHz, valueDb: mark.valueDb, type: mark.type, series });
  }
  return notes.sort((a, b) => a.frequencyHz - b.frequencyHz);
}
