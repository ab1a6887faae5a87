import { createScanImportWorkerClient } from '../client/scan-import-client.ts';
import { createPlannerWorkerClients } from '../client/sweep-worker-client.ts';
import './app/chokepoint-app.ts';

// The page's one piece of wiring: the app gets its worker-backed clients before it starts. The sweep
// and the emissions analysis share the engine's worker; scan files are read in a worker of their own.
const { sweep, emissions } = createPlannerWorkerClients();
const app = document.createElement('chokepoint-app');
app.sweepClient = sweep;
app.emissionsClient = emissions;
app.scanImporter = createScanImportWorkerClient();
document.body.append(app);
