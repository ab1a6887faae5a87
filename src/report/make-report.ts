import { sweepDesign } from '../engine/index.ts';
import type { Design, LimitMask } from '../model/design.ts';
import { type AnalysisOptions, analyzeEmissions, type EmissionsAnalysis, type NoiseInput } from '../spectrum/emissions-analysis.ts';
import { buildReportData, type ReportData } from './report-data.ts';
import { type CsvFile, reportCsvFiles } from './report-csv.ts';
import { renderReportHtml } from './report-html.ts';
import { runSafetyChecks } from '../safety/index.ts';
import { safetySection } from './safety-section.ts';
import type { AssistantResults, ReportOrigin, ReportVariant, SafetyChecksSection } from './report-inputs.ts';

/**
 * The report's one entry point for the command line and the page's worker: sweep the design (and
 * each other variant), analyse its emissions when there is noise and a limit to judge, and make the
 * report data, its HTML page and its CSV files. Pure and synchronous; the same request gives the
 * same bytes in Node and in the browser.
 */

export interface ReportRequest {
  readonly design: Design;
  /** A scan, or the design's noise estimate; absent: the estimate when the design has one, else no analysis. */
  readonly noise?: NoiseInput;
  /** Limits instead of the design's own (`--limit`). */
  readonly masks?: readonly LimitMask[];
  readonly analysisOptions?: Omit<AnalysisOptions, 'masks'>;
  /** Other variants to compare; each is swept and judged like the design. */
  readonly variants?: readonly { readonly variantId: string; readonly name: string; readonly design: Design }[];
  readonly designVariantName?: string;
  readonly safety?: SafetyChecksSection;
  readonly assistants?: AssistantResults;
  readonly origin: ReportOrigin;
}

export interface Report {
  readonly data: ReportData;
  readonly html: string;
  readonly csv: readonly CsvFile[];
}

/** Which noise to judge, or why there is none. */
function noiseFor(request: ReportRequest): { noise: NoiseInput } | { reason: string } {
  const masks = request.masks ?? request.design.emissions?.masks ?? [];
  if (masks.length === 0) return { reason: 'no limit mask (give --limit or add emissions.masks to the design)' };
  if (request.noise) return { noise: request.noise };
  const estimate = request.design.emissions?.estimate;
  if (estimate && (estimate.commonMode || estimate.differentialMode)) return { noise: { kind: 'estimate' } };
  return { reason: 'no scan and no noise estimate in the design' };
}

function analyse(design: Design, noise: NoiseInput, request: ReportRequest): EmissionsAnalysis {
  return analyzeEmissions(design, noise, { ...request.analysisOptions, ...(request.masks ? { masks: request.masks } : {}) });
}

export function makeReport(request: ReportRequest): Report {
  const { design } = request;
  const sweep = sweepDesign(design);
  const chosen = noiseFor(request);
  const analysis = 'noise' in chosen ? analyse(design, chosen.noise, request) : undefined;
  const variants: ReportVariant[] = (request.variants ?? []).map((variant) => {
    const variantSweep = sweepDesign(variant.design);
    const variantAnalysis = 'noise' in chosen ? analyse(variant.design, chosen.noise, request) : undefined;
    return { ...variant, sweep: variantSweep, ...(variantAnalysis ? { analysis: variantAnalysis } : {}) };
  });
  const data = buildReportData({
    design,
    sweep,
    ...(analysis ? { analysis } : { analysisAbsentReason: 'reason' in chosen ? chosen.reason : 'no analysis' }),
    // The safety checks always run (they are quick): the same in the page and on the command line.
    safety: request.safety ?? safetySection(runSafetyChecks(design)),
    ...(request.assistants ? { assistants: request.assistants } : {}),
    ...(variants.length > 0 ? { variants } : {}),
    ...(request.designVariantName ? { designVariantName: request.designVariantName } : {}),
    origin: request.origin,
  });
  return { data, html: renderReportHtml(data), csv: reportCsvFiles(data) };
}
