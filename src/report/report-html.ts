import { plotToSvg } from '../drawing/plot-svg.ts';
import { serializeSvg } from '../drawing/svg-node.ts';
import { attributes, element, escapeHtml } from './html-text.ts';
import type { BandRow, PointRow, ReportData, ReportNumber, Statement } from './report-data.ts';
import type { CheckStatus, ReportCheck, ReportTable } from './report-inputs.ts';

/**
 * The report as one self-contained HTML page: inline CSS (with print rules: A4 and Letter both fit,
 * tables and figures are not split across pages), the drawings inline as SVG, no script, and a
 * Content-Security-Policy that forbids any request, so the file reads the same anywhere, offline, for
 * years. Deterministic: the same data gives the same bytes (the date is part of the data).
 */

const CSS = `
:root { color-scheme: light; }
* { box-sizing: border-box; }
html { background: #eef1f4; }
body { margin: 0; font: 10.5pt/1.45 system-ui, -apple-system, "Segoe UI", Roboto, Helvetica, Arial, sans-serif; color: #1b222a; }
main { max-width: 186mm; margin: 0 auto; padding: 10mm 8mm 14mm; background: #fff; }
h1 { font-size: 17pt; margin: 0 0 2mm; line-height: 1.2; }
h2 { font-size: 13pt; margin: 8mm 0 2.5mm; padding-bottom: 1mm; border-bottom: 1.5px solid #1b222a; break-after: avoid; page-break-after: avoid; }
h3 { font-size: 11pt; margin: 5mm 0 1.5mm; break-after: avoid; page-break-after: avoid; }
p { margin: 0 0 2mm; }
.muted { color: #56606c; }
.small { font-size: 9pt; }
.lead { font-size: 11pt; }
dl.facts { display: grid; grid-template-columns: max-content 1fr; gap: 0.6mm 4mm; margin: 0 0 3mm; }
dl.facts dt { color: #56606c; font-weight: 600; }
dl.facts dd { margin: 0; }
.hash { font-family: ui-monospace, "SFMono-Regular", Menlo, Consolas, monospace; font-size: 8.5pt; word-break: break-all; }
table { border-collapse: collapse; width: 100%; margin: 0 0 4mm; font-size: 9pt; break-inside: avoid; page-break-inside: avoid; }
caption { text-align: left; font-weight: 650; font-size: 9.5pt; padding: 0 0 1mm; caption-side: top; }
th, td { text-align: left; vertical-align: top; padding: 0.8mm 2mm 0.8mm 0; border-bottom: 0.5pt solid #d5dae0; }
thead th { font-weight: 650; color: #3d4652; border-bottom: 1pt solid #3d4652; }
tr { break-inside: avoid; page-break-inside: avoid; }
td.num, th.num { text-align: right; font-variant-numeric: tabular-nums; white-space: nowrap; }
td.id { font-family: ui-monospace, "SFMono-Regular", Menlo, Consolas, monospace; font-size: 8.5pt; white-space: nowrap; }
tr.off td { color: #8a939e; }
.status { display: inline-block; white-space: nowrap; min-width: 11mm; text-align: center; padding: 0 1.5mm; border-radius: 1mm; font-weight: 700; font-size: 8.5pt; border: 0.75pt solid; }
.status-pass, .verdict-meets { color: #1d5b32; border-color: #5f9c72; background: #edf6ef; }
.status-warn { color: #6b4a00; border-color: #c79a2c; background: #fff6e0; }
.status-fail, .verdict-below { color: #7d1d1d; border-color: #c94a4a; background: #fdeeee; }
.status-not-run, .verdict-none { color: #3d4652; border-color: #9aa4b1; background: #f3f5f7; }
figure { margin: 0 0 5mm; break-inside: avoid; page-break-inside: avoid; }
figure svg { display: block; width: 100%; height: auto; }
figure.ladder svg { max-height: 150mm; }
figcaption { font-size: 9pt; color: #3d4652; margin-top: 1mm; }
.box { border: 1pt solid #d99a2b; background: #fff8ec; padding: 2.5mm 3.5mm; margin: 0 0 4mm; break-inside: avoid; page-break-inside: avoid; }
.box ul { margin: 0; padding-left: 5mm; }
.box li + li { margin-top: 1mm; }
ul.notes { margin: 0 0 3mm; padding-left: 5mm; font-size: 9pt; color: #3d4652; }
.keep { break-inside: avoid; page-break-inside: avoid; }
.invented { border: 1pt dashed #e2bd52; background: #fff1c9; padding: 1.5mm 3mm; margin: 0 0 3mm; font-size: 9pt; }
footer { margin-top: 8mm; padding-top: 2mm; border-top: 0.5pt solid #9aa4b1; font-size: 8.5pt; color: #56606c; }
@page { margin: 12mm 12mm 14mm; }
@media print {
  html { background: #fff; }
  main { max-width: none; padding: 0; }
  h2 { margin-top: 6mm; }
  a { color: inherit; text-decoration: none; }
}
`;

