/**
 * Locations off the interface thread: the open event's (for the panels, after every pick edit) and
 * the event list's and exports'. A location takes 10-100 ms (Geiger iterations from several
 * starts), which on the interface thread held up drawing and the pointer each time an event opened.
 */
import { LocationJobs } from './locationJobs';
import type { LocationRequest } from './locationProtocol';

const jobs = new LocationJobs();

self.onmessage = (e: MessageEvent<LocationRequest>) => {
  (self as unknown as Worker).postMessage(jobs.answer(e.data));
};
