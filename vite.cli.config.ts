import { fileURLToPath } from 'node:url';
import { defineConfig } from 'vite';

/**
 * The command line as one Node 20 ES module: an SSR build of src/cli/node-main.ts into
 * dist-cli/chokepoint.mjs, dependencies bundled in so the file needs nothing beside it.
 * Entries are keyed by output name; another entry point is one more key.
 * Used by `npm run build` (vite build -c vite.cli.config.ts) and by bin/chokepoint.mjs, which
 * rebuilds when a source is newer than the output.
 */
const root = fileURLToPath(new URL('.', import.meta.url));

export default defineConfig({
  root,
  publicDir: false,
  logLevel: 'warn',
  ssr: {
    target: 'node',
    noExternal: true,
  },
  build: {
    ssr: true,
    outDir: 'dist-cli',
    emptyOutDir: true,
    target: 'node20',
    minify: false,
    sourcemap: false,
    reportCompressedSize: false,
    // rolldownOptions is what vite 8 calls rollupOptions (the old name is a deprecated alias).
    rolldownOptions: {
      input: {
        chokepoint: fileURLToPath(new URL('src/cli/node-main.ts', import.meta.url)),
      },
      output: {
        format: 'es',
        entryFileNames: '[name].mjs',
        chunkFileNames: 'chunks/[name]-[hash].mjs',
      },
    },
  },
});