const CSP = "default-src 'none'; style-src 'unsafe-inline'; img-src data:; font-src 'none'; form-action 'none'; base-uri 'none'";

function num(value: ReportNumber | undefined, suffix = ''): string {
  return value === undefined ? '<td class="num">–</td>' : `<td class="num"${attributes({ 'data-value': value.value })}>${escapeHtml(value.text + suffix)}</td>`;
}

function text(value: string, attrs: Readonly<Record<string, string | undefined>> = {}): string {
  return element('td', attrs, value === '' ? '–' : value);
}

function head(columns: readonly (string | readonly [string, 'num'])[]): string {
  return `<thead><tr>${columns.map((c) => (typeof c === 'string' ? element('th', { scope: 'col' }, c) : element('th', { scope: 'col', class: 'num' }, c[0]))).join('')}</tr></thead>`;
}

function facts(rows: readonly Statement[]): string {
  return `<dl class="facts">${rows.map((row) => `${element('dt', {}, row.title)}${element('dd', {}, row.text)}`).join('')}</dl>`;
}

function section(id: string, title: string, body: string): string {
  return `<section${attributes({ id })}>${element('h2', {}, title)}${body}</section>`;
}

function notes(list: readonly string[]): string {
  return list.length === 0 ? '' : `<ul class="notes">${list.map((n) => element('li', {}, n)).join('')}</ul>`;
}

function statusBadge(status: CheckStatus): string {
  const words: Record<CheckStatus, string> = { pass: 'pass', warn: 'warn', fail: 'fail', 'not-run': 'not run' };
  return element('span', { class: `status status-${status}` }, words[status]);
}

function plainTable(table: ReportTable, caption: string, name: string): string {
  return `<table${attributes({ 'data-table': name })}>${element('caption', {}, caption)}${head(table.columns)}<tbody>${table.rows.map((row) => `<tr>${row.map((cell) => text(cell)).join('')}</tr>`).join('')}</tbody></table>`;
}

function header(data: ReportData): string {
  const origin = data.origin;
  const rows: Statement[] = [
    { title: 'Design', text: data.designName },
    ...(origin.designFile ? [{ title: 'Design file', text: origin.designFile }] : []),
    ...(origin.scanFile ? [{ title: 'Scan file', text: origin.scanFile }] : []),
    { title: 'Made with', text: `${origin.program} ${origin.version}` },
    { title: 'Date', text: origin.generatedAt },
  ];
  const invented = /\binvented\b/iu.test(`${data.designName} ${data.designDescription}`);
  return `<header>${element('h1', {}, data.title)}${facts(rows)}<p class="small"><span class="muted">Design content hash (SHA-256):</span> ${element('span', { class: 'hash', 'data-design-hash': data.designHash }, data.designHash)}</p>${
    data.designDescription === '' ? '' : element('p', { class: 'small muted' }, data.designDescription)
  }${invented ? element('p', { class: 'invented' }, 'The design (and any scan) in this report is marked as invented: it describes no real product or part.') : ''}</header>`;
}

function summary(data: ReportData): string {
  return section('summary', 'Summary', `${facts(data.summary)}<div class="box" id="cautions-short">${element('strong', {}, 'A planning aid, not a certification.')} ${escapeHtml(' Read the cautions at the end before building or testing anything on mains.')}</div>`);
}

