import {
  type ComplexColumns,
  PointFlag,
  PointOrigin,
  type ResonanceMark,
  SWEEP_COLUMNS,
  type SweepColumnId,
  type SweepResult,
  type SweepWarning,
  type TransferId,
} from '../engine/index.ts';

/**
 * A sweep as text: CSV for spreadsheets and plotting tools, and a JSON-ready object for programs.
 * Column names are snake_case with the unit last ("cm_insertion_loss_50ohm_dB", "line1_from_cm_deg"),
 * numbers are written in full (the shortest text that reads back to the same double).
 */

export type ExportUnit = 'Hz' | 'dB' | 'Ω' | '°';

export interface ExportColumn {
  /** The CSV header and the JSON key. */
  readonly name: string;
  readonly unit: ExportUnit;
  readonly label: string;
  readonly description: string;
}

/** Which columns to write: the ones an engineer reads first, or every column the engine makes. */
export type ExportColumnSet = 'standard' | 'all';
export const EXPORT_COLUMN_SETS: readonly ExportColumnSet[] = ['standard', 'all'];

interface ColumnSource extends ExportColumn {
  /** The column's value at a point; nothing is allocated per column (a phase is worked out per point). */
  reader(result: SweepResult): (i: number) => number;
}

/**
 * The export name of every engine column. A Record over the ids: a column added to the engine
 * fails to compile here until it has a name.
 */
const COLUMN_NAMES: Readonly<Record<SweepColumnId, string>> = {
  insertionLoss50Cm: 'cm_insertion_loss_50ohm_dB',
  insertionLoss50Dm: 'dm_insertion_loss_50ohm_dB',
  insertionLossLowHighCm: 'cm_insertion_loss_low_high_dB',
  insertionLossLowHighDm: 'dm_insertion_loss_low_high_dB',
  insertionLossHighLowCm: 'cm_insertion_loss_high_low_dB',
  insertionLossHighLowDm: 'dm_insertion_loss_high_low_dB',
  insertionLossInCircuitCm: 'cm_insertion_loss_in_circuit_dB',
  insertionLossInCircuitDm: 'dm_insertion_loss_in_circuit_dB',
  transferCm: 'cm_transfer_dB',
  transferDm: 'dm_transfer_dB',
  conversionCmToDm: 'cm_to_dm_conversion_dB',
  conversionDmToCm: 'dm_to_cm_conversion_dB',
  line1FromCm: 'line1_from_cm_dB',
  line2FromCm: 'line2_from_cm_dB',
  line1FromDm: 'line1_from_dm_dB',
  line2FromDm: 'line2_from_dm_dB',
  inputImpedanceCmOhm: 'cm_input_impedance_ohm',
  inputImpedanceCmDeg: 'cm_input_impedance_deg',
  inputImpedanceDmOhm: 'dm_input_impedance_ohm',
  inputImpedanceDmDeg: 'dm_input_impedance_deg',
};

const frequencyColumn: ColumnSource = {
  name: 'frequency_Hz',
  unit: 'Hz',
  label: 'frequency',
  description: 'grid frequency: the log grid of the plan plus element self-resonances and located peaks and notches',
  reader: (result) => {
    const f = result.frequencyHz;
    return (i) => f[i]!;
  },
};

function engineColumn(id: SweepColumnId): ColumnSource {
  const info = SWEEP_COLUMNS.find((column) => column.id === id)!;
  return {
    name: COLUMN_NAMES[id],
    unit: info.unit,
    label: info.label,
    description: info.description,
    reader: (result) => {
      const column = result.columns[id];
      return (i) => column[i]!;
    },
  };
}

const LINE_TRANSFERS = ['line1FromCm', 'line2FromCm', 'line1FromDm', 'line2FromDm'] as const satisfies readonly (TransferId & SweepColumnId)[];

function phaseColumn(id: (typeof LINE_TRANSFERS)[number]): ColumnSource {
  const info = SWEEP_COLUMNS.find((column) => column.id === id)!;
  return {
    name: COLUMN_NAMES[id].replace(/_dB$/u, '_deg'),
    unit: '°',
    label: `${info.label}, phase`,
    description: `phase of ${info.description.replace(/^20 log \|(.*)\|$/u, '$1')}`,
    reader: (result) => phaseReader(result.transfers[id]),
  };
}

function phaseReader(column: ComplexColumns): (i: number) => number {
  const { re, im } = column;
  return (i) => (Math.atan2(im[i]!, re[i]!) * 180) / Math.PI;
}

