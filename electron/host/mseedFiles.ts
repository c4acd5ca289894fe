/**
 * Reading miniSEED files from disk for the host (Node). Each file is streamed twice in chunks
 * through the core's two-pass collector (headers, then samples straight into arrays sized once), so
 * memory beyond the decoded samples stays bounded by one chunk buffer and the record index, whatever
 * the file size.
 */
import { open, readdir, stat } from 'node:fs/promises';
import { join } from 'node:path';
import { MiniSeedCollector, SCAN_LOOKAHEAD, type MiniSeedReadResult } from '../../core/mseed/index';

/** Bytes read per chunk. Must exceed SCAN_LOOKAHEAD (one longest record plus a header) by a margin. */
export const CHUNK_BYTES = 4 * 1024 * 1024;

export interface ReadMiniSeedOptions {
  /** Called after each chunk: bytes processed so far and in all, over both passes (each file counts twice). */
  onProgress?: (doneBytes: number, totalBytes: number) => void;
  /** Chunk size in bytes (tests use small ones); at least SCAN_LOOKAHEAD + 4096. */
  chunkBytes?: number;
}

/** Files under `paths` (folders searched recursively, hidden entries skipped), sorted per folder. */
export async function listFiles(paths: string[]): Promise<{ path: string; size: number }[]> {
  const out: { path: string; size: number }[] = [];
  const visit = async (p: string, top: boolean): Promise<void> => {
    const st = await stat(p);
    if (st.isDirectory()) {
      const names = (await readdir(p)).filter((n) => !n.startsWith('.')).sort();
      for (const n of names) await visit(join(p, n), false);
    } else if (st.isFile()) {
      out.push({ path: p, size: st.size });
    } else if (top) {
      throw new RangeError(`not a file or folder: "${p}"`);
    }
  };
  for (const p of paths) await visit(p, true);
  return out;
}

/**
 * Files or folders (searched recursively); streams each file in chunks so memory beyond the decoded
 * samples stays bounded. Bad records and files that are not miniSEED are reported in `files[i].errors`
 * (byte offset and reason), never thrown; a path that does not exist throws (RangeError via stat's
 * error naming the path).
 */
export async function readMiniSeedFiles(
  paths: string[], opts: ReadMiniSeedOptions = {},
): Promise<MiniSeedReadResult> {
  if (!Array.isArray(paths) || paths.some((p) => typeof p !== 'string')) {
    throw new TypeError('readMiniSeedFiles: paths must be an array of strings');
  }
  const chunkBytes = opts.chunkBytes ?? CHUNK_BYTES;
  if (!Number.isInteger(chunkBytes) || chunkBytes < SCAN_LOOKAHEAD + 4096) {
    throw new RangeError(`readMiniSeedFiles: chunkBytes must be an integer >= ${SCAN_LOOKAHEAD + 4096}, got ${chunkBytes}`);
  }
  const files = await listFiles(paths);
  const total = 2 * files.reduce((s, f) => s + f.size, 0);
  let done = 0;
  const progress = (n: number) => {
    done += n;
    opts.onProgress?.(done, total);
  };
  const collector = new MiniSeedCollector();
  const buffer = new Uint8Array(Math.min(chunkBytes, files.reduce((m, f) => Math.max(m, f.size), SCAN_LOOKAHEAD + 4096)));
  const indices = files.map((f) => collector.addFile(f.path));

  // Pass 1: headers.
  for (let i = 0; i < files.length; i++) {
    const { path, size } = files[i];
    await withChunks(path, size, buffer, 0, (bytes, base, atEnd) => collector.scan(indices[i], bytes, base, atEnd), progress);
  }
  collector.plan();
  // Pass 2: samples, only the byte ranges that hold planned records.
  for (let i = 0; i < files.length; i++) {
    const { path, size } = files[i];
    const from = collector.decodeNeeds(indices[i]);
    if (from < 0) { progress(size); continue; }
    progress(from);
    await withChunks(path, size, buffer, from, (bytes, base) => {
      const next = collector.decode(indices[i], bytes, base);
      return next < 0 ? size : next;
    }, progress);
  }
  return collector.finish();
}

/**
 * Reads `path` from byte `from` in chunks into `buffer`; `handle` gets each chunk (`bytes` from file
 * offset `base`) and returns the offset the next chunk must begin at (>= size ends the file).
 */
async function withChunks(
  path: string, size: number, buffer: Uint8Array, from: number,
  handle: (bytes: Uint8Array, base: number, atEnd: boolean) => number,
  progress: (n: number) => void,
): Promise<void> {
  if (size === 0) {
    handle(buffer.subarray(0, 0), 0, true);
    return;
  }
  const fh = await open(path, 'r');
  try {
    let pos = from;
    while (pos < size) {
      const want = Math.min(buffer.length, size - pos);
      let got = 0;
      while (got < want) {
        const { bytesRead } = await fh.read(buffer, got, want - got, pos + got);
        if (bytesRead === 0) break; // file shrank while being read
        got += bytesRead;
      }
      const atEnd = pos + got >= size || got < want;
      const next = handle(buffer.subarray(0, got), pos, atEnd);
      const advanced = atEnd ? size - pos : next - pos;
      if (!atEnd && next <= pos) throw new Error(`internal: no progress reading ${path} at byte ${pos}`);
      progress(Math.max(0, Math.min(advanced, size - pos)));
      if (atEnd) break;
      pos = next;
    }
  } finally {
    await fh.close();
  }
}
