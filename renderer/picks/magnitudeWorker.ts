/**
 * Local magnitudes computed off the interface thread: response removal and Wood-Anderson simulation
 * of every horizontal take 10-20 ms per channel, which on the interface thread would hold up drawing
 * and the pointer for a second at a dozen stations. The open event's (kept raw pieces, so an edit
 * that does not change what is read, an amplitude moved or removed, sends only the event) and the
 * event list's and exports' (pieces for one job each). See magnitudeJobs.ts.
 */
import { MagnitudeJobs } from './magnitudeJobs';
import type { MagnitudeRequest } from './magnitudeProtocol';

const jobs = new MagnitudeJobs();

self.onmessage = (e: MessageEvent<MagnitudeRequest>) => {
  (self as unknown as Worker).postMessage(jobs.answer(e.data));
};
