import * as Comlink from 'comlink';
import { sweepApi } from './sweep-api.ts';

// The worker's only job: answer sweep calls from the page off the main thread.
Comlink.expose(sweepApi);
