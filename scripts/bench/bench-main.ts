import type { BenchSection, Figure } from './bench-section.ts';
import { assistantsSection } from './sections/assistants.ts';
import { drawingReportSection } from './sections/drawing-report.ts';
import { kernelSection } from './sections/kernel.ts';
import { plannerPageSection } from './sections/planner-page.ts';
import { scanImportSection } from './sections/scan-import.ts';

/**
 * `npm run bench [-- --json] [-- --only id,id]`: every speed and memory figure the project tracks,
 * one section per area (scripts/bench/sections/). A table for people, or with --json one flat JSON
 * object for comparing two versions key by key (DEVELOPERS.md, "Reading the benchmark").
 */
const SECTIONS: readonly BenchSection[] = [kernelSection, drawingReportSection, scanImportSection, assistantsSection, plannerPageSection];

const args = process.argv.slice(2);
const asJson = args.includes('--json');
const onlyAt = args.indexOf('--only');
const only = onlyAt >= 0 ? new Set((args[onlyAt + 1] ?? '').split(',').filter(Boolean)) : undefined;

const figures: Record<string, Figure> = { node: process.version, cores: (await import('node:os')).availableParallelism() };
const notes: string[] = [];
for (const section of SECTIONS) {
  if (only && !only.has(section.id)) continue;
  const result = await section.run();
  for (const [name, value] of Object.entries(result.figures)) {
    if (name in figures) throw new Error(`bench figure "${name}" is reported twice (section ${section.id})`);
    figures[name] = value;
  }
  for (const note of result.notes ?? []) notes.push(`${section.id}: ${note}`);
  if (!asJson) {
    process.stdout.write(`\n${section.title}\n`);
    const width = Math.max(...result.rows.map(([label]) => label.length));
    for (const [label, value] of result.rows) process.stdout.write(`  ${label.padEnd(width)}  ${value}\n`);
    for (const note of result.notes ?? []) process.stdout.write(`  note: ${note}\n`);
  }
}
if (notes.length > 0) figures['notes'] = notes.join('; ');
if (asJson) process.stdout.write(`${JSON.stringify(figures)}\n`);
else process.stdout.write(`\nnode ${String(figures['node'])}, ${String(figures['cores'])} cores\n`);
