import { readdirSync, readFileSync } from 'node:fs';
import { join, relative } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';

const root = fileURLToPath(new URL('../..', import.meta.url));

function sources(folder: string): string[] {
  return readdirSync(join(root, folder), { withFileTypes: true, recursive: true })
    .filter((entry) => entry.isFile() && entry.name.endsWith('.ts'))
    .map((entry) => relative(root, join(entry.parentPath, entry.name)));
}

/** Code without its comments and string contents, roughly: enough to look for identifiers. */
function codeOf(text: string): string {
  return text
    .replace(/\/\*[\s\S]*?\*\//gu, '')
    .replace(/\/\/.*$/gmu, '')
    .replace(/'(?:[^'\\\n]|\\.)*'|"(?:[^"\\\n]|\\.)*"|`(?:[^`\\]|\\.)*`/gu, '""');
}

// tsconfig.engine.json compiles these folders without Node types, but @types/papaparse pulls
// Node's globals in with a triple-slash reference; this keeps the rule for the two layers here.
describe('src/io and src/cli stay free of Node and the DOM', () => {
  const files = [...sources('src/io'), ...sources('src/cli')].filter((file) => !file.endsWith('node-main.ts'));

  it('finds the files', () => {
    expect(files.length).toBeGreaterThan(10);
  });

  it.each(files)('%s imports nothing from node:* and uses no Node or DOM global', (file) => {
    const text = readFileSync(join(root, file), 'utf8');
    expect(text).not.toMatch(/(?:from|import)\s*\(?\s*['"]node:/u);
    expect(codeOf(text)).not.toMatch(/\bprocess\s*\.|\bBuffer\b|\brequire\s*\(|__dirname|__filename|\bdocument\s*\.|\bwindow\s*\./u);
  });
});
