import type { SafetyReport } from '../safety/index.ts';
import type { CheckStatus, ReportCheck, SafetyChecksSection } from './report-inputs.ts';

/**
 * The safety checks' result (src/safety) in the report's plain shape: one row per finding, its
 * numbers as printed, what it assumes, and its standard with how sure the value is in plain words.
 * A finding that could not be judged says what to give; one that does not apply is left out.
 */
export function safetySection(report: SafetyReport): SafetyChecksSection {
  const checks: ReportCheck[] = [];
  for (const check of report.checks) {
    if (check.status === 'skipped') {
      checks.push({ id: check.id, group: check.title, title: check.title, status: 'not-run', summary: check.summary, figures: [], assumption: '' });
      continue;
    }
    for (const finding of check.findings) {
      if (finding.status === 'not-applicable') continue;
      const status: CheckStatus = finding.status === 'not-checked' ? 'not-run' : finding.status;
      const summary = finding.status === 'not-checked' ? `${finding.summary} Give: ${finding.missing.join(', ')}.` : finding.summary;
      const sources = finding.sources.map((source) => (source.clause === '' ? source.standard : `${source.standard} ${source.clause}`));
      const doubtful = finding.sources.filter((source) => source.confirmation !== 'published-text').map((source) => source.confirmationText);
      checks.push({
        id: finding.id,
        group: check.title,
        title: finding.title,
        status,
        summary,
        figures: finding.figures.map((figure) => ({ label: figure.label, value: figure.text })),
        assumption: [...check.assumptions, ...finding.assumptions].join('; '),
        assumptions: [...check.assumptions, ...finding.assumptions],
        ...(sources.length > 0 ? { source: sources.join('; ') } : {}),
        ...(doubtful.length > 0 ? { confidence: [...new Set(doubtful)].join('; ') } : {}),
      });
    }
  }
  const conditions = [report.supply?.text, report.lineCurrentA === undefined ? undefined : `${report.lineCurrentA} A line current`].filter((x): x is string => x !== undefined).join('; ');
  return {
    checks,
    ...(conditions === '' ? {} : { conditions }),
    notes: report.cautions.map((caution) => caution.text),
  };
}
