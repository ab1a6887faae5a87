import * as Comlink from 'comlink';
import type { SweepApi } from '../../workers/sweep-api.ts';
import { SweepClient } from './sweep-client.ts';

/**
 * The app's sweep client: one module worker running the engine. Kept apart from SweepClient so
 * the request logic is tested over a MessageChannel without a browser.
 */
export function createSweepWorkerClient(): SweepClient {
  const worker = new Worker(new URL('../../workers/sweep.worker.ts', import.meta.url), { type: 'module', name: 'chokepoint-sweep' });
  const client = new SweepClient(Comlink.wrap<SweepApi>(worker), () => worker.terminate());
  // Without these, a worker that fails to load leaves every request pending forever.
  worker.addEventListener('error', (event) => {
    client.failAll(`the sweep worker stopped: ${event.message || 'its script could not be loaded'}`);
  });
  worker.addEventListener('messageerror', () => {
    client.failAll('the sweep worker sent a message that could not be read');
  });
  return client;
}
