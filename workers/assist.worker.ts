import * as Comlink from 'comlink';
import { assistApi } from './assist-api.ts';

// The worker's only job: run the design assistants off the main thread (docs/assistants.md).
Comlink.expose(assistApi);
