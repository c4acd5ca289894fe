import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { MiniSeedError, parseRecordHeader, readMiniSeedBuffer, type MiniSeedReadResult } from '../../../core/mseed/index';
import { channelKey } from '../../../core/model';
import { rng } from '../../support/random';

// Seeded fuzzing of the reader with real records: libmseed's test.mseed (Steim-2, 512-byte records,
// libmseed-doc 2.19.8) and the real FLOAT32 records of ../shared/data/real-microseismic (4096-byte
// records). Each case mutates records (bit flips, random header bytes, truncation, huge sample
// counts, random blockette fields, blockette chains that loop, corrupt data frames, splices) and
// asserts that the outcome is data or typed errors, within a time bound per case.

const CASES = 12_000;
const PER_CASE_MS = 500;


function records(path: string, length: number, max: number): Uint8Array[] {
  const bytes = new Uint8Array(readFileSync(path));
  const out: Uint8Array[] = [];
  for (let p = 0; p + length <= bytes.length && out.length < max; p += length) out.push(bytes.slice(p, p + length));
  return out;
}

const steim2 = records('/usr/share/doc/libmseed-dev/examples/test.mseed', 512, 36);
const float32 = records('../shared/data/real-microseismic/waveforms/2018-05-22T17-02-16.mseed', 4096, 40);

function mutate(rec: Uint8Array, r: () => number): Uint8Array {
  const m = rec.slice();
  const v = new DataView(m.buffer);
  const int = (n: number) => Math.floor(r() * n);
  if (m.length < 72) { // already cut short: flip a bit
    if (m.length) m[int(m.length)] ^= 1 << int(8);
    return m;
  }
  const kind = int(8);
  const firstBlk = v.getUint16(46);
  switch (kind) {
    case 0: { // bit flips anywhere
      const flips = 1 + int(16);
      for (let k = 0; k < flips; k++) m[int(m.length)] ^= 1 << int(8);
      return m;
    }
    case 1: { // random header bytes
      const n = 1 + int(4);
      for (let k = 0; k < n; k++) m[int(64)] = int(256);
      return m;
    }
    case 2: // truncation
      return m.slice(0, int(m.length));
    case 3: // huge or random counts and data offsets
      v.setUint16(30, r() < 0.5 ? 0xffff : int(0x10000));
      if (r() < 0.3) v.setUint16(44, int(0x10000));
      return m;
    case 4: { // blockette chain that loops (points at itself or back) or jumps anywhere
      if (firstBlk >= 48 && firstBlk + 4 <= m.length) {
        const choice = int(3);
        v.setUint16(firstBlk + 2, choice === 0 ? firstBlk : choice === 1 ? int(firstBlk + 1) : int(0x10000));
      } else {
        v.setUint16(46, int(0x10000));
      }
      return m;
    }
    case 5: // random blockette 1000 fields: encoding, word order, record length exponent
      if (firstBlk >= 48 && firstBlk + 8 <= m.length) m[firstBlk + 4 + int(3)] = int(256);
      return m;
    case 6: { // corrupt data frames
      const n = 1 + int(8);
      for (let k = 0; k < n; k++) {
        const p = 64 + 4 * int((m.length - 68) / 4);
        v.setUint32(p, int(0x100000000));
      }
      return m;
    }
    default: // random time fields and rate
      v.setUint16(20 + 2 * int(6), int(0x10000));
      if (r() < 0.5) v.setInt16(32, int(0x10000) - 0x8000);
      return m;
  }
}

function concat(parts: Uint8Array[]): Uint8Array {
  const out = new Uint8Array(parts.reduce((s, p) => s + p.length, 0));
  let at = 0;
  for (const p of parts) { out.set(p, at); at += p.length; }
  return out;
}

/** Structural checks every result must pass: the first problem found, or null. (Plain checks, not
 * expect(), which would dominate the run time over 12,000 cases.) */
