/** The hand-over report: its data, the printable page, the CSV files, and the one entry point. */
export { makeReport, type Report, type ReportRequest } from './make-report.ts';
export { buildReportData, type ReportData } from './report-data.ts';
export { renderReportHtml } from './report-html.ts';
export { plotToCsv, reportCsvFiles, type CsvFile } from './report-csv.ts';
export { designHash } from './design-hash.ts';
export type * from './report-inputs.ts';
