import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdirSync, readdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { atomicTempPath } from '../../../electron/host/atomicTemp';
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

  it('stops on cancel: says it is cancelling until the child is gone, then cancelled, and leaves the previous output file as it was', async () => {
    const jobs = new ScanJobs();
    const out = join(dir, 'cancel');
    mkdirSync(out);
    writeFileSync(join(out, SCAN_OUTPUT_NAME), 'previous scan\n');
    jobs.start(data, join(data, 'stations.xml'), out, null, 'local');
    await new Promise((r) => setTimeout(r, 100));
    expect(jobs.cancel(data)).toMatchObject({ state: 'running', message: 'cancelling' });
    // A start while it is cancelling does not start a second scan.
    expect(jobs.start(data, join(data, 'stations.xml'), out, null, 'local')).toMatchObject({ state: 'running', message: 'cancelling' });
    const seen = await pollUntil(jobs, data, (s) => s.state !== 'running');
    expect(seen.every((s) => s.state === 'cancelled' || s.message === 'cancelling')).toBe(true);
    expect(seen.at(-1)).toMatchObject({ state: 'cancelled', message: 'cancelled by the analyst', fraction: null });
    // The child is gone: nothing changes the status or the file any more.
    await new Promise((r) => setTimeout(r, 1500));
    expect(jobs.status(data).state).toBe('cancelled');
    expect(await jobs.result(data)).toBeNull();
    expect(readFileSync(join(out, SCAN_OUTPUT_NAME), 'utf8')).toBe('previous scan\n');
    expect(readdirSync(out)).toEqual([SCAN_OUTPUT_NAME]);
    // Cancelling when nothing runs changes nothing.
    expect(jobs.cancel(data).state).toBe('cancelled');
  }, 60_000);

  /**
   * A stand-in for bin/daybreak.mjs that behaves as the script `body` says (Node, ES module; `out` is
   * the --out path it was given), for the ways a child can end that the real scan shows only by chance.
   */
  function fakeCli(name: string, body: string): string {
    const path = join(dir, `${name}.mjs`);
    writeFileSync(path, `const out = process.argv[process.argv.indexOf('--out') + 1];\n${body}\n`);
    return path;
  }

  /**
   * Starts a job on the stand-in `body` with its output in a new folder `name` (holding a previous
   * output when `previous` is given); `opts` as ScanJobs takes them.
   */
  function startFake(name: string, body: string, previous?: string, opts: { execPath?: string; cancelGraceMs?: number } = {}): { jobs: ScanJobs; out: string } {
    const out = join(dir, name);
    mkdirSync(out);
    if (previous !== undefined) writeFileSync(join(out, SCAN_OUTPUT_NAME), previous);
    const jobs = new ScanJobs({ cli: fakeCli(name, body), ...opts });
    jobs.start(data, 'S', out, null, 'local');
    return { jobs, out };
  }

  /**
   * A stand-in stopped inside daybreak scan's atomic write (writeAtomically): its temporary file
   * written in the output folder `name`, the rename not yet done.
   */
  function stuckInWrite(name: string): string {
    const tmpFor = atomicTempPath(join(dir, name, SCAN_OUTPUT_NAME), 999_999_999);
    return `
import { writeFileSync } from 'node:fs';
writeFileSync(${JSON.stringify(tmpFor)}.replace('999999999', String(process.pid)), '<q:quakeml>half');
process.stderr.write('progress 1.0000 writing\\n');
setTimeout(() => {}, 60_000);`;
  }

  /** The first status of `jobs` that is no longer running. */
  async function settled(jobs: ScanJobs): Promise<ScanStatus> {
    return (await pollUntil(jobs, data, (s) => s.state !== 'running')).at(-1)!;
  }

  it('keeps the last line a dying scan printed without a newline, and names the signal that killed it', async () => {
    const dies = startFake('dies', `
process.stderr.write('progress 0.2500 reading\\nRangeError: the disk is full');
setTimeout(() => process.exit(3), 50);`);
    const failed = await settled(dies.jobs);
    expect(failed).toMatchObject({ state: 'failed', fraction: null });
    expect(failed.message).toBe('scan stopped (exit 3): RangeError: the disk is full');
    const killed = startFake('killed', `process.stderr.write('progress 0.5 picking\\n'); setTimeout(() => process.kill(process.pid, 'SIGKILL'), 50);`);
    const last = await settled(killed.jobs);
    expect(last.state).toBe('failed');
    expect(last.message).toMatch(/^scan stopped \(killed by SIGKILL\)/);
  }, 30_000);

  it('takes a crash before the scan ran (Node\'s exit code 1, no summary) for a failure, naming the error, not for a scan done', async () => {
    const { jobs } = startFake('crash', `await import('no-such-package-here');`, 'previous scan\n');
    const last = await settled(jobs);
    expect(last).toMatchObject({ state: 'failed', fraction: null });
    expect(last.message).toMatch(/^scan stopped \(exit 1\): Error \[ERR_MODULE_NOT_FOUND\]: Cannot find package 'no-such-package-here'/);
    expect(await jobs.result(data)).toBeNull();
  }, 30_000);

  it('reads the summary to its end even when the child\'s output outlives it (a grandchild holding stdout)', async () => {
    // The child exits at once; what it started writes the summary 300 ms later on the same stdout.
    const { jobs } = startFake('late', `
import { spawn } from 'node:child_process';
import { writeFileSync } from 'node:fs';
writeFileSync(out, '<q:quakeml/>');
spawn(process.execPath, ['-e', "setTimeout(() => process.stdout.write('daybreak scan: 3 candidate events\\\\n  settings: near\\\\n'), 300)"], { stdio: ['ignore', 'inherit', 'inherit'] }).unref();
process.exit(0);`);
    expect(await settled(jobs)).toMatchObject({ state: 'done', fraction: 1, message: 'done: 3 candidate events · settings: near' });
  }, 30_000);

  it('says the scan finished when a cancel came too late to stop it, since its output was replaced', async () => {
    // The output is written, then the child takes a moment to exit and does not die of the cancel's
    // signal (as a child that has already exited does not).
    const { jobs, out } = startFake('finishing', `
process.on('SIGTERM', () => {});
import { writeFileSync } from 'node:fs';
writeFileSync(out, '<q:quakeml>new</q:quakeml>');
process.stdout.write('daybreak scan: 1 candidate event\\n');
setTimeout(() => process.exit(0), 400);`, 'previous scan\n');
    for (let i = 0; i < 500 && readFileSync(join(out, SCAN_OUTPUT_NAME), 'utf8') === 'previous scan\n'; i++) await new Promise((r) => setTimeout(r, 10));
    expect(jobs.cancel(data)).toMatchObject({ state: 'running', message: 'cancelling' });
    expect(await settled(jobs)).toMatchObject({ state: 'done', fraction: 1, message: 'done before the cancel arrived: 1 candidate event' });
    expect(await jobs.result(data)).toBe('<q:quakeml>new</q:quakeml>');
  }, 30_000);

  it('removes the temporary file of a scan killed while writing its output, and leaves the previous output', async () => {
    // As daybreak scan's atomic write: the whole text into the temporary file, then a rename; the
    // cancel's SIGTERM lands between the two.
    const { jobs, out } = startFake('mid-write', stuckInWrite('mid-write'), 'previous scan\n');
    await pollUntil(jobs, data, (s) => s.fraction === 1);
    expect(readdirSync(out).length).toBe(2);
    jobs.cancel(data);
    expect((await settled(jobs)).state).toBe('cancelled');
    expect(readdirSync(out)).toEqual([SCAN_OUTPUT_NAME]);
    expect(readFileSync(join(out, SCAN_OUTPUT_NAME), 'utf8')).toBe('previous scan\n');
  }, 30_000);

  it('stopAll (the app quitting) kills the scan and removes its temporary output at once', async () => {
    const { jobs, out } = startFake('quit', stuckInWrite('quit'), 'previous scan\n');
    await pollUntil(jobs, data, (s) => s.fraction === 1);
    expect(readdirSync(out).length).toBe(2);
    jobs.stopAll();
    expect(readdirSync(out)).toEqual([SCAN_OUTPUT_NAME]);
    expect((await settled(jobs)).state).toBe('failed');
  }, 30_000);

  it('kills a cancelled scan that does not end on SIGTERM once its grace time is over', async () => {
    const { jobs } = startFake('stubborn', `process.on('SIGTERM', () => {}); process.stderr.write('progress 0.1 reading\\n'); setInterval(() => {}, 1000);`, undefined, { cancelGraceMs: 800 });
    await pollUntil(jobs, data, (s) => s.fraction !== null);
    const t0 = Date.now();
    jobs.cancel(data);
    expect(await settled(jobs)).toMatchObject({ state: 'cancelled', message: 'cancelled by the analyst' });
    expect(Date.now() - t0).toBeGreaterThanOrEqual(750);
    expect(Date.now() - t0).toBeLessThan(5000);
  }, 30_000);

  it('fails with the reason, not a crash of the host, when the scan program cannot be started', async () => {
    const { jobs } = startFake('no-node', '', undefined, { execPath: join(dir, 'no-such-node') });
    const last = await settled(jobs);
    expect(last.state).toBe('failed');
    expect(last.message).toMatch(/^scan could not start: .*ENOENT/);
  }, 30_000);
});