function problemIn(res: MiniSeedReadResult, length: number): string | null {
  if (res.files.length !== 1) return `${res.files.length} file reports`;
  for (const e of res.files[0].errors) {
    if (!Number.isInteger(e.offset) || e.offset < 0 || e.offset > length) return `error offset ${e.offset} outside 0..${length}`;
    if (typeof e.reason !== 'string' || e.reason.length === 0) return 'error without a reason';
  }
  for (const ch of res.channels) {
    for (const s of [...ch.segments, ...ch.overlaps.map((o) => o.segment)]) {
      if (s.samples.length === 0) return 'empty segment';
      if (!(s.end >= s.start)) return `segment ends (${s.end}) before it starts (${s.start})`;
      if (s.recordStarts.length !== s.recordFirstSample.length || s.recordFirstSample[0] !== 0) return 'record index inconsistent';
      if (!(Number.isFinite(s.sampleRate) && s.sampleRate > 0)) return `sample rate ${s.sampleRate}`;
    }
  }
  return null;
}

function samplesOf(res: MiniSeedReadResult, key: string): number {
  let n = 0;
  for (const ch of res.channels) {
    if (channelKey(ch.id) !== key) continue;
    for (const s of ch.segments) n += s.samples.length;
    for (const o of ch.overlaps) n += o.segment.samples.length;
  }
  return n;
}

describe('fuzzing the reader with mutated real records', () => {
  it(`${CASES} seeded cases: each gives data or typed errors, never a crash or hang, and good neighbours survive`, () => {
    const r = rng(20261202);
    let slowest = 0;
    let readTime = 0;
    let withErrors = 0;
    let sandwiches = 0;
    const t0 = performance.now();
    for (let c = 0; c < CASES; c++) {
      const pool = r() < 0.5 ? steim2 : float32;
      const i = 1 + Math.floor(r() * (pool.length - 2));
      const shape = Math.floor(r() * 3);
      const mutated = mutate(pool[i], r);
      // shape 0: the mutated record alone; 1: a good record on each side; 2: repeated mutations.
      const bytes = shape === 0 ? mutated
        : shape === 1 ? concat([pool[i - 1], mutated, pool[i + 1]])
          : concat([mutate(mutated, r), mutate(pool[i + 1], r)]);
      const start = performance.now();
      let res: MiniSeedReadResult;
      try {
        res = readMiniSeedBuffer(bytes, `case${c}`);
      } catch (e) {
        throw new Error(`case ${c}: readMiniSeedBuffer threw ${String(e)}`);
      }
      try {
        parseRecordHeader(bytes, 0, `case${c}`);
      } catch (e) {
        if (!(e instanceof MiniSeedError) || e.file !== `case${c}`) throw new Error(`case ${c}: parseRecordHeader threw ${String(e)}`);
      }
      const ms = performance.now() - start;
      readTime += ms;
      slowest = Math.max(slowest, ms);
      if (ms > PER_CASE_MS) throw new Error(`case ${c} took ${ms.toFixed(1)} ms`);
      const problem = problemIn(res, bytes.length);
      if (problem) throw new Error(`case ${c}: ${problem}`);
      if (res.files[0].errors.length) withErrors++;
      if (shape === 1) {
        // The records on either side of the mutated one are read in full (in segments or overlaps).
        sandwiches++;
        const good = readMiniSeedBuffer(concat([pool[i - 1], pool[i + 1]]), 'good');
        const key = channelKey(good.channels[0].id);
        const kept = samplesOf(res, key);
        const need = samplesOf(good, key);
        if (kept < need || res.files[0].records < 2) {
          throw new Error(`case ${c}: ${kept} of the ${need} samples around the mutated record kept, ${res.files[0].records} records`);
        }
      }
    }
    const total = performance.now() - t0;
    console.log(`fuzz: ${CASES} cases in ${(total / 1000).toFixed(1)} s (reading ${(readTime / 1000).toFixed(1)} s), slowest ${slowest.toFixed(1)} ms, ${withErrors} with errors, ${sandwiches} with good neighbours`);
    expect(withErrors).toBeGreaterThan(CASES / 4);
    expect(sandwiches).toBeGreaterThan(CASES / 4);
  });
});
