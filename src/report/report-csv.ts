import Papa from 'papaparse';
import type { PlotSpec } from '../drawing/plot-spec.ts';
import type { ReportData, ReportNumber } from './report-data.ts';

/**
 * Every curve and every table of a report as CSV files, for a spreadsheet or another plotting tool;
 * the page's "export CSV" and `chokepoint report --csv` both call this. Numbers are written in full
 * (the shortest text that reads back to the same double), an empty cell where there is none; text
 * that a spreadsheet would run as a formula (= + - @ first) is written with a leading apostrophe.
 */

export interface CsvFile {
  /** A file name without folder: "curves-insertion-loss.csv". */
  readonly name: string;
  readonly text: string;
}

type Cell = string | number | null;

function csv(header: readonly string[], rows: readonly (readonly Cell[])[]): string {
  return `${Papa.unparse({ fields: [...header], data: rows.map((row) => row.map((cell) => (typeof cell === 'number' && !Number.isFinite(cell) ? null : cell))) }, { newline: '\n', escapeFormulae: true })}\n`;
}

const value = (n: ReportNumber | undefined): number | null => (n === undefined ? null : n.value);

/** A plot's curves, one file per frequency axis the curves share (a scan's grid and the sweep's differ). */
export function plotToCsv(spec: PlotSpec): CsvFile[] {
  interface Group {
    readonly frequencyHz: Float64Array;
    readonly header: string[];
    readonly columns: Float64Array[];
  }
  const groups: Group[] = [];
  const groupFor = (f: Float64Array): Group => {
    let group = groups.find((g) => g.frequencyHz === f || (g.frequencyHz.length === f.length && g.frequencyHz.every((x, i) => x === f[i])));
    if (!group) {
      group = { frequencyHz: f, header: ['frequency_Hz'], columns: [] };
      groups.push(group);
    }
    return group;
  };
  const unit = spec.y.unit === '' ? '' : ` (${spec.y.unit})`;
  for (const series of spec.series) {
    const group = groupFor(series.frequencyHz);
    group.header.push(`${series.label}${unit}`);
    group.columns.push(series.values);
  }
  for (const band of spec.bands) {
    const group = groupFor(band.frequencyHz);
    group.header.push(`${band.label}, lower${unit}`, `${band.label}, upper${unit}`);
    group.columns.push(band.lower, band.upper);
  }
  return groups.map((group, g) => ({
    name: `curves-${spec.id}${groups.length > 1 ? `-${g + 1}` : ''}.csv`,
    text: csv(
      group.header,
      Array.from(group.frequencyHz, (f, i) => [f, ...group.columns.map((column) => column[i]!)]),
    ),
  }));
}

/** Every table and curve of the report. */
export function reportCsvFiles(data: ReportData): CsvFile[] {
  const files: CsvFile[] = [];
  files.push({
    name: 'design-parts.csv',
    text: csv(
      ['stage_id', 'stage', 'id', 'label', 'part', 'placement', 'value', 'parasitics', 'ratings', 'safety_class', 'enabled'],
      data.designTables.stages.flatMap((stage) => stage.rows.map((r) => [r.stageId, r.stageTitle, r.id, r.label, r.kind, r.placement, r.value, r.parasitics, r.ratings, r.safetyClass, r.enabled ? 'yes' : 'no'])),
    ),
  });
  const margin = data.margin;
  if (margin) {
    files.push({
      name: 'margin-bands.csv',
      text: csv(
        ['band', 'worst_margin_dB', 'at_Hz', 'level_dBuV', 'limit_dBuV', 'limit', 'trace', 'verdict', 'conservative', 'limited_by', 'why', 'cm_needed_dB', 'dm_needed_dB'],
        margin.bands.map((b) => [
          b.name,
          value(b.worstMarginDb),
          value(b.atHz),
          value(b.levelDbuV),
          value(b.limitDbuV),
          b.limitName,
          b.trace,
          b.verdict,
          b.conservative ? 'yes' : 'no',
          b.limitingMode,
          b.limitingReason,
          value(b.requiredCmDb),
          value(b.requiredDmDb),
        ]),
      ),
    });
    files.push({
      name: 'margin-worst-peaks.csv',
      text: csv(['margin_dB', 'at_Hz', 'level_dBuV', 'limit_dBuV', 'limit', 'trace', 'conservative'], margin.worstPeaks.map((p) => [p.marginDb.value, p.atHz.value, p.levelDbuV.value, p.limitDbuV.value, p.limitName, p.trace, p.conservative ? 'yes' : 'no'])),
    });
    files.push({
      name: 'margin-failing-ranges.csv',
      text: csv(['from_Hz', 'to_Hz', 'worst_margin_dB', 'at_Hz', 'limit'], margin.failingRanges.map((r) => [r.fromHz.value, r.toHz.value, r.worst.marginDb.value, r.worst.atHz.value, r.worst.limitName])),
    });
    files.push({ name: 'required-attenuation.csv', text: csv(['mode', 'most_needed_dB', 'at_Hz'], margin.required.map((r) => [r.mode, value(r.maxDb), value(r.atHz)])) });
  }
  if (data.checks) {
    files.push({
      name: 'checks.csv',
      text: csv(['id', 'check', 'status', 'finding', 'figures', 'assumption', 'source'], data.checks.checks.map((c) => [c.id, c.title, c.status, c.summary, c.figures.map((f) => `${f.label}: ${f.value}`).join('; '), c.assumption, c.source ?? ''])),
    });
  }
  if (data.variants) {
    const v = data.variants;
    files.push({
      name: 'variants.csv',
      text: csv(['variant', ...v.bandNames.map((b) => `worst_margin_dB ${b}`), 'parts', 'total_cm_inductance', 'total_y_capacitance'], v.rows.map((r) => [r.name, ...r.bandMargins.map(value), r.partCount, r.totalCmInductance, r.totalYCapacitance])),
    });
  }
  for (const plot of data.plots) files.push(...plotToCsv(plot.spec));
  return files;
}