/** The columns of the standard set: insertion losses and what each line's receiving network sees. */
const STANDARD: readonly ColumnSource[] = [
  frequencyColumn,
  engineColumn('insertionLoss50Cm'),
  engineColumn('insertionLoss50Dm'),
  engineColumn('insertionLossInCircuitCm'),
  engineColumn('insertionLossInCircuitDm'),
  ...LINE_TRANSFERS.flatMap((id) => [engineColumn(id), phaseColumn(id)]),
];

/** Every engine column in the engine's order, with the phase of each line transfer beside its level. */
const ALL: readonly ColumnSource[] = [
  frequencyColumn,
  ...SWEEP_COLUMNS.flatMap((column) => {
    const id = column.id;
    const lineTransfer = LINE_TRANSFERS.find((t) => t === id);
    return lineTransfer ? [engineColumn(id), phaseColumn(lineTransfer)] : [engineColumn(id)];
  }),
];

function sources(set: ExportColumnSet): readonly ColumnSource[] {
  return set === 'all' ? ALL : STANDARD;
}

/** Column names, units and descriptions of a set, in output order (without the point columns). */
export function exportColumns(set: ExportColumnSet = 'standard'): readonly ExportColumn[] {
  return sources(set).map(({ name, unit, label, description }) => ({ name, unit, label, description }));
}

/** The two text columns after the numbers: where each point came from and its flags. */
export const POINT_COLUMNS = [
  { name: 'point_origin', description: 'grid, element-resonance (a part’s self-resonance) or response-extremum (a located peak or notch)' },
  { name: 'point_flags', description: 'empty, or flags joined by "+": ideal-resonance-limited, outside-measured-range, not-finite' },
] as const;

const ORIGIN_NAMES: Readonly<Record<number, string>> = {
  [PointOrigin.Base]: 'grid',
  [PointOrigin.ElementResonance]: 'element-resonance',
  [PointOrigin.ResponseExtremum]: 'response-extremum',
};

const FLAG_NAMES: readonly [number, string][] = [
  [PointFlag.IdealResonanceLimited, 'ideal-resonance-limited'],
  [PointFlag.OutsideMeasuredRange, 'outside-measured-range'],
  [PointFlag.NotFinite, 'not-finite'],
];

export function pointOriginName(origin: number): string {
  return ORIGIN_NAMES[origin] ?? `origin-${origin}`;
}

export function pointFlagNames(flags: number): string[] {
  return FLAG_NAMES.filter(([bit]) => (flags & bit) !== 0).map(([, name]) => name);
}

/** A number as the shortest text that reads back to the same double. */
function formatNumber(value: number): string {
  return Number.isFinite(value) ? String(value) : 'NaN';
}

export interface CsvExportOptions {
  readonly columns?: ExportColumnSet;
}

/** Rows per piece of streamed text: a few hundred kilobytes, whatever the length of the sweep. */
export const ROWS_PER_CHUNK = 2048;

/**
 * The CSV in pieces: the header line, then ROWS_PER_CHUNK rows at a time, each piece ending in "\n".
 * Written one piece after another, a million-point sweep never exists as one string.
 */
export function* sweepCsvChunks(result: SweepResult, options: CsvExportOptions = {}): Generator<string> {
  const columns = sources(options.columns ?? 'standard');
  const readers = columns.map((column) => column.reader(result));
  yield `${[...columns.map((c) => c.name), ...POINT_COLUMNS.map((c) => c.name)].join(',')}\n`;
  const n = result.frequencyHz.length;
  for (let start = 0; start < n; start += ROWS_PER_CHUNK) {
    const lines: string[] = [];
    for (let i = start; i < Math.min(n, start + ROWS_PER_CHUNK); i += 1) {
      const fields = readers.map((read) => formatNumber(read(i)));
      fields.push(pointOriginName(result.pointOrigin[i]!), pointFlagNames(result.pointFlags[i]!).join('+'));
      lines.push(fields.join(','));
    }
    yield `${lines.join('\n')}\n`;
  }
}

/** One header line, then one line per frequency; "\n" line ends; no quoting is ever needed. */
export function sweepToCsv(result: SweepResult, options: CsvExportOptions = {}): string {
  return [...sweepCsvChunks(result, options)].join('');
}

export const SWEEP_JSON_FORMAT = 'chokepoint-sweep';
export const SWEEP_JSON_VERSION = 1;

