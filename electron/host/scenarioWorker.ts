/** Worker thread of the demo writer: renders and writes the stations it is given (see scenario.ts). */
import { parentPort, workerData } from 'node:worker_threads';
import type { Scenario } from '../../core/synth/types';
import { writeStations } from './scenarioStations';

const { scenario, root, codes } = workerData as { scenario: Scenario; root: string; codes: string[] };
const done = await writeStations(scenario, root, codes, (code) => parentPort!.postMessage({ kind: 'station', code }));
parentPort!.postMessage({ kind: 'done', done });
