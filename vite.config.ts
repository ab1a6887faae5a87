import { fileURLToPath } from 'node:url';
import type { Plugin } from 'vite';
import { defineConfig } from 'vitest/config';

/**
 * The built page's Content-Security-Policy: only the app's own scripts, styles and workers; no inline
 * script, no eval, no request to any other origin. lit's styles are constructed stylesheets and uPlot
 * styles elements through the CSSOM, neither of which the policy forbids. The same policy is a
 * <meta> tag in dist/index.html and a header from `npm start` (vite preview). The dev server, which
 * injects inline modules for hot reload, runs without it.
 */
export const CONTENT_SECURITY_POLICY = [
  "default-src 'none'",
  "script-src 'self'",
  "style-src 'self'",
  "img-src 'self' data: blob:",
  "font-src 'self'",
  "connect-src 'self'",
  "worker-src 'self'",
  "manifest-src 'self'",
  "base-uri 'none'",
  "form-action 'none'",
  "object-src 'none'",
].join('; ');

function contentSecurityPolicy(): Plugin {
  return {
    name: 'chokepoint-content-security-policy',
    apply: 'build',
    transformIndexHtml: () => [{ tag: 'meta', attrs: { 'http-equiv': 'Content-Security-Policy', content: CONTENT_SECURITY_POLICY }, injectTo: 'head-prepend' }],
  };
}

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
  plugins: [contentSecurityPolicy()],
  worker: {
    format: 'es',
  },
  server: { host: '127.0.0.1' },
  // frame-ancestors only works as a header, so the header adds it.
  preview: { host: '127.0.0.1', headers: { 'Content-Security-Policy': `${CONTENT_SECURITY_POLICY}; frame-ancestors 'none'` } },
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
