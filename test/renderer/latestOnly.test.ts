import { describe, expect, it } from 'vitest';
import { LatestOnly, SupersededError } from '../../renderer/latestOnly';

/** A job that finishes when the test says so. */
function gate() {
  let open = () => {};
  const done = new Promise<void>((r) => { open = r; });
  return { done, open };
}

/** A queue whose jobs record their start and finish when the test opens their gate ("done JOB"). */
function gatedQueue<T extends string | number>() {
  const started: T[] = [];
  const gates = new Map<T, ReturnType<typeof gate>>();
  const q = new LatestOnly<T, string>(async (n) => {
    started.push(n);
    const g = gate();
    gates.set(n, g);
    await g.done;
    return `done ${n}`;
  });
  return { q, started, open: (n: T) => gates.get(n)!.open() };
}

describe('LatestOnly: one job at a time, only the newest of those waiting', () => {
  it('runs the first job at once, drops jobs replaced while waiting, and runs the newest next', async () => {
    const { q, started, open } = gatedQueue<number>();
    const a = q.submit(1);
    const b = q.submit(2);
    const c = q.submit(3);
    await Promise.resolve();
    expect(started).toEqual([1]);
    await expect(b).rejects.toBeInstanceOf(SupersededError);
    open(1);
    await expect(a).resolves.toBe('done 1');
    await new Promise((r) => setTimeout(r, 0));
    expect(started).toEqual([1, 3]);
    open(3);
    await expect(c).resolves.toBe('done 3');
  });

  it('passes a failing job\'s error on and goes on with the next', async () => {
    const q = new LatestOnly<number, number>(async (n) => {
      if (n === 1) throw new RangeError('bad job 1');
      return n * 10;
    });
    const a = q.submit(1);
    const b = q.submit(2);
    await expect(a).rejects.toThrow('bad job 1');
    await expect(b).resolves.toBe(20);
  });

  it('runs background jobs in the order queued, each after any latest-only job waiting, and never drops them', async () => {
    const { q, started, open } = gatedQueue<string>();
    const b1 = q.queue('list 1');
    const b2 = q.queue('list 2');
    const stale = q.submit('open A');
    const latest = q.submit('open B');
    await Promise.resolve();
    expect(started).toEqual(['list 1']);
    expect(q.queued).toBe(1);
    await expect(stale).rejects.toBeInstanceOf(SupersededError);
    open('list 1');
    await expect(b1).resolves.toBe('done list 1');
    await new Promise((r) => setTimeout(r, 0));
    // the latest-only job goes before the background job that was queued before it
    expect(started).toEqual(['list 1', 'open B']);
    open('open B');
    await expect(latest).resolves.toBe('done open B');
    await new Promise((r) => setTimeout(r, 0));
    expect(started).toEqual(['list 1', 'open B', 'list 2']);
    open('list 2');
    await expect(b2).resolves.toBe('done list 2');
    expect(q.queued).toBe(0);
  });
});
