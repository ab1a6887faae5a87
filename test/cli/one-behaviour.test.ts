import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { COMMANDS } from '../../src/cli/commands/index.ts';
import { ExitCode } from '../../src/cli/exit-codes.ts';
import { repoFile, runInMemory } from '../support/cli-harness.ts';

const README = repoFile('README.md');
const CLI_DOC = repoFile('docs/cli.md');
const GITIGNORE = repoFile('.gitignore');

/** Every `chokepoint …` command in the fenced sh blocks of a Markdown text. */
function documentedCommands(markdown: string): string[][] {
  const blocks = [...markdown.matchAll(/^```sh\n([\s\S]*?)^```/gmu)].map((match) => match[1]!);
  return blocks
    .flatMap((block) => block.split('\n'))
    .map((line) => line.replace(/\s+#.*$/u, '').trim())
    .filter((line) => line.startsWith('npx chokepoint '))
    .map((line) => line.slice('npx chokepoint '.length).split(/\s+/u));
}

/** The file a command writes with -o/--out, if any. */
function outputOf(argv: readonly string[]): string | undefined {
  for (let i = 0; i < argv.length; i += 1) {
    const arg = argv[i]!;
    if (arg === '-o' || arg === '--out') return argv[i + 1];
    if (arg.startsWith('--out=')) return arg.slice('--out='.length);
  }
  return undefined;
}

/** Other paths a command writes to: the report's CSV prefix. */
function otherOutputsOf(argv: readonly string[]): string[] {
  return argv.flatMap((arg, i) => (arg === '--csv' && argv[i + 1] !== undefined ? [argv[i + 1]!] : []));
}

describe('chokepoint help lists every exit code', () => {
  it('0, 1, 2 and 3, each with its meaning, as docs/cli.md does', async () => {
    const help = (await runInMemory(['help'], {})).stdout;
    const section = help.slice(help.indexOf('Exit codes:'));
    for (const code of Object.values(ExitCode)) {
      expect(section).toMatch(new RegExp(`^ {2}${code} {2}\\S`, 'mu'));
      expect(CLI_DOC).toMatch(new RegExp(`^\\| ${code} \\| `, 'mu'));
    }
    expect(section).toMatch(/1 {2}check ran, and a band is below the target margin or not covered/u);
  });
});

describe('examples that write files write them under out/, which git ignores', () => {
  const documented = [...documentedCommands(README), ...documentedCommands(CLI_DOC)];
  const fromHelp = COMMANDS.flatMap((command) => command.examples.map((example) => example.command.replace(/^chokepoint /u, '').split(/\s+/u)));
  const writers = [...documented, ...fromHelp].filter((argv) => outputOf(argv) !== undefined);

  it('finds the examples that write a file', () => {
    expect(writers.length).toBeGreaterThanOrEqual(6);
    expect(GITIGNORE.split('\n')).toContain('/out/');
    expect(README).toMatch(/mkdir -p out/u);
  });

  it.each(writers.map((argv) => [argv.join(' '), argv]))('%s', async (_text, argv) => {
    const target = outputOf(argv)!;
    expect(target.startsWith('out/')).toBe(true);
    for (const other of otherOutputsOf(argv)) expect(other.startsWith('out/')).toBe(true);
    // And the example runs: every file it reads is in the repository.
    const files: Record<string, string> = {};
    for (const arg of argv) if (/^fixtures\//u.test(arg)) files[arg] = readFileSync(new URL(`../../${arg}`, import.meta.url), 'utf8');
    const result = await runInMemory(argv, files);
    expect([0, 1]).toContain(result.code);
    expect(result.written.has(target)).toBe(true);
  });
});