/** The design's ends and conditions, then the drawn filter, then the table of every stage's parts. */
function designSection(data: ReportData): string {
  const { source, receivers, plan, operating, stages } = data.designTables;
  const parts = stages
    .map((stage) => {
      const caption = `${stage.title} (${stage.id})`;
      if (stage.rows.length === 0) return `<div class="keep">${element('h3', {}, caption)}${element('p', { class: 'muted' }, 'No elements.')}</div>`;
      const rows = stage.rows
        .map(
          (row) =>
            `<tr${attributes({ class: row.enabled ? undefined : 'off', 'data-element-id': row.id })}>${text(row.id, { class: 'id' })}${text(row.label)}${text(row.kind)}${text(row.placement)}${text(row.value)}${text(
              row.parasitics,
            )}${text(row.ratings)}${text(row.safetyClass)}${text(row.enabled ? 'on' : 'off')}</tr>`,
        )
        .join('');
      return `<table${attributes({ 'data-table': 'parts', 'data-stage-id': stage.id })}>${element('caption', {}, caption)}${head(['Id', 'Label', 'Part', 'Placement', 'Value', 'Parasitics', 'Ratings', 'Class', 'State'])}<tbody>${rows}</tbody></table>`;
    })
    .join('');
  const ends = `<div class="keep">${element('h3', {}, 'Noise source')}${facts(source)}${element('h3', {}, 'Receiving networks')}${facts(receivers)}${element('h3', {}, 'Frequencies')}${facts(plan)}${
    operating.length > 0 ? `${element('h3', {}, 'Operating conditions')}${facts(operating)}` : ''
  }</div>`;
  const figure = `<figure class="ladder" id="filter">${serializeSvg(data.ladder)}${element('figcaption', {}, 'The filter as designed: noise source on the left, stages in order, receiving networks on the right. Parts switched off are grey and dashed.')}</figure>`;
  return section(
    'design',
    'The design',
    `${ends}${element('h3', { class: 'figure-heading' }, 'The filter drawn')}${figure}${element('h3', {}, 'Stages and parts')}${element('p', { class: 'small muted' }, 'Elements in order from the noise-source side to the receiving networks.')}${parts}`,
  );
}

function plotsSection(data: ReportData): string {
  const figures = data.plots
    .map((plot, i) => `<figure${attributes({ 'data-plot-id': plot.spec.id })}>${plotToSvg(plot.spec, { width: 720, height: 330, idPrefix: `report-plot-${i + 1}` })}${element('figcaption', {}, `Figure ${i + 1}. ${plot.caption}`)}</figure>`)
    .join('');
  return section('plots', 'Plots', figures);
}

function verdictBadge(row: BandRow): string {
  const cls = row.verdict === 'meets target' ? 'verdict-meets' : row.verdict === 'below target' ? 'verdict-below' : 'verdict-none';
  return `<td>${element('span', { class: `status ${cls}` }, row.verdict)}</td>`;
}

function pointRows(rows: readonly PointRow[]): string {
  return rows
    .map((row) => `<tr>${num(row.marginDb)}${num(row.atHz)}${num(row.levelDbuV)}${num(row.limitDbuV)}${text(row.limitName)}${text(`${row.trace}${row.conservative ? ' *' : ''}`)}</tr>`)
    .join('');
}

