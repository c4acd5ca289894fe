import { describe, expect, it } from 'vitest';
import { readWhileLocating } from '../../../renderer/panels/readWhileLocating';
import type { WindowPiece, WindowReply } from '../../../renderer/data/protocol';

/** A reader that records what it was asked for and answers one piece per channel, named after it. */
function reader() {
  const asked: string[][] = [];
  const read = async (channels: string[]): Promise<WindowReply> => {
    asked.push(channels);
    return { type: 'window', id: 0, pieces: channels.map((key) => ({ key }) as unknown as WindowPiece), notes: [`read ${channels.length}`], errors: [], timing: { decodeMs: 0, filterMs: 0, packMs: 0 } };
  };
  return { asked, read };
}

const later = <T>(value: T) => new Promise<T>((r) => setTimeout(() => r(value), 5));

describe('readWhileLocating: the rows in view read while the location comes', () => {
  it('reads the guess\'s channels before the location arrives and nothing more when the located layout needs the same', async () => {
    const { asked, read } = reader();
    const located = later(['A.Z', 'B.Z']);
    const p = readWhileLocating(['B.Z', 'A.Z'], located, (l) => l, read);
    expect(asked).toEqual([['B.Z', 'A.Z']]);
    const r = await p;
    expect(r.layout).toEqual(['A.Z', 'B.Z']);
    expect(r.extra).toBe(0);
    expect(asked).toHaveLength(1);
    expect(r.reply.pieces.map((x) => x.key)).toEqual(['B.Z', 'A.Z']);
    expect(r.waitMs).toBeGreaterThan(0);
  });

  it('reads only the channels the located layout adds, and hands back the pieces and notes of both reads', async () => {
    const { asked, read } = reader();
    const r = await readWhileLocating(['A.Z', 'B.Z'], later(['A.Z', 'C.Z', 'D.Z']), (l) => l, read);
    expect(asked).toEqual([['A.Z', 'B.Z'], ['C.Z', 'D.Z']]);
    expect(r.extra).toBe(2);
    expect(r.layout).toEqual(['A.Z', 'C.Z', 'D.Z']);
    expect(r.reply.pieces.map((x) => x.key)).toEqual(['A.Z', 'B.Z', 'C.Z', 'D.Z']);
    expect(r.reply.notes).toEqual(['read 2', 'read 2']);
  });

  it('passes a failed location on, and a read failing meanwhile raises no unhandled rejection', async () => {
    const failing = async (): Promise<WindowReply> => { throw new Error('read failed'); };
    await expect(readWhileLocating(['A.Z'], Promise.reject(new Error('no location')), (l) => l, failing)).rejects.toThrow('no location');
    await expect(readWhileLocating(['A.Z'], later(['A.Z']), (l) => l, failing)).rejects.toThrow('read failed');
  });
});
