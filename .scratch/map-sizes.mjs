import { readFileSync } from 'node:fs';
import { SourceMapConsumer } from 'source-map-js';
const file = process.argv[2];
const code = readFileSync(file, 'utf8');
const map = JSON.parse(readFileSync(file + '.map', 'utf8'));
const c = new SourceMapConsumer(map);
const lines = code.split('\n');
const bytes = new Map();
let prev = null;
c.eachMapping((m) => {
  if (prev) {
    let len = prev.generatedLine === m.generatedLine ? m.generatedColumn - prev.generatedColumn : lines[prev.generatedLine - 1].length - prev.generatedColumn;
    const key = (prev.source || '?').replace(/.*node_modules\//, 'nm:').replace(/^(nm:(@[^/]+\/)?[^/]+).*/, '$1').replace(/.*\/src\//, 'src/').replace(/^(src\/[^/]+).*/, '$1');
    bytes.set(key, (bytes.get(key) || 0) + len);
  }
  prev = m;
});
const sorted = [...bytes].sort((a, b) => b[1] - a[1]).slice(0, 25);
for (const [k, v] of sorted) console.log((v / 1024).toFixed(1).padStart(7), k);
