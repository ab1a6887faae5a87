import type { PlotSpec } from './plot-spec.ts';

/**
 * A plot's curves as CSV: one row per frequency of the union of every series' grid, one column per
 * series (and two per band), empty where a series has no point at that frequency. Full resolution:
 * the rows are the computed points, not the thinned ones drawn. Labels are quoted; numbers are
 * written in full (shortest round-trip form), frequency in Hz.
 */
export function plotToCsv(spec: PlotSpec): string {
  const columns: { label: string; frequencyHz: Float64Array; values: Float64Array }[] = [];
  for (const series of spec.series) columns.push({ label: `${series.label} (${spec.y.unit})`, frequencyHz: series.frequencyHz, values: series.values });
  for (const band of spec.bands) {
    columns.push({ label: `${band.label}, low (${spec.y.unit})`, frequencyHz: band.frequencyHz, values: band.lower });
    columns.push({ label: `${band.label}, high (${spec.y.unit})`, frequencyHz: band.frequencyHz, values: band.upper });
  }
  // Merge the (rising) grids: most plots share one grid, so this is usually a single walk.
  const cursors = columns.map(() => 0);
  const rows: string[] = [['frequency (Hz)', ...columns.map((c) => c.label)].map(quote).join(',')];
  for (;;) {
    let next = Infinity;
    columns.forEach((column, c) => {
      const at = column.frequencyHz[cursors[c]!];
      if (at !== undefined && at < next) next = at;
    });
    if (next === Infinity) break;
    const cells: string[] = [String(next)];
    columns.forEach((column, c) => {
      const i = cursors[c]!;
      if (column.frequencyHz[i] === next) {
        const value = column.values[i]!;
        cells.push(Number.isFinite(value) ? String(value) : '');
        cursors[c] = i + 1;
      } else cells.push('');
    });
    rows.push(cells.join(','));
  }
  return `${rows.join('\n')}\n`;
}

/** Quoted where needed; a label that a spreadsheet would run as a formula (=, +, -, @) is made plain text first. */
function quote(text: string): string {
  const safe = /^[=+\-@\t\r]/u.test(text) ? `'${text}` : text;
  return /[",\n\r]/u.test(safe) ? `"${safe.replace(/"/gu, '""')}"` : safe;
}
