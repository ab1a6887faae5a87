import * as Comlink from 'comlink';
import { scanImportApi } from './scan-import-api.ts';

// The worker's only job: read scan files off the main thread.
Comlink.expose(scanImportApi);
