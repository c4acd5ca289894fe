/**
 * The overnight scan run for the review desk: the host starts `daybreak scan` on the opened dataset
 * as a child process (so the interface never waits on it), keeps its state, and hands its QuakeML to
 * the renderer when it is done. The output goes beside the review file as `daybreak-scan.xml`.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { readFile } from 'node:fs/promises';
import { existsSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { ScanPresetSetting, ScanStatus } from '../contract';

export const SCAN_OUTPUT_NAME = 'daybreak-scan.xml';

interface Job { status: ScanStatus; child: ChildProcess | null; output: string }

function cliPath(): string {
  // bin/daybreak.mjs from this file (electron/host) or from the bundled shell (dist/electron).
  const here = typeof __dirname === 'string' ? __dirname : dirname(fileURLToPath(import.meta.url));
  for (const up of [['..', '..'], ['..', '..', '..']]) {
    const p = resolve(here, ...up, 'bin', 'daybreak.mjs');
    if (existsSync(p)) return p;
  }
  throw new Error('bin/daybreak.mjs not found beside the app');
}

export class ScanJobs {
  private readonly jobs = new Map<string, Job>();

  status(root: string): ScanStatus {
    return { ...(this.jobs.get(root)?.status ?? { state: 'idle', message: '', fraction: null, startedAt: null, seconds: 0 }) };
  }

  /**
   * Starts a scan of `root` unless one is running; `stations` is the StationXML, `outDir` where the
   * QuakeML goes, `preset` the scan's settings ('auto': chosen from the network's size).
   */
  start(root: string, stations: string, outDir: string, model: string | null, preset: ScanPresetSetting = 'auto'): ScanStatus {
    const running = this.jobs.get(root);
    if (running?.status.state === 'running') return this.status(root);
    const output = join(outDir, SCAN_OUTPUT_NAME);
    const args = [cliPath(), 'scan', '--progress', 'lines', '--preset', preset, '--stations', stations, '--out', output, ...(model ? ['--model', model] : []), root];
    const started = Date.now();
    const job: Job = { status: { state: 'running', message: 'scanning the night', fraction: null, startedAt: new Date(started).toISOString(), seconds: 0 }, child: null, output };
    // Under Electron, process.execPath is Electron itself: ask it to behave as plain Node.
    const child = spawn(process.execPath, args, { stdio: ['ignore', 'pipe', 'pipe'], env: { ...process.env, ELECTRON_RUN_AS_NODE: '1' } });
    job.child = child;
    let out = '';
    // The summary's head (counts and the settings used) is what the desk shows; stderr's tail says why a scan failed.
    let head = '';
    child.stdout?.on('data', (b: Buffer) => { if (head.length < 4000) head += b.toString(); });
    // stderr: progress lines ("progress FRACTION WHAT") become the status; anything else is kept to say why a scan failed.
    let partial = '';
    child.stderr?.on('data', (b: Buffer) => {
      const lines = (partial + b.toString()).split('\n');
      partial = lines.pop() ?? '';
      for (const line of lines) {
        const m = /^progress (\d+(?:\.\d+)?) (.*)$/.exec(line);
        if (m && job.status.state === 'running') job.status = { ...job.status, fraction: Number(m[1]), message: m[2] };
        else if (!m) out = (out + line + '\n').slice(-4000);
      }
    });
    const tick = setInterval(() => { job.status = { ...job.status, seconds: (Date.now() - started) / 1000 }; }, 500);
    child.on('exit', (code) => {
      clearInterval(tick);
      const seconds = (Date.now() - started) / 1000;
      job.child = null;
      if (job.status.state === 'cancelled') { job.status = { ...job.status, seconds }; return; }
      const summary = head.split('\n').filter((l) => /^daybreak scan:|^ {2}settings:/.test(l)).map((l) => l.trim().replace(/^daybreak scan: /, '')).join(' \u00b7 ');
      const last = (out.trim() || head.trim()).split('\n').slice(-3).join(' \u00b7 ');
      job.status = code === 0 || code === 1
        ? { state: 'done', message: code === 1 ? `done; some input was reported: ${summary || last}` : `done: ${summary || last}`, fraction: 1, startedAt: job.status.startedAt, seconds }
        : { state: 'failed', message: `scan stopped (exit ${code}): ${last}`, fraction: null, startedAt: job.status.startedAt, seconds };
    });
    this.jobs.set(root, job);
    return this.status(root);
  }

  /** Stops the running scan of `root`, if any; the previous output file stays as it was. */
  cancel(root: string): ScanStatus {
    const job = this.jobs.get(root);
    if (job?.status.state === 'running') {
      job.status = { ...job.status, state: 'cancelled', message: 'cancelled by the analyst', fraction: null };
      job.child?.kill();
    }
    return this.status(root);
  }

  async result(root: string): Promise<string | null> {
    const job = this.jobs.get(root);
    if (!job || job.status.state !== 'done') return null;
    return readFile(job.output, 'utf8');
  }

  stopAll(): void {
    for (const j of this.jobs.values()) j.child?.kill();
  }
}
