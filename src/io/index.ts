/**
 * Text <-> model: measured tables, Touchstone files, sweep exports, JSON with located errors.
 * Pure functions of strings: no file system, no DOM, no Node. Callers read and write the files.
 */
export { formatLineIssue, type LineIssue, type TextReadResult } from './text-issues.ts';
export { FREQUENCY_UNITS, parseFrequencyUnit, type FrequencyUnit } from './frequency-unit.ts';
export {
  readImpedanceTableCsv,
  measuredPartFromTable,
  MAX_TABLE_POINTS,
  type ImpedanceTableCsv,
  type ImpedanceTableCsvOptions,
  type TableDelimiter,
} from './impedance-table-csv.ts';
export {
  readTouchstone,
  networkEntry,
  networkReference,
  MAX_TOUCHSTONE_PORTS,
  MAX_TOUCHSTONE_FREQUENCIES,
  TOUCHSTONE_DEFAULTS,
  type MatrixFormat,
  type NetworkParameter,
  type ReferenceSource,
  type TouchstoneFormat,
  type TouchstoneNetwork,
  type TouchstoneReadOptions,
} from './touchstone-network.ts';
export { convertNetworkPoint, type NetworkMatrix } from './network-conversion.ts';
export {
  impedanceFromNetwork,
  measuredPartFromNetwork,
  fixturePorts,
  impedanceToS11,
  impedanceToS21SeriesThru,
  impedanceToS21ShuntThru,
  s11ToImpedance,
  s21ToImpedanceSeriesThru,
  s21ToImpedanceShuntThru,
  thruFixtureSParameters,
  writeTouchstoneTwoPort,
  MEASUREMENT_FIXTURES,
  THRU_FIXTURES,
  type MeasurementFixture,
  type PartFromNetwork,
  type ThruFixture,
  type TwoPortRecord,
} from './touchstone.ts';
export type { Complex } from './complex.ts';
export {
  sweepToCsv,
  sweepToJson,
  sweepCsvChunks,
  sweepJsonChunks,
  ROWS_PER_CHUNK,
  exportColumns,
  pointOriginName,
  pointFlagNames,
  EXPORT_COLUMN_SETS,
  POINT_COLUMNS,
  SWEEP_JSON_FORMAT,
  SWEEP_JSON_VERSION,
  type ExportColumn,
  type ExportColumnSet,
  type SweepJson,
} from './sweep-export.ts';
export { parseJsonText, locateJsonSyntaxError, type JsonSyntaxError, type JsonTextResult } from './json-text.ts';
export { readMaskCsv, maskToCsv } from './mask-csv.ts';
export { readScanText, readScanTextWithProgress, type ScanCsvOptions, type ScanReadResult } from './scan-csv.ts';
