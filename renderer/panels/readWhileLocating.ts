/**
 * Opening an event needs its location before the sheet's rows can be ordered and limited (sites by
 * distance from the epicentre, the km limit, the distances on the rows), and the location now comes
 * from a worker (locationClient.ts). Rather than wait for it and then read, the rows in view are
 * read at once as a guess lays them out (the last solution drawn, or none: the sites with picks come
 * first in pick order either way), and once the location is there only the channels its layout
 * needs that the guess did not are read as well. The layout used is always the located one.
 */
import type { WindowReply } from '../data/protocol';

export interface WhileLocating<L> {
  /** The layout made from the location. */
  layout: L;
  /** The pieces of every channel `channels(layout)` names (and maybe some more, read for the guess). */
  reply: WindowReply;
  /** Time spent waiting for the location after the read was started, ms. */
  waitMs: number;
  /** Channels read because the guess lacked them (0: the guess held every one). */
  extra: number;
}

/**
 * Reads `channels(guess)` at once, waits for `located` (the layout from the location), then reads
 * what `channels` of that layout adds. `read` reads channels (e.g. DataSession.window).
 */
export async function readWhileLocating<L>(
  guess: L, located: Promise<L>, channels: (layout: L) => string[], read: (channels: string[]) => Promise<WindowReply>,
): Promise<WhileLocating<L>> {
  const first = channels(guess);
  const reading = read(first);
  // Awaited below unless the location fails first: then its failure is the one passed on.
  reading.catch(() => {});
  const t0 = performance.now();
  const layout = await located;
  const waitMs = performance.now() - t0;
  const reply = await reading;
  const have = new Set(first);
  const missing = channels(layout).filter((c) => !have.has(c));
  if (missing.length === 0) return { layout, reply, waitMs, extra: 0 };
  const more = await read(missing);
  return {
    layout, waitMs, extra: missing.length,
    reply: { ...reply, pieces: [...reply.pieces, ...more.pieces], notes: [...reply.notes, ...more.notes], errors: [...reply.errors, ...more.errors] },
  };
}
