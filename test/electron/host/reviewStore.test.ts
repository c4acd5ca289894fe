import { describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, readdirSync, writeFileSync, chmodSync, mkdirSync } from 'node:fs';
import { spawn } from 'node:child_process';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { ReviewLocks, reviewPathFor, writeAtomically, REVIEW_FILE_NAME } from '../../../electron/host/reviewStore';

const repo = resolve(__dirname, '..', '..', '..');

describe('review file store', () => {
  it('puts the review beside writable data and in the user folder for read-only data', async () => {
    const base = mkdtempSync(join(tmpdir(), 'daybreak-store-'));
    const data = join(base, 'data');
    mkdirSync(data);
    expect(await reviewPathFor(data, join(base, 'user'))).toBe(join(data, REVIEW_FILE_NAME));
    // A folder without write bits counts as read-only even for root (whom the system lets write).
    chmodSync(data, 0o555);
    expect(await reviewPathFor(data, join(base, 'user'))).toMatch(/user\/reviews\/data-[0-9a-f]{16}\.review\.json$/);
  });

  it('replaces the file whole and leaves no temporary file behind', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'daybreak-atomic-'));
    const path = join(dir, 'r.json');
    await writeAtomically(path, '{"a":1}');
    await writeAtomically(path, '{"a":2}');
    expect(readFileSync(path, 'utf8')).toBe('{"a":2}');
    expect(readdirSync(dir)).toEqual(['r.json']);
  });

  it('keeps the file whole when the writing process is killed during a burst of saves', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'daybreak-kill-'));
    const path = join(dir, 'r.json');
    const script = `
      import { writeAtomically } from ${JSON.stringify(join(repo, 'electron/host/reviewStore.ts'))};
      let n = 0;
      const filler = 'x'.repeat(200000);
      for (;;) { await writeAtomically(${JSON.stringify(path)}, JSON.stringify({ n: n++, filler })); if (n === 5) process.stdout.write('go\\n'); }`;
    const scriptPath = join(dir, 'burst.mts');
    writeFileSync(scriptPath, script);
    for (let round = 0; round < 3; round++) {
      const child = spawn(process.execPath, ['--import', 'tsx', scriptPath], { cwd: repo, stdio: ['ignore', 'pipe', 'inherit'] });
      await new Promise<void>((ok) => child.stdout.once('data', () => ok()));
      await new Promise((r) => setTimeout(r, 30 + round * 40));
      child.kill('SIGKILL');
      await new Promise((r) => child.once('exit', r));
      const parsed = JSON.parse(readFileSync(path, 'utf8'));
      expect(parsed.n).toBeGreaterThanOrEqual(4);
      expect(parsed.filler).toHaveLength(200000);
    }
  }, 60_000);

  it('tells a second copy that the review is in use, and lets it take over when asked', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'daybreak-lock-'));
    const path = join(dir, REVIEW_FILE_NAME);
    const first = new ReviewLocks();
    const second = new ReviewLocks();
    expect(await first.acquire(path)).toBeNull();
    const holder = await second.acquire(path);
    expect(holder).toMatchObject({ pid: process.pid, instance: first.instance });
    expect(second.holds(path)).toBe(false);
    expect(await second.acquire(path, true)).toBeNull();
    expect(second.holds(path)).toBe(true);
  });

  it('takes over a lock left by a process that has ended', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'daybreak-stale-'));
    const path = join(dir, REVIEW_FILE_NAME);
    const child = spawn(process.execPath, ['-e', '0']);
    await new Promise((r) => child.once('exit', r));
    writeFileSync(`${path}.lock`, JSON.stringify({ pid: child.pid, host: (await import('node:os')).hostname(), instance: 'gone', since: 'then' }));
    expect(await new ReviewLocks().acquire(path)).toBeNull();
  });
});
