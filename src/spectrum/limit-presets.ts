/**
 * The limit lines chokepoint ships: conducted disturbance at the mains port, 150 kHz to 30 MHz,
 * quasi-peak and average, from standards whose values the project's reference sheet
 * (references.md §1.1) marks V (read in the standard's or regulation's text) or V2
 * (stated by a secondary source). Nothing marked M (from memory) is shipped: not CISPR 25, not
 * CISPR 11 class A above 20 kVA. Every preset says where its numbers come from and how sure that is.
 *
 * Presets are frozen. A design never points at one: `copyPreset` gives the design its own editable
 * `LimitMask`, whose `origin` names the standard and clause, so that a later change to this file
 * cannot silently change a saved design's limit, and a user can tighten a copy (an internal margin
 * line) without touching the original. docs/limits.md lists the presets; a test keeps it in step.
 *
 * The two shapes (references.md §1.1 gives the same numbers for every standard below; that CISPR 32
 * prints exactly these is M there, so its presets say so in their status note):
 *
 * - Class B: QP 66 → 56 dBµV from 0.15 to 0.5 MHz, falling linearly with log f; 56 dBµV from 0.5 to
 *   5 MHz; 60 dBµV from 5 to 30 MHz. Average 10 dB lower throughout (56 → 46, 46, 50). The two
 *   segments meet at 0.5 MHz; at 5 MHz the line steps up and the lower limit (56 / 46) applies at
 *   5 MHz itself.
 * - Class A: QP 79 dBµV from 0.15 to 0.5 MHz, 73 dBµV from 0.5 to 30 MHz; average 66 and 60. At
 *   0.5 MHz the line steps down and the lower limit (73 / 60) applies there.
 *
 * Steps are written as two points at one frequency; `limitAt` (limit-mask.ts) takes the lower level
 * at a step, the band-edge rule of 47 CFR §15.107 (V); CISPR tables carry the same note (M).
 */
import type { Detector } from '../model/emissions-schema.ts';
import type { LimitMask } from '../model/design.ts';

/** How sure the values are, with the tags of references.md: V read in the text, V2 secondary source. */
export type PresetStatus = 'V' | 'V2';

export interface LimitPreset {
  /** Plain and stable: designs and files name presets by it. */
  readonly id: string;
  /** For lists and chart legends. */
  readonly name: string;
  /** The standard or regulation. */
  readonly standard: string;
  /** The edition or revision the values were sourced from, as far as known. */
  readonly edition: string;
  /** The clause or table, and the port and class it applies to. */
  readonly clause: string;
  readonly equipmentClass: 'A' | 'B';
  readonly status: PresetStatus;
  /** What the status covers and what is not confirmed. */
  readonly statusNote: string;
  readonly detector: Detector;
  /** Rising; a step is two points at one frequency. */
  readonly frequencyHz: readonly number[];
  readonly levelDbuV: readonly number[];
}

interface Source {
  readonly idPrefix: string;
  readonly shortName: string;
  readonly standard: string;
  readonly edition: (equipmentClass: 'A' | 'B') => string;
  readonly clause: (equipmentClass: 'A' | 'B') => string;
  readonly status: PresetStatus;
  readonly statusNote: (equipmentClass: 'A' | 'B') => string;
}

type Shape = Pick<LimitPreset, 'frequencyHz' | 'levelDbuV'>;

const MHz = 1e6;

/** Class B mains-port lines (references.md §1.1). */
const CLASS_B: Readonly<Record<'quasi-peak' | 'average', Shape>> = {
  'quasi-peak': { frequencyHz: [0.15 * MHz, 0.5 * MHz, 5 * MHz, 5 * MHz, 30 * MHz], levelDbuV: [66, 56, 56, 60, 60] },
  average: { frequencyHz: [0.15 * MHz, 0.5 * MHz, 5 * MHz, 5 * MHz, 30 * MHz], levelDbuV: [56, 46, 46, 50, 50] },
};

/** Class A mains-port lines (references.md §1.1). */
const CLASS_A: Readonly<Record<'quasi-peak' | 'average', Shape>> = {
  'quasi-peak': { frequencyHz: [0.15 * MHz, 0.5 * MHz, 0.5 * MHz, 30 * MHz], levelDbuV: [79, 79, 73, 73] },
  average: { frequencyHz: [0.15 * MHz, 0.5 * MHz, 0.5 * MHz, 30 * MHz], levelDbuV: [66, 66, 60, 60] },
};

