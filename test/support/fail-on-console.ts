import { afterEach, vi } from 'vitest';

// A warning or error printed during a test is a defect the test did not assert on: fail it.
const printed: string[] = [];
for (const level of ['warn', 'error'] as const) {
  vi.spyOn(console, level).mockImplementation((...args: unknown[]) => {
    const text = args.map(String).join(' ');
    // Lit announces its development build once per process; that is not ours to fix.
    if (text.includes('Lit is in dev mode')) return;
    printed.push(`console.${level}: ${text}`);
  });
}

afterEach(() => {
  if (printed.length > 0) {
    const lines = printed.splice(0);
    throw new Error(`test printed to the console:\n${lines.join('\n')}`);
  }
});
