// Entry of the demo writer's worker threads: the worker runs TypeScript through tsx, as bin/daybreak.mjs does.
import { register } from 'tsx/esm/api';

register();
await import('./scenarioWorker.ts');
