/**
 * The libmseed reference for the miniSEED tests: builds the small C programs in test/ref/libmseed/
 * with gcc against the system's libmseed (Debian libmseed-dev 2.19) into test/.build/, and runs them.
 *
 * - {@link libmseedDecode}: libmseed's reading of a file (msdecode.c): per record its corrected start
 *   time, rate, encoding, flags and samples; per trace segment (libmseed's trace list) its start,
 *   end, rate and samples. Times are integer microseconds, samples exactly as libmseed unpacked them.
 * - {@link libmseedPack}: records packed by libmseed's msr_pack from given samples (mspack.c).
 * - {@link intSignal}: the deterministic integer test signal both libmseed and the project's writer pack.
 *
 * Parallel test files may build at the same time: each build goes to a temporary name and is renamed
 * into place (rename is atomic), and a program is rebuilt only when missing or older than its source,
 * this helper or libmseed's header, so one test run builds each program once.
 */
import { execFileSync } from 'node:child_process';
import { existsSync, mkdirSync, mkdtempSync, readFileSync, renameSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';

const here = dirname(fileURLToPath(import.meta.url));
const sourceDir = join(here, 'libmseed');
const buildDir = resolve(here, '..', '.build');
const libmseedHeader = '/usr/include/libmseed.h';

const built = new Map<string, string>();

/** Path of the built C program `name` (test/ref/libmseed/name.c), building it first if needed. */
export function libmseedTool(name: 'msdecode' | 'mspack'): string {
  const cached = built.get(name);
  if (cached) return cached;
  if (!existsSync(libmseedHeader)) {
    throw new Error(`${libmseedHeader} not found: install the Debian package libmseed-dev (libmseed 2.19)`);
  }
  const source = join(sourceDir, `${name}.c`);
  const binary = join(buildDir, name);
  const newestInput = Math.max(
    statSync(source).mtimeMs, statSync(fileURLToPath(import.meta.url)).mtimeMs, statSync(libmseedHeader).mtimeMs,
  );
  if (!existsSync(binary) || statSync(binary).mtimeMs < newestInput) {
    mkdirSync(buildDir, { recursive: true });
    const temporary = `${binary}.${process.pid}.${Math.random().toString(36).slice(2)}.tmp`;
    execFileSync('gcc', ['-O2', '-Wall', '-Werror', '-o', temporary, source, '-lmseed'], { stdio: 'pipe' });
    renameSync(temporary, binary);
  }
  built.set(name, binary);
  return binary;
}

export type LibmseedSamples = Int32Array | Float32Array | Float64Array;

/** One record as libmseed read it. */
export interface LibmseedRecord {
  /** Byte offset of the record in the file. */
  offset: number;
  /** NET.STA.LOC.CHA */
  id: string;
  quality: string;
  /** Start time as libmseed corrects it (time correction and blockette 1001 applied), µs. */
  start: number;
  /** Sample rate, Hz (blockette 100's when present). */
  rate: number;
  /** Sample count from the header. */
  count: number;
  encoding: number;
  /** 0 little-endian, 1 big-endian. */
  byteorder: number;
  reclen: number;
  /** libmseed's sample type: 'i', 'f', 'd' or 'a'. */
  type: string;
  actFlags: number;
  ioFlags: number;
  dqFlags: number;
  /** Blockette 1001 timing quality, -1 without blockette 1001. */
  timingQuality: number;
  /** Blockette 1001 microsecond offset (0 without it). */
  b1001usec: number;
  hasB100: boolean;
  /** Samples libmseed unpacked (for ASCII records: the bytes, see {@link LibmseedRecord.text}). */
  samples: LibmseedSamples | Uint8Array;
  /** Text of an ASCII record (type 'a'), '' otherwise. */
  text: string;
}

/** One trace segment of libmseed's trace list (mstl_addmsr: autoheal, tolerances by default). */
export interface LibmseedSegment {
  id: string;
  /** Time of the first sample, µs. */
  start: number;
  /** Time of the last sample, µs. */
  end: number;
  rate: number;
  count: number;
  type: string;
  samples: LibmseedSamples | Uint8Array;
}

export interface LibmseedReading {
  records: LibmseedRecord[];
  segments: LibmseedSegment[];
  /** The error libmseed stopped at, or null when it read to the end of the file. */
  error: { code: number; offset: number; message: string } | null;
}

interface RawPart { type: string; numsamples: number; sampleOffset: number }

function samplesOf(bin: Buffer, part: RawPart): LibmseedSamples | Uint8Array {
  const n = part.numsamples;
  const bytes = bin.subarray(part.sampleOffset, part.sampleOffset + n * ({ i: 4, f: 4, d: 8, a: 1 }[part.type] ?? 0));
  // Copy into a fresh, aligned buffer (the file buffer's offsets need not be aligned).
  const copy = new Uint8Array(bytes).buffer;
  switch (part.type) {
    case 'i': return new Int32Array(copy);
    case 'f': return new Float32Array(copy);
    case 'd': return new Float64Array(copy);
    default: return new Uint8Array(copy);
  }
}

function scratchDir(): string {
  mkdirSync(buildDir, { recursive: true });
  return mkdtempSync(join(tmpdir(), 'daybreak-libmseed-'));
}

/** libmseed 2.19's reading of the miniSEED file at `path` (ms_readmsr_r, msr_unpack, mstl_addmsr). */
export function libmseedDecode(path: string): LibmseedReading {
  const tool = libmseedTool('msdecode');
  const dir = scratchDir();
  try {
    const binPath = join(dir, 'samples.bin');
    const json = execFileSync(tool, [path, binPath], { maxBuffer: 1 << 28, stdio: ['ignore', 'pipe', 'pipe'] }).toString();
    const raw = JSON.parse(json) as {
      records: (Omit<LibmseedRecord, 'samples' | 'text'> & RawPart)[];
      segments: (Omit<LibmseedSegment, 'samples'> & RawPart)[];
      error: LibmseedReading['error'];
    };
    const bin = readFileSync(binPath);
    const decoder = new TextDecoder('latin1');
    const records = raw.records.map((r) => {
      const samples = samplesOf(bin, r);
      return { ...r, samples, text: r.type === 'a' ? decoder.decode(samples) : '' };
    });
    const segments = raw.segments.map((s) => ({ ...s, samples: samplesOf(bin, s) }));
    return { records, segments, error: raw.error };
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

/** What to pack with libmseed's msr_pack. */
export interface LibmseedPackParams {
  /** int32 for 'i' (INT16, INT32, Steim-1, Steim-2), float32 for FLOAT32, float64 for FLOAT64, a string for ASCII. */
  samples: Int32Array | Float32Array | Float64Array | string;
  network?: string;
  station?: string;
  location?: string;
  channel?: string;
  quality?: 'D' | 'R' | 'Q' | 'M';
  /** Start time, integer µs since the epoch. */
  start: number;
  /** Hz */
  rate: number;
  /** SEED encoding code: 0, 1, 3, 4, 5, 10 or 11. */
  encoding: number;
  /** 0 little-endian, 1 big-endian. */
  byteorder: 0 | 1;
  /** Record length, bytes. */
  reclen: number;
  sequenceStart?: number;
  /** Add blockette 1001 so microsecond start times survive (default true). */
  blockette1001?: boolean;
  /** Add blockette 100 holding the rate as a float32 (default false). */
  blockette100?: boolean;
}

/** Packs `p` with libmseed 2.19 (msr_pack, flushed) into the bytes of a miniSEED file; `seconds`: msr_pack's wall-clock time. */
export function libmseedPack(p: LibmseedPackParams): { bytes: Uint8Array; records: number; samples: number; seconds: number } {
  const tool = libmseedTool('mspack');
  const dir = scratchDir();
  try {
    const samplesPath = join(dir, 'in.bin');
    const outPath = join(dir, 'out.mseed');
    let type: string;
    if (typeof p.samples === 'string') {
      type = 'a';
      writeFileSync(samplesPath, Buffer.from(p.samples, 'latin1'));
    } else {
      type = p.samples instanceof Int32Array ? 'i' : p.samples instanceof Float32Array ? 'f' : 'd';
      writeFileSync(samplesPath, new Uint8Array(p.samples.buffer, p.samples.byteOffset, p.samples.byteLength));
    }
    const args = [
      outPath, `samples=${samplesPath}`, `type=${type}`,
      `net=${p.network ?? 'XX'}`, `sta=${p.station ?? 'TEST'}`, `loc=${p.location ?? ''}`, `cha=${p.channel ?? 'HHZ'}`,
      `quality=${p.quality ?? 'D'}`, `start=${p.start}`, `rate=${p.rate.toPrecision(17)}`,
      `encoding=${p.encoding}`, `byteorder=${p.byteorder}`, `reclen=${p.reclen}`,
      `seq=${p.sequenceStart ?? 1}`, `b1001=${p.blockette1001 === false ? 0 : 1}`, `b100=${p.blockette100 ? 1 : 0}`,
    ];
    const out = JSON.parse(execFileSync(tool, args, { stdio: ['ignore', 'pipe', 'pipe'] }).toString()) as { records: number; samples: number; seconds: number };
    return { bytes: new Uint8Array(readFileSync(outPath)), ...out };
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

/** Writes `bytes` to a fresh temporary file and returns its path and a function that removes it. */
export function temporaryFile(bytes: Uint8Array, name = 'data.mseed'): { path: string; remove: () => void } {
  const dir = scratchDir();
  const path = join(dir, name);
  writeFileSync(path, bytes);
  return { path, remove: () => rmSync(dir, { recursive: true, force: true }) };
}

/** libmseed's reading of in-memory records (written to a temporary file first). */
export function libmseedDecodeBytes(bytes: Uint8Array): LibmseedReading {
  const file = temporaryFile(bytes);
  try {
    return libmseedDecode(file.path);
  } finally {
    file.remove();
  }
}

/** Deterministic pseudo-random numbers in [0, 1) (a 32-bit LCG, Numerical Recipes constants). */
export function lcg(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return s / 4294967296;
  };
}

/**
 * Integer test signal: a random walk whose step sizes change in bursts, so every Steim difference
 * width occurs (4 to 30 bits), within ±`limit`.
 */
export function intSignal(n: number, seed: number, limit = 0x3fffffff): Int32Array {
  const rnd = lcg(seed);
  const out = new Int32Array(n);
  const scales = [3, 7, 15, 31, 127, 511, 16383, 1 << 20, 1 << 27];
  let v = 0;
  let scale = 3;
  for (let i = 0; i < n; i++) {
    if (i % 97 === 0) scale = Math.min(scales[Math.floor(rnd() * scales.length)], limit);
    v += Math.round((rnd() * 2 - 1) * scale);
    if (v > limit) v = limit - (v - limit);
    if (v < -limit) v = -limit + (-limit - v);
    out[i] = v;
  }
  return out;
}
