/**
 * The temporary files of `daybreak scan`'s atomic output write (electron/host/cli/scan.ts
 * writeAtomically): their name, and the removal of those that killed runs left. Shared by the
 * command and by the desk's scan job (scanJob.ts), which removes what a scan it stopped left.
 */
import { readdirSync, unlinkSync } from 'node:fs';
import { basename, dirname, join } from 'node:path';
import { processAlive } from './processes';

/**
 * The temporary file `daybreak scan` writes its output to before renaming it over `path`: in the
 * output's folder, so the rename stays on one file system.
 */
export function atomicTempPath(path: string, pid: number): string {
  return join(dirname(path), `.${basename(path)}.${pid}.tmp`);
}

/**
 * Removes the temporary files that earlier runs writing `path` left when they were killed between
 * writing and renaming (a SIGKILL or a power cut runs no handler): those of `atomicTempPath` form
 * whose process is gone. A live writer's file is left alone. Returns the names removed.
 */
export function removeStaleTemps(path: string): string[] {
  const dir = dirname(path);
  const prefix = `.${basename(path)}.`;
  const removed: string[] = [];
  let names: string[];
  try { names = readdirSync(dir); } catch { return removed; }
  for (const name of names) {
    if (!name.startsWith(prefix) || !name.endsWith('.tmp')) continue;
    const pidText = name.slice(prefix.length, -'.tmp'.length);
    if (!/^\d+$/.test(pidText)) continue;
    const pid = Number(pidText);
    if (pid === process.pid || processAlive(pid)) continue;
    try {
      unlinkSync(join(dir, name));
      removed.push(name);
    } catch { /* removed meanwhile */ }
  }
  return removed;
}
