/**
 * Code the first plot does not need, in chunks of its own: the plot pictures and CSV (for export) and
 * the limit-mask CSV reader. Each loads on first use, and `loadLaterCode` fetches them all once the
 * page has drawn, so that they are there when asked for even if the network has gone since.
 */
import type * as PlotSvg from '../../drawing/plot-svg.ts';
import type * as PlotCsv from '../../drawing/plot-csv.ts';
import type * as MaskCsv from '../../io/mask-csv.ts';

export const loadPlotExport = (): Promise<[typeof PlotSvg, typeof PlotCsv]> =>
  Promise.all([import('../../drawing/plot-svg.ts'), import('../../drawing/plot-csv.ts')]);

export const loadMaskCsv = (): Promise<typeof MaskCsv> => import('../../io/mask-csv.ts');

/** Fetch every later chunk now; a failure is retried by the use that needs it. */
export function loadLaterCode(): void {
  void loadPlotExport().catch(() => undefined);
  void loadMaskCsv().catch(() => undefined);
}