/** The JSON form of a sweep: plain arrays and objects, ready for JSON.stringify. */
export interface SweepJson {
  readonly format: typeof SWEEP_JSON_FORMAT;
  readonly version: typeof SWEEP_JSON_VERSION;
  readonly generator?: string;
  readonly designName: string;
  readonly pointCount: number;
  readonly columns: readonly ExportColumn[];
  /** One array per column, keyed by column name, each pointCount long. */
  readonly data: Readonly<Record<string, readonly number[]>>;
  readonly pointOrigin: readonly string[];
  readonly pointFlags: readonly (readonly string[])[];
  readonly warnings: readonly SweepWarning[];
  readonly resonances: readonly ResonanceMark[];
  readonly resistiveSystems: readonly { readonly id: string; readonly sourceOhm: number; readonly loadOhm: number }[];
}

export interface JsonExportOptions {
  readonly columns?: ExportColumnSet;
  /** Written as "generator", e.g. "chokepoint 0.1.0". */
  readonly generator?: string;
}

export function sweepToJson(result: SweepResult, options: JsonExportOptions = {}): SweepJson {
  const columns = sources(options.columns ?? 'standard');
  const n = result.frequencyHz.length;
  const data: Record<string, number[]> = {};
  for (const column of columns) {
    const read = column.reader(result);
    data[column.name] = Array.from({ length: n }, (_, i) => {
      const v = read(i);
      return Number.isFinite(v) ? v : Number.NaN;
    });
  }
  return {
    ...jsonHead(result, options),
    data,
    ...jsonTail(result),
  };
}

/** The fields before `data`, in the order they are written. */
function jsonHead(result: SweepResult, options: JsonExportOptions): Omit<SweepJson, 'data' | 'pointOrigin' | 'pointFlags' | 'warnings' | 'resonances' | 'resistiveSystems'> {
  const columns = sources(options.columns ?? 'standard');
  return {
    format: SWEEP_JSON_FORMAT,
    version: SWEEP_JSON_VERSION,
    ...(options.generator === undefined ? {} : { generator: options.generator }),
    designName: result.designName,
    pointCount: result.frequencyHz.length,
    columns: columns.map(({ name, unit, label, description }) => ({ name, unit, label, description })),
  };
}

/** The fields after `data`: the point lists, then the small ones. */
function jsonTail(result: SweepResult): Pick<SweepJson, 'pointOrigin' | 'pointFlags' | 'warnings' | 'resonances' | 'resistiveSystems'> {
  return {
    pointOrigin: Array.from(result.pointOrigin, pointOriginName),
    pointFlags: Array.from(result.pointFlags, pointFlagNames),
    ...jsonEnd(result),
  };
}

/** The last, small fields. */
function jsonEnd(result: SweepResult): Pick<SweepJson, 'warnings' | 'resonances' | 'resistiveSystems'> {
  return {
    warnings: result.warnings.map((w) => ({ ...w })),
    resonances: result.resonances.map((r) => ({ ...r })),
    resistiveSystems: result.resistiveSystems.map((s) => ({ ...s })),
  };
}

/**
 * The JSON of sweepToJson as text in pieces, the same value once parsed (JSON.stringify of it, to
 * the byte): the object's fields in order, each data column and the point lists ROWS_PER_CHUNK values
 * at a time. Numbers that are not finite are written as null, as JSON.stringify writes NaN.
 */
export function* sweepJsonChunks(result: SweepResult, options: JsonExportOptions = {}): Generator<string> {
  const columns = sources(options.columns ?? 'standard');
  const n = result.frequencyHz.length;
  const head = JSON.stringify(jsonHead(result, options));
  yield `${head.slice(0, -1)},"data":{`;
  for (const [c, column] of columns.entries()) {
    const read = column.reader(result);
    yield `${c === 0 ? '' : ','}${JSON.stringify(column.name)}:[`;
    yield* listChunks(n, (i) => JSON.stringify(read(i)));
    yield ']';
  }
  yield '},"pointOrigin":[';
  yield* listChunks(n, (i) => JSON.stringify(pointOriginName(result.pointOrigin[i]!)));
  yield '],"pointFlags":[';
  yield* listChunks(n, (i) => JSON.stringify(pointFlagNames(result.pointFlags[i]!)));
  yield `],${JSON.stringify(jsonEnd(result)).slice(1)}`;
}

/** The items of a JSON list, comma-separated, ROWS_PER_CHUNK to a piece. */
function* listChunks(n: number, item: (i: number) => string): Generator<string> {
  for (let start = 0; start < n; start += ROWS_PER_CHUNK) {
    const items: string[] = [];
    for (let i = start; i < Math.min(n, start + ROWS_PER_CHUNK); i += 1) items.push(item(i));
    yield `${start === 0 ? '' : ','}${items.join(',')}`;
  }
}
