import * as Comlink from 'comlink';
import type { SweepApi } from '../../workers/sweep-api.ts';
import { EmissionsClient } from './emissions-client.ts';
import { SweepClient } from './sweep-client.ts';

/**
 * The app's sweep client: one module worker running the engine. Kept apart from SweepClient so
 * the request logic is tested over a MessageChannel without a browser.
 */
export function createSweepWorkerClient(): SweepClient {
  const { sweep, emissions } = createPlannerWorkerClients();
  // Not used here: let go of it, so that disposing the sweep client ends the worker.
  emissions.dispose();
  return sweep;
}

/**
 * The sweep and the emissions analysis share one module worker (one copy of the engine): each has
 * its own newest-request-wins client, and the worker answers their calls in the order they came.
 */
export function createPlannerWorkerClients(): { sweep: SweepClient; emissions: EmissionsClient } {
  const worker = new Worker(new URL('../../workers/sweep.worker.ts', import.meta.url), { type: 'module', name: 'chokepoint-sweep' });
  const remote = Comlink.wrap<SweepApi>(worker);
  let open = 2;
  // The worker ends when both clients are disposed.
  const release = (): void => {
    open -= 1;
    if (open === 0) worker.terminate();
  };
  const sweep = new SweepClient(remote, release);
  const emissions = new EmissionsClient(remote, release);
  // Without these, a worker that fails to load leaves every request pending forever.
  worker.addEventListener('error', (event) => {
    const message = `the sweep worker stopped: ${event.message || 'its script could not be loaded'}`;
    sweep.failAll(message);
    emissions.failAll(message);
  });
  worker.addEventListener('messageerror', () => {
    sweep.failAll('the sweep worker sent a message that could not be read');
    emissions.failAll('the sweep worker sent a message that could not be read');
  });
  return { sweep, emissions };
}
