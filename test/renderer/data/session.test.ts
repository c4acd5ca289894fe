import { describe, expect, it } from 'vitest';
import { piecesByChannel, shareOut } from '../../../renderer/data/session';
import type { WindowChunk, WindowPiece } from '../../../renderer/data/protocol';

const chunk = (path: string, bytes: number): WindowChunk => ({ path, base: 0, bytes: new Uint8Array(bytes) });

describe('shareOut', () => {
  it('deals chunks to workers by size, largest first, each to the lightest worker', () => {
    const chunks = [chunk('a', 100), chunk('b', 400), chunk('c', 300), chunk('d', 200)];
    const g = shareOut(chunks, [new Set(['A']), new Set(['B']), new Set(['C']), new Set(['D'])], 2);
    expect(g.map((x) => x.chunks.map((c) => c.path))).toEqual([['b', 'a'], ['c', 'd']]);
    expect(g.map((x) => [...x.channels].sort())).toEqual([['A', 'B'], ['C', 'D']]);
  });

  it('keeps chunks that share a channel together (a channel over two day files is filtered as one)', () => {
    const chunks = [chunk('z1', 100), chunk('n', 100), chunk('z2', 100), chunk('e', 100)];
    const g = shareOut(chunks, [new Set(['Z']), new Set(['N']), new Set(['Z']), new Set(['E', 'N'])], 2);
    const where = (p: string) => g.findIndex((x) => x.chunks.some((c) => c.path === p));
    expect(where('z1')).toBe(where('z2'));
    expect(where('n')).toBe(where('e'));
    expect(where('z1')).not.toBe(where('n'));
  });

  it('leaves out workers with nothing to do and rejects a worker count below 1 or unmatched channel sets', () => {
    expect(shareOut([chunk('a', 10)], [new Set(['A'])], 4)).toHaveLength(1);
    expect(shareOut([], [], 2)).toEqual([]);
    expect(() => shareOut([chunk('a', 10)], [new Set(['A'])], 0)).toThrow(RangeError);
    expect(() => shareOut([chunk('a', 10)], [], 2)).toThrow(/one channel set per chunk/);
  });
});

describe('piecesByChannel', () => {
  it('groups pieces by channel key in the order given', () => {
    const piece = (key: string, start: number) => ({ key, start, sampleRate: 100, samples: new Float32Array(1), rawPeak: 0, clipped: false, flat: false, envelope: { length: 1, levels: [] } }) as WindowPiece;
    const m = piecesByChannel([piece('Z', 1), piece('N', 2), piece('Z', 3)]);
    expect([...m.keys()]).toEqual(['Z', 'N']);
    expect(m.get('Z')!.map((p) => p.start)).toEqual([1, 3]);
  });
});
