/**
 * How large a scan is read, apart from the reader (src/io/scan-csv.ts) so that the page can check a
 * file's size before reading it without loading the reader.
 */

/**
 * The largest scan read: 2 million lines, 128 MiB. A 10⁶-line scan reads and is judged in about a
 * second in under 250 MB (npm run bench, section scan-import); the memory grows with the file (its
 * bytes, its text and 8 bytes per value), so beyond these a file is refused, saying so, rather than
 * taking the machine's memory. The analysis works at the receiver's resolution whatever the length
 * (src/spectrum/scan-reduction.ts): a finer export adds nothing to the verdict.
 */
export const MAX_SCAN_LINES = 2_000_000;
export const MAX_SCAN_FILE_BYTES = 128 * 1024 * 1024;

/** The message for a scan file above MAX_SCAN_FILE_BYTES (callers check the size before reading it). */
export function scanFileTooLarge(bytes: number): string {
  return `the file is ${(bytes / 2 ** 20).toFixed(0)} MiB; scans of up to ${MAX_SCAN_FILE_BYTES / 2 ** 20} MiB and ${MAX_SCAN_LINES.toLocaleString('en-US')} lines are read: ${COARSER}`;
}

export function tooManyLines(lines: number): string {
  return `the file has ${lines.toLocaleString('en-US')} lines; scans of up to ${MAX_SCAN_LINES.toLocaleString('en-US')} lines are read: ${COARSER}`;
}

const COARSER =
  'export it with a coarser step (a quarter of the receiver’s resolution bandwidth, 2.25 kHz from 150 kHz to 30 MHz, loses nothing the analysis uses) or split it into frequency ranges';