const SOURCES: readonly Source[] = [
  {
    idPrefix: 'fcc-15.107',
    shortName: 'FCC Part 15',
    standard: '47 CFR Part 15 (FCC), §15.107 Conducted limits',
    edition: () => 'CFR text as revised October 2008 (the revision read)',
    clause: (c) => `§15.107(${c === 'B' ? 'a' : 'b'}), class ${c} limits, AC power line, measured with a 50 µH/50 Ω LISN`,
    status: 'V',
    statusNote: (c) =>
      c === 'B'
        ? 'V: read in the regulation text, including "the lower limit applies at the band edges"; the same numbers are in the current eCFR §18.307(b)'
        : 'V: read in the regulation text, including "the lower limit applies at the boundary between the frequency ranges"',
  },
  {
    idPrefix: 'cispr22',
    shortName: 'CISPR 22 / EN 55022',
    standard: 'CISPR 22 / EN 55022, information technology equipment',
    edition: () => 'CISPR 22 ed. 6 (2008)',
    clause: (c) => `limits for conducted disturbance at the mains terminals, class ${c}`,
    status: 'V2',
    statusNote: () => 'V2: values from a university EMC course page reproducing the EN 55022 table; the standard itself was not read',
  },
  {
    idPrefix: 'cispr32',
    shortName: 'CISPR 32 / EN 55032',
    standard: 'CISPR 32 / EN 55032, multimedia equipment',
    edition: () => 'CISPR 32:2015',
    clause: (c) => `Annex A, class ${c} limits for the AC mains power port (probably Table ${c === 'B' ? 'A.10' : 'A.8'}: check the number in the standard)`,
    status: 'V2',
    statusNote: () =>
      'V2 for the values, those of the EN 55022 mains table, with which the project reference sheet lists CISPR 32 class A/B AC mains; ' +
      'that CISPR 32 prints exactly these values, and its table number, were not confirmed from its text',
  },
  {
    idPrefix: 'cispr11-group-1',
    shortName: 'CISPR 11 / EN 55011 group 1',
    standard: 'CISPR 11 / EN 55011, industrial, scientific and medical equipment',
    edition: (c) => (c === 'A' ? 'CISPR 11 ed. 6 (2015)' : 'edition not stated by the source'),
    clause: (c) =>
      c === 'A'
        ? 'mains terminal disturbance voltage limits, group 1 class A, rated input power up to 20 kVA'
        : 'mains terminal disturbance voltage limits, group 1 class B',
    status: 'V2',
    statusNote: (c) =>
      c === 'A'
        ? 'V2: values from an industrial product manual quoting EN 55011 class A; class A above 20 kVA is not shipped (its values are unconfirmed)'
        : 'V2: values from open-source code encoding EN 55011 class B with the log-f segment 66 → 56 / 56 → 46',
  },
];

const DETECTORS_SHIPPED = ['quasi-peak', 'average'] as const;
const DETECTOR_SUFFIX: Readonly<Record<(typeof DETECTORS_SHIPPED)[number], string>> = { 'quasi-peak': 'qp', average: 'av' };
const DETECTOR_NAME: Readonly<Record<(typeof DETECTORS_SHIPPED)[number], string>> = { 'quasi-peak': 'quasi-peak', average: 'average' };

function build(): readonly LimitPreset[] {
  const presets: LimitPreset[] = [];
  for (const source of SOURCES) {
    for (const equipmentClass of ['B', 'A'] as const) {
      for (const detector of DETECTORS_SHIPPED) {
        const shape = (equipmentClass === 'B' ? CLASS_B : CLASS_A)[detector];
        presets.push(
          Object.freeze({
            id: `${source.idPrefix}-class-${equipmentClass.toLowerCase()}-${DETECTOR_SUFFIX[detector]}`,
            name: `${source.shortName} class ${equipmentClass}, ${DETECTOR_NAME[detector]}`,
            standard: source.standard,
            edition: source.edition(equipmentClass),
            clause: source.clause(equipmentClass),
            equipmentClass,
            status: source.status,
            statusNote: source.statusNote(equipmentClass),
            detector,
            frequencyHz: Object.freeze([...shape.frequencyHz]),
            levelDbuV: Object.freeze([...shape.levelDbuV]),
          }),
        );
      }
    }
  }
  return Object.freeze(presets);
}

/** Every shipped preset, frozen (the list, each preset and its arrays). */
export const LIMIT_PRESETS: readonly LimitPreset[] = build();

/** The preset with this id, or undefined. */
export function findPreset(id: string): LimitPreset | undefined {
  return LIMIT_PRESETS.find((preset) => preset.id === id);
}

/** Where a preset's values come from, in the words a user reads (the page, the report, a copy's origin). */
export function presetSourceText(preset: Pick<LimitPreset, 'status'>): string {
  return preset.status === 'V' ? 'from the published table' : 'from a secondary source: check against the standard before relying on it';
}

/** Standard, edition, clause, detector and where the values come from, in one line: the copy's `origin` (at most 500 characters). */
export function presetOrigin(preset: LimitPreset): string {
  return `${preset.standard}, ${preset.edition}; ${preset.clause}; ${preset.detector}; values ${presetSourceText(preset)} (preset ${preset.id})`;
}

/**
 * A design's own editable copy of a preset: fresh arrays, `origin` naming the standard and clause.
 * Changing the copy never changes the preset. `maskId` renames the copy (default: the preset's id),
 * for a design that holds two copies of one preset. Throws for an id that is not a preset's.
 */
export function copyPreset(id: string, maskId: string = id): LimitMask {
  const preset = findPreset(id);
  if (!preset) {
    throw new RangeError(`no limit preset "${id}" (known: ${LIMIT_PRESETS.map((p) => p.id).join(', ')})`);
  }
  return {
    id: maskId,
    name: preset.name,
    detector: preset.detector,
    frequencyHz: [...preset.frequencyHz],
    levelDbuV: [...preset.levelDbuV],
    origin: presetOrigin(preset),
  };
}
