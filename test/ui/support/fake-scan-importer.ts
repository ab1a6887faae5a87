import type { ScanImportClient } from '../../../src/client/scan-import-client.ts';

type ScanImporter = Pick<ScanImportClient, 'importScan'>;
import { scanImportApi, type ScanImportOptions, type ScanImportReply } from '../../../workers/scan-import-api.ts';

interface PendingImport {
  /** The file as the page sent it: bytes from a chosen file, text for the demo scan. */
  readonly text: string | Uint8Array;
  readonly options: ScanImportOptions | undefined;
  readonly onProgress: ((fractionDone: number) => void) | undefined;
  readonly resolve: (reply: ScanImportReply) => void;
}

/**
 * Stands in for the scan-import worker client: records each import, lets the test report progress,
 * and answers with the worker's own API run in-process.
 */
export class FakeScanImporter implements ScanImporter {
  readonly pending: PendingImport[] = [];
  /** Each import asked for, its file as text (bytes decoded as UTF-8, so tests compare with the file's text). */
  readonly requested: { text: string; options: ScanImportOptions | undefined }[] = [];

  importScan(text: string | Uint8Array, options?: ScanImportOptions, onProgress?: (fractionDone: number) => void): Promise<ScanImportReply> {
    this.requested.push({ text: typeof text === 'string' ? text : new TextDecoder().decode(text), options });
    return new Promise((resolve) => this.pending.push({ text, options, onProgress, resolve }));
  }

  /** Tell the page how far the oldest open import has got. */
  progress(fractionDone: number): void {
    const next = this.pending[0];
    if (!next) throw new Error('no import is running');
    next.onProgress?.(fractionDone);
  }

  /** Answer the oldest open import as the worker would. */
  answer(): ScanImportReply {
    const next = this.pending.shift();
    if (!next) throw new Error('no import is waiting for an answer');
    const file = typeof next.text === 'string' ? { text: next.text } : { bytes: next.text };
    const reply = scanImportApi.importScan(next.options ? { ...file, options: next.options } : file);
    if (reply.ok) next.onProgress?.(1);
    next.resolve(reply);
    return reply;
  }
}