function marginSection(data: ReportData): string {
  const margin = data.margin;
  if (!margin) return section('margins', 'Margins', element('p', {}, `Not judged: ${data.marginAbsentReason ?? 'no emissions analysis'}.`));
  const limits = `<table data-table="limits">${element('caption', {}, 'Limits')}${head(['Limit', 'Detector', 'Where its values come from'])}<tbody>${margin.limits
    .map((l) => `<tr>${text(l.name)}${text(l.detector)}${text(l.origin)}</tr>`)
    .join('')}</tbody></table>`;
  const bands = `<table data-table="bands">${element('caption', {}, `Worst margin per band (target ${margin.targetMarginDb} dB)`)}${head([
    'Band',
    ['Margin (dB)', 'num'],
    ['At', 'num'],
    ['Level (dBµV)', 'num'],
    ['Limit (dBµV)', 'num'],
    'Limit line',
    'Verdict',
  ])}<tbody>${margin.bands
    .map(
      (row) =>
        `<tr${attributes({ 'data-band': row.name })}>${text(row.name)}${num(row.worstMarginDb)}${num(row.atHz)}${num(row.levelDbuV)}${num(row.limitDbuV)}${text(`${row.limitName}${row.conservative ? ' *' : ''}`)}${verdictBadge(row)}</tr>`,
    )
    .join('')}</tbody></table>`;
  const modes = `<table data-table="limiting-modes">${element('caption', {}, 'Which mode limits each band, and the attenuation still needed there (no filter, limit less the target margin)')}${head([
    'Band',
    'Limited by',
    'Why',
    ['CM needed (dB)', 'num'],
    ['DM needed (dB)', 'num'],
  ])}<tbody>${margin.bands
    .map((row) => `<tr${attributes({ 'data-band': row.name })}>${text(row.name)}${text(row.limitingMode)}${text(row.limitingReason)}${num(row.requiredCmDb)}${num(row.requiredDmDb)}</tr>`)
    .join('')}</tbody></table>`;
  const required = `<table data-table="required">${element('caption', {}, 'Most attenuation needed over the whole span')}${head(['Mode', ['Needed (dB)', 'num'], ['At', 'num']])}<tbody>${margin.required
    .map((row) => `<tr${attributes({ 'data-mode': row.mode })}>${text(row.mode)}${num(row.maxDb)}${num(row.atHz)}</tr>`)
    .join('')}</tbody></table>`;
  const peaks =
    margin.worstPeaks.length === 0
      ? ''
      : `<table data-table="worst-peaks">${element('caption', {}, 'The worst peaks, lowest margin first')}${head([['Margin (dB)', 'num'], ['At', 'num'], ['Level (dBµV)', 'num'], ['Limit (dBµV)', 'num'], 'Limit line', 'Trace'])}<tbody>${pointRows(
          margin.worstPeaks,
        )}</tbody></table>`;
  const failing =
    margin.failingRanges.length === 0
      ? element('p', {}, `No range falls below the ${margin.targetMarginDb} dB target.`)
      : `<table data-table="failing-ranges">${element('caption', {}, `Ranges below the ${margin.targetMarginDb} dB target`)}${head([['From', 'num'], ['To', 'num'], ['Worst margin (dB)', 'num'], ['At', 'num'], 'Limit line'])}<tbody>${margin.failingRanges
          .map((r) => `<tr>${num(r.fromHz)}${num(r.toHz)}${num(r.worst.marginDb)}${num(r.worst.atHz)}${text(r.worst.limitName)}</tr>`)
          .join('')}</tbody></table>`;
  const conservative = margin.bands.some((b) => b.conservative) || margin.worstPeaks.some((p) => p.conservative);
  return section(
    'margins',
    'Margins',
    `${element('p', {}, `Noise: ${margin.noise}. Result: ${margin.pass ? 'every band meets the target' : 'below the target in at least one band'}.`)}${limits}${bands}${modes}${required}${peaks}${failing}${
      conservative ? element('p', { class: 'small muted' }, '* a higher-reading detector judged against a lower-reading detector’s limit: conservative.') : ''
    }${notes(margin.notes)}`,
  );
}

function assumptionsSection(data: ReportData): string {
  return section('assumptions', 'Assumptions', facts(data.assumptions));
}

