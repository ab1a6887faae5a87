import { startPlanner } from './app/start-planner.ts';

// The page's one piece of wiring: everything else is in start-planner.ts.
void startPlanner(document.body);
