/**
 * Where the review file of a dataset lives and how it is written: beside the data
 * (`daybreak.review.json` in the dataset folder) when that folder is writable, else in the user's
 * folder under a name derived from the dataset path. Every save writes a temporary file, flushes it
 * to disk and renames it over the old one, so a crash at any moment leaves either the old or the new
 * file whole. A lock file beside it tells a second copy of the app that the file is in use.
 */
import { access, constants, mkdir, open, readFile, rename, stat, unlink, writeFile } from 'node:fs/promises';
import { createHash, randomUUID } from 'node:crypto';
import { hostname } from 'node:os';
import { basename, dirname, join } from 'node:path';
import { processAlive } from './processes';

export const REVIEW_FILE_NAME = 'daybreak.review.json';

export interface LockInfo { pid: number; host: string; instance: string; since: string }

/**
 * Whether Daybreak may write into `dir`: the operating system must allow it AND the folder must carry
 * a write permission bit (so a folder marked read-only is respected even by a root user, whom the
 * system would let write anyway).
 */
export async function folderWritable(dir: string): Promise<boolean> {
  const st = await stat(dir).catch(() => null);
  if (!st || (st.mode & 0o222) === 0) return false;
  return access(dir, constants.W_OK).then(() => true, () => false);
}

export async function reviewPathFor(datasetRoot: string, userDir: string): Promise<string> {
  const writable = await folderWritable(datasetRoot);
  if (writable) return join(datasetRoot, REVIEW_FILE_NAME);
  const tag = createHash('sha256').update(datasetRoot).digest('hex').slice(0, 16);
  return join(userDir, 'reviews', `${basename(datasetRoot) || 'dataset'}-${tag}.review.json`);
}

/** Writes `content` to `path` so that the file is always either the old or the new content, whole. */
export async function writeAtomically(path: string, content: string): Promise<void> {
  await mkdir(dirname(path), { recursive: true });
  const tmp = `${path}.tmp-${process.pid}-${randomUUID().slice(0, 8)}`;
  const fh = await open(tmp, 'w');
  try {
    await fh.writeFile(content, 'utf8');
    await fh.sync();
  } finally {
    await fh.close();
  }
  try {
    await rename(tmp, path);
  } catch (e) {
    await unlink(tmp).catch(() => undefined);
    throw e;
  }
  // Make the rename itself durable (POSIX: sync the folder).
  const dir = await open(dirname(path), 'r').catch(() => null);
  if (dir) {
    await dir.sync().catch(() => undefined);
    await dir.close();
  }
}

/**
 * The review files this process holds. `acquire` takes the lock unless another live process on this
 * machine holds it (then it returns that holder); a lock left by a process that has ended is taken over.
 */
export class ReviewLocks {
  readonly instance = randomUUID();
  private readonly held = new Set<string>();

  async acquire(reviewPath: string, force = false): Promise<LockInfo | null> {
    const lockPath = `${reviewPath}.lock`;
    if (this.held.has(reviewPath)) return null;
    const existing = await readFile(lockPath, 'utf8').then((t) => JSON.parse(t) as LockInfo, () => null);
    if (existing && !force && existing.instance !== this.instance) {
      const sameHost = existing.host === hostname();
      if (!sameHost || processAlive(existing.pid)) return existing;
    }
    const mine: LockInfo = { pid: process.pid, host: hostname(), instance: this.instance, since: new Date().toISOString() };
    await mkdir(dirname(lockPath), { recursive: true });
    await writeFile(lockPath, JSON.stringify(mine));
    this.held.add(reviewPath);
    return null;
  }

  holds(reviewPath: string): boolean {
    return this.held.has(reviewPath);
  }

  async releaseAll(): Promise<void> {
    for (const p of this.held) await unlink(`${p}.lock`).catch(() => undefined);
    this.held.clear();
  }
}
