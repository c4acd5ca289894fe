/**
 * The overnight scan run for the review desk: the host starts `daybreak scan` on the opened dataset
 * as a child process (so the interface never waits on it), keeps its state, and hands its QuakeML to
 * the renderer when it is done. The output goes beside the review file as `daybreak-scan.xml`.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { readFile } from 'node:fs/promises';
import { existsSync, unlinkSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import type { ScanPresetSetting, ScanStatus } from '../contract';
import { atomicTempPath } from './atomicTemp';

export const SCAN_OUTPUT_NAME = 'daybreak-scan.xml';

interface Job {
  status: ScanStatus;
  child: ChildProcess | null;
  output: string;
  /** Set by cancel(): the child has been signalled; the state stays 'running' until it is gone. */
  cancelling: boolean;
  /** SIGKILL for a child that outlives its SIGTERM. */
  killTimer: NodeJS.Timeout | null;
}

/** How long a cancelled scan may take to end on SIGTERM before it is killed outright, ms. */
const CANCEL_GRACE_MS = 5000;

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

  /**
   * `cli`: the command-line script to run (default bin/daybreak.mjs beside the app); `execPath`: the
   * program that runs it (default this process's own, as plain Node); `cancelGraceMs`: how long a
   * cancelled scan may take to end on SIGTERM before SIGKILL (default CANCEL_GRACE_MS). For tests.
   */
  constructor(private readonly opts: { cli?: string; execPath?: string; cancelGraceMs?: number } = {}) {}

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
    const args = [this.opts.cli ?? cliPath(), 'scan', '--progress', 'lines', '--preset', preset, '--stations', stations, '--out', output, ...(model ? ['--model', model] : []), root];
    const started = Date.now();
    const job: Job = { status: { state: 'running', message: 'scanning the night', fraction: null, startedAt: new Date(started).toISOString(), seconds: 0 }, child: null, output, cancelling: false, killTimer: null };
    // Under Electron, process.execPath is Electron itself: ask it to behave as plain Node.
    const child = spawn(this.opts.execPath ?? process.execPath, args, { stdio: ['ignore', 'pipe', 'pipe'], env: { ...process.env, ELECTRON_RUN_AS_NODE: '1' } });
    job.child = child;
    const pid = child.pid;
    let out = '';
    // The summary's head (counts and the settings used) is what the desk shows; stderr's tail says why a scan failed.
    let head = '';
    // Decoded as UTF-8 across chunk borders (the summary holds characters such as '±' and '·').
    child.stdout?.setEncoding('utf8');
    child.stderr?.setEncoding('utf8');
    child.stdout?.on('data', (text: string) => { if (head.length < 4000) head += text; });
    // stderr: progress lines ("progress FRACTION WHAT") become the status; anything else is kept to say why a scan failed.
    let partial = '';
    const takeLine = (line: string) => {
      const m = /^progress (\d+(?:\.\d+)?) (.*)$/.exec(line);
      if (m && !job.cancelling) job.status = { ...job.status, fraction: Number(m[1]), message: m[2] };
      else if (!m) out = (out + line + '\n').slice(-4000);
    };
    child.stderr?.on('data', (text: string) => {
      const lines = (partial + text).split('\n');
      partial = lines.pop() ?? '';
      for (const line of lines) takeLine(line);
    });
    const tick = setInterval(() => { job.status = { ...job.status, seconds: (Date.now() - started) / 1000 }; }, 500);
    let ended = false;
    const end = (code: number | null, signal: NodeJS.Signals | null, spawnError: Error | null) => {
      if (ended) return;
      ended = true;
      clearInterval(tick);
      if (job.killTimer) clearTimeout(job.killTimer);
      const seconds = (Date.now() - started) / 1000;
      job.child = null;
      // The last line of a child that died mid-line (an error printed without a newline).
      if (partial) takeLine(partial);
      partial = '';
      // Done only with the summary printed: exit code 1 is also Node's for a crash before the scan ran.
      const finished = spawnError === null && signal === null && (code === 0 || code === 1) && /^daybreak scan:/m.test(head);
      // A scan killed (or failed) while writing its output leaves its temporary file: remove it; the
      // previous output stays as it was.
      if (!finished && pid !== undefined) {
        try { unlinkSync(atomicTempPath(output, pid)); } catch { /* none was left */ }
      }
      const summary = head.split('\n').filter((l) => /^daybreak scan:|^ {2}settings:/.test(l)).map((l) => l.trim().replace(/^daybreak scan: /, '')).join(' \u00b7 ');
      const settings = /^ {2}settings: (.+)$/m.exec(head)?.[1];
      // Why it stopped: the error line of a crash (Node prints it above the stack), else the last lines.
      const tail = (out.trim() || head.trim()).split('\n');
      const errorLine = tail.filter((l) => /^(daybreak\b|\w*Error\b)/.test(l)).at(-1);
      const last = errorLine ?? tail.slice(-3).join(' \u00b7 ');
      // A cancel that reached a child already past its last write (or exiting) stopped nothing: its
      // output has been replaced, so the scan is reported done.
      const how = `done${job.cancelling ? ' before the cancel arrived' : ''}${code === 1 ? '; some input was reported' : ''}`;
      job.status = job.cancelling && !finished
        ? { state: 'cancelled', message: 'cancelled by the analyst', fraction: null, startedAt: job.status.startedAt, seconds }
        : spawnError
        ? { state: 'failed', message: `scan could not start: ${spawnError.message}`, fraction: null, startedAt: job.status.startedAt, seconds }
        : finished
          ? { state: 'done', message: `${how}: ${summary || last}`, fraction: 1, startedAt: job.status.startedAt, seconds, ...(settings ? { settings } : {}) }
          : { state: 'failed', message: `scan stopped (${signal ? `killed by ${signal}` : `exit ${code}`}): ${last}`, fraction: null, startedAt: job.status.startedAt, seconds };
    };
    // 'close', not 'exit': only then has all of the child's output been read.
    child.on('close', (code, signal) => end(code, signal, null));
    // The program could not be started (or the child could not be signalled); no 'close' may follow.
    child.on('error', (e) => { if (pid === undefined) end(null, null, e); });
    this.jobs.set(root, job);
    return this.status(root);
  }

  /**
   * Stops the running scan of `root`, if any: signals the child (SIGTERM, SIGKILL after
   * CANCEL_GRACE_MS). The state stays 'running' (message 'cancelling') until the child is gone, then
   * becomes 'cancelled', with the previous output file as it was, or 'done' when the scan had
   * already written its output (the cancel came too late). A new start waits for that.
   */
  cancel(root: string): ScanStatus {
    const job = this.jobs.get(root);
    if (job?.status.state === 'running' && !job.cancelling && job.child) {
      job.cancelling = true;
      job.status = { ...job.status, message: 'cancelling' };
      const child = job.child;
      child.kill();
      job.killTimer = setTimeout(() => child.kill('SIGKILL'), this.opts.cancelGraceMs ?? CANCEL_GRACE_MS);
      job.killTimer.unref();
    }
    return this.status(root);
  }

  async result(root: string): Promise<string | null> {
    const job = this.jobs.get(root);
    if (!job || job.status.state !== 'done') return null;
    return readFile(job.output, 'utf8');
  }

  /**
   * Kills every running scan as the app quits, and removes at once any temporary output each left
   * (no 'close' event may come before the app's own exit).
   */
  stopAll(): void {
    for (const j of this.jobs.values()) {
      const child = j.child;
      if (!child) continue;
      child.kill();
      if (child.pid !== undefined) {
        try { unlinkSync(atomicTempPath(j.output, child.pid)); } catch { /* none was left */ }
      }
    }
  }
}
