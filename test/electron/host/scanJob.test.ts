import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { SCAN_OUTPUT_NAME, ScanJobs } from '../../../electron/host/scanJob';
import type { ScanStatus } from '../../../electron/contract';
import { writeSmallNight } from './cli/scanFixture';

/** Polls `jobs` for `root` every 10 ms until `done` holds (at most 60 s); returns every status seen. */
async function pollUntil(jobs: ScanJobs, root: string, done: (s: ScanStatus) => boolean): Promise<ScanStatus[]> {
  const seen: ScanStatus[] = [];
  for (let i = 0; i < 6000; i++) {
    const s = jobs.status(root);
    seen.push(s);
    if (done(s)) return seen;
    await new Promise((r) => setTimeout(r, 10));
  }
  throw new Error(`scan of ${root} never reached the expected state: ${JSON.stringify(seen.at(-1))}`);
}

describe('the desk\'s background scan job (daybreak scan as a child process)', () => {
  let dir: string;
  let data: string;

  beforeAll(() => {
    dir = mkdtempSync(join(tmpdir(), 'daybreak-scanjob-'));
    data = join(dir, 'night');
    writeSmallNight(data);
  }, 60_000);
  afterAll(() => { rmSync(dir, { recursive: true, force: true }); });

  it('reports its progress while running, then the summary with the settings it chose', async () => {
    const jobs = new ScanJobs();
    const out = join(dir, 'run');
    mkdirSync(out);
    const first = jobs.start(data, join(data, 'stations.xml'), out, join(data, 'model.json'), 'auto');
    expect(first).toMatchObject({ state: 'running', fraction: null });
    const seen = await pollUntil(jobs, data, (s) => s.state !== 'running');
    const last = seen[seen.length - 1];
    expect(last.state).toBe('done');
    expect(last.fraction).toBe(1);
    // The summary's first line and its settings line (the small night's ring is 20 km across: local).
    expect(last.message).toMatch(/^done: 2 candidate events, \d+ P and \d+ S picks written to .* · settings: local \(auto: local-earthquake settings/);
    // Progress arrived as fractions that never went back.
    const fractions = seen.filter((s) => s.state === 'running' && s.fraction !== null).map((s) => s.fraction!);
    expect(fractions.length).toBeGreaterThan(0);
    expect(fractions.every((f, i) => i === 0 || f >= fractions[i - 1])).toBe(true);
    expect(await jobs.result(data)).toContain('<q:quakeml');
  }, 90_000);

  it('stops on cancel, says so, and leaves the previous output file as it was', async () => {
    const jobs = new ScanJobs();
    const out = join(dir, 'cancel');
    mkdirSync(out);
    writeFileSync(join(out, SCAN_OUTPUT_NAME), 'previous scan\n');
    jobs.start(data, join(data, 'stations.xml'), out, null, 'local');
    await new Promise((r) => setTimeout(r, 100));
    expect(jobs.cancel(data)).toMatchObject({ state: 'cancelled', message: 'cancelled by the analyst', fraction: null });
    const seen = await pollUntil(jobs, data, (s) => s.seconds > 0 && s.state === 'cancelled');
    expect(seen.every((s) => s.state === 'cancelled')).toBe(true);
    // The child is gone: nothing changes the status or the file any more.
    await new Promise((r) => setTimeout(r, 1500));
    expect(jobs.status(data).state).toBe('cancelled');
    expect(await jobs.result(data)).toBeNull();
    expect(readFileSync(join(out, SCAN_OUTPUT_NAME), 'utf8')).toBe('previous scan\n');
    expect(existsSync(join(out, `.${SCAN_OUTPUT_NAME}.tmp`))).toBe(false);
    // Cancelling when nothing runs changes nothing.
    expect(jobs.cancel(data).state).toBe('cancelled');
  }, 60_000);
});
