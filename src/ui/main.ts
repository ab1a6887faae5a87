import { createSweepWorkerClient } from '../client/sweep-worker-client.ts';
import './app/chokepoint-app.ts';

// The page's one piece of wiring: the app gets the worker-backed sweep client before it starts.
const app = document.createElement('chokepoint-app');
app.sweepClient = createSweepWorkerClient();
document.body.append(app);