function checksSection(data: ReportData): string {
  const checks = data.checks;
  if (!checks) return section('checks', 'Safety and practical checks', element('p', {}, 'Not run for this report: nothing here confirms leakage current, discharge, ratings, losses or saturation.'));
  // One short table per check (findings as rows), its assumptions listed once below it: a long check
  // list then prints as several tables, each kept whole on its page.
  const groups: { name: string; rows: typeof checks.checks }[] = [];
  for (const check of checks.checks) {
    const name = check.group ?? check.title;
    const group = groups.find((g) => g.name === name);
    if (group) (group.rows as ReportCheck[]).push(check);
    else groups.push({ name, rows: [check] });
  }
  const tables = groups
    .map((group, g) => {
      const rows = group.rows
        .map(
          (check) =>
            `<tr${attributes({ 'data-check-id': check.id, 'data-status': check.status })}>${text(check.group ? check.title : '')}<td>${statusBadge(check.status)}</td><td>${escapeHtml(check.summary)}${
              check.figures.length > 0 ? `<br><span class="muted">${escapeHtml(check.figures.map((f) => `${f.label}: ${f.value}`).join('; '))}</span>` : ''
            }</td>${text([check.source, check.confidence].filter((x): x is string => x !== undefined && x !== '').join('; '))}</tr>`,
        )
        .join('');
      const assumptions = [...new Set(group.rows.flatMap((check) => (check.assumptions ?? [check.assumption]).filter((a) => a.trim() !== '')))];
      return `<table${attributes({ 'data-table': `checks-${g + 1}` })}>${element('caption', {}, group.name)}${head(['Finding', 'Status', 'Result', 'Source'])}<tbody>${rows}</tbody></table>${
        assumptions.length > 0 ? `<details open><summary class="muted">Assumptions of “${escapeHtml(group.name)}”</summary>${notes(assumptions)}</details>` : ''
      }`;
    })
    .join('');
  return section('checks', 'Safety and practical checks', `${checks.conditions ? element('p', {}, `Conditions: ${checks.conditions}.`) : ''}${tables}${notes(checks.notes ?? [])}`);
}

function assistantsSection(data: ReportData): string {
  if (data.assistants.length === 0) return '';
  const parts = data.assistants
    .map((a, i) => `<div class="keep">${element('h3', {}, a.title)}${a.lines.map((line) => element('p', {}, line)).join('')}${a.table ? plainTable(a.table, a.title, `assistant-${i + 1}`) : ''}${notes(a.notes ?? [])}</div>`)
    .join('');
  return section('assistants', 'Design assistants', parts);
}

function variantsSection(data: ReportData): string {
  const variants = data.variants;
  if (!variants) return '';
  const rows = variants.rows
    .map((row) => `<tr${attributes({ 'data-variant': row.name })}>${text(`${row.name}${row.reported ? ' (this report)' : ''}`)}${row.bandMargins.map((m) => num(m)).join('')}${text(String(row.partCount))}${text(row.totalCmInductance)}${text(row.totalYCapacitance)}</tr>`)
    .join('');
  return section(
    'variants',
    'Variants compared',
    `<table data-table="variants">${element('caption', {}, 'Worst margin per band (dB), part count, total common-mode inductance and total line-to-ground capacitance')}${head([
      'Variant',
      ...variants.bandNames.map((name): [string, 'num'] => [name, 'num']),
      'Parts',
      'Total CM L',
      'Total Y C',
    ])}<tbody>${rows}</tbody></table>${element('p', { class: 'small muted' }, 'The other variants are drawn on the plots with their own dash.')}`,
  );
}

function cautionsSection(data: ReportData): string {
  return section('cautions', 'Cautions', `<div class="box"><ul>${data.cautions.map((c) => element('li', {}, c)).join('')}</ul></div>`);
}

function footer(data: ReportData): string {
  return `<footer id="trace">${escapeHtml(
    `${data.origin.program} ${data.origin.version}, ${data.origin.generatedAt}. Design content hash: SHA-256 of the validated design as canonical JSON (members sorted, no white space), `,
  )}${element('span', { class: 'hash' }, data.designHash)}.</footer>`;
}

export function renderReportHtml(data: ReportData): string {
  const body = [
    header(data),
    summary(data),
    designSection(data),
    plotsSection(data),
    marginSection(data),
    assumptionsSection(data),
    checksSection(data),
    assistantsSection(data),
    variantsSection(data),
    cautionsSection(data),
    footer(data),
  ].join('\n');
  return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta http-equiv="Content-Security-Policy" content="${CSP}">
<meta name="viewport" content="width=device-width, initial-scale=1">
<meta name="generator"${attributes({ content: `${data.origin.program} ${data.origin.version}` })}>
<meta name="chokepoint-design-hash"${attributes({ content: data.designHash })}>
${element('title', {}, data.title)}
<style>${CSS}</style>
</head>
<body>
<main>
${body}
</main>
</body>
</html>
`;
}
