// Loaded with `node --import` into a measured child process (scripts/bench/sections/scan-import.ts):
// at exit it writes the process's own resource usage and V8 heap figures to the file named by
// CHOKEPOINT_USAGE_FILE, so that the figures are the child's alone and nothing else runs in it.
import { writeFileSync } from 'node:fs';
import process from 'node:process';
import v8 from 'node:v8';

const target = process.env.CHOKEPOINT_USAGE_FILE;
if (target) {
  process.on('exit', () => {
    const usage = process.resourceUsage();
    const heap = v8.getHeapStatistics();
    writeFileSync(
      target,
      JSON.stringify({
        maxRssKb: usage.maxRSS,
        userCpuUs: usage.userCPUTime,
        systemCpuUs: usage.systemCPUTime,
        heapCommittedBytes: heap.total_heap_size,
        peakMallocedBytes: heap.peak_malloced_memory,
      }),
    );
  });
}
