import { fileURLToPath } from 'node:url';
import { defineConfig } from 'vitest/config';

const repoRoot = fileURLToPath(new URL('.', import.meta.url));

// One config for the app build, the dev server and the tests.
// The worker is bundled as an ES module so that comlink and the engine load with it.
// The page's index.html lives in src/ui (the app root); the build still lands in the repo's dist/.
export default defineConfig({
  root: fileURLToPath(new URL('./src/ui', import.meta.url)),
  base: './',
  build: {
    outDir: fileURLToPath(new URL('./dist', import.meta.url)),
    emptyOutDir: true,
    target: 'es2022',
    sourcemap: true,
  },
  worker: {
    format: 'es',
  },
  server: { host: '127.0.0.1' },
  preview: { host: '127.0.0.1' },
  test: {
    // Tests and their globs are relative to the repository, not to the app root.
    root: repoRoot,
    // Warnings in tests are failures: see test/support/fail-on-console.ts.
    projects: [
      {
        extends: true,
        test: {
          name: 'unit',
          environment: 'node',
          // A limit for a hung test, not a speed check: the heavy property tests take seconds on a busy machine.
          testTimeout: 60_000,
          include: ['test/**/*.test.ts'],
          exclude: ['test/ui/**', 'test/e2e/**'],
          setupFiles: ['test/support/fail-on-console.ts'],
        },
      },
      {
        extends: true,
        test: {
          name: 'ui',
          environment: 'happy-dom',
          testTimeout: 60_000,
          include: ['test/ui/**/*.test.ts'],
          setupFiles: ['test/support/fail-on-console.ts'],
        },
      },
      {
        extends: true,
        test: {
          name: 'e2e',
          environment: 'node',
          include: ['test/e2e/**/*.test.ts'],
          testTimeout: 60_000,
          hookTimeout: 60_000,
          fileParallelism: false,
        },
      },
    ],
  },
});
