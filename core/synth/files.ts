/**
 * A rendered channel as miniSEED files, one per UTC day (split at midnight, as archives store
 * them), written by the project's writer (core/mseed/write.ts: Steim-2, 4096-byte records,
 * blockettes 1000 and 1001), with the scenario's record faults:
 * - gap: the records of the span are missing;
 * - duplicateRecords: the span's records are written again right after them (byte-identical, same
 *   sequence numbers), as a telemetry link that re-sends a block;
 * - clockOffset: the span's time tags are late by offsetMicros; its records say timing quality
 *   `timingQuality` %, clock not locked, time tag questionable (elsewhere 100 %, locked).
 * Each file is the concatenation of the pieces between these boundaries, each piece written
 * separately (so a time tag jumps where the clock fault starts and ends, as it does in real data).
 */
import { channelKey } from '../model';
import { writeMiniSeed } from '../mseed/write';
import { isoFromMicros, utcDayStart, type Micros } from '../time';
import type { RenderedChannel } from './render';
import type { Scenario } from './types';

export const RECORD_LENGTH = 4096;

export interface MiniSeedFile {
  /** File name: NET.STA.LOC.CHA.YYYY-MM-DD.mseed */
  readonly name: string;
  readonly bytes: Uint8Array;
}

interface Piece {
  from: number;
  to: number;
  tagOffset: number;
  timingQuality: number;
  locked: boolean;
  duplicate: boolean;
}

/** The record-level pieces of one channel: sample index ranges with their tag offset and flags (gaps left out). */
function pieces(sc: Scenario, rc: RenderedChannel): Piece[] {
  const fs = rc.sampleRate;
  const n = rc.samples.length;
  const idx = (t: Micros) => Math.min(n, Math.max(0, Math.round(((t - rc.start) * fs) / 1e6)));
  const faults = sc.faults.filter((f) => 'station' in f && f.station === rc.id.station);
  const cuts = new Set<number>([0, n]);
  for (let d = utcDayStart(rc.start) + 86_400e6; d < rc.start + (n * 1e6) / fs; d += 86_400e6) cuts.add(idx(d));
  for (const f of faults) {
    if ('start' in f && 'end' in f) {
      cuts.add(idx(f.start));
      cuts.add(idx(f.end));
    }
  }
  const sorted = [...cuts].sort((a, b) => a - b);
  const out: Piece[] = [];
  for (let k = 0; k + 1 < sorted.length; k++) {
    const from = sorted[k], to = sorted[k + 1];
    if (to <= from) continue;
    const mid = rc.start + Math.round((((from + to) / 2) * 1e6) / fs);
    const inside = (f: { start: Micros; end: Micros }) => mid >= f.start && mid < f.end;
    if (faults.some((f) => f.kind === 'gap' && inside(f))) continue;
    const clock = faults.find((f) => f.kind === 'clockOffset' && inside(f));
    out.push({
      from, to,
      tagOffset: clock && clock.kind === 'clockOffset' ? clock.offsetMicros : 0,
      timingQuality: clock && clock.kind === 'clockOffset' ? clock.timingQuality : 100,
      locked: !clock,
      duplicate: faults.some((f) => f.kind === 'duplicateRecords' && inside(f)),
    });
  }
  return out;
}

/** The channel's day files. */
export function channelFiles(sc: Scenario, rc: RenderedChannel): MiniSeedFile[] {
  const fs = rc.sampleRate;
  const byDay = new Map<string, Uint8Array[]>();
  let sequence = 1;
  for (const p of pieces(sc, rc)) {
    const trueStart = rc.start + Math.round((p.from * 1e6) / fs);
    const day = isoFromMicros(utcDayStart(trueStart)).slice(0, 10);
    const flags = { timingQuality: p.timingQuality, clockLocked: p.locked, questionableTime: !p.locked };
    const bytes = writeMiniSeed(rc.id, trueStart + p.tagOffset, fs, rc.samples.subarray(p.from, p.to), {
      recordLength: RECORD_LENGTH, encoding: 11, quality: 'D', sequenceStart: sequence, recordFlags: () => flags,
    });
    sequence = ((sequence - 1 + bytes.length / RECORD_LENGTH) % 999_999) + 1;
    const list = byDay.get(day) ?? [];
    list.push(bytes);
    if (p.duplicate) list.push(bytes);
    byDay.set(day, list);
  }
  const key = channelKey(rc.id);
  return [...byDay.entries()].map(([day, parts]) => {
    const total = parts.reduce((s, b) => s + b.length, 0);
    const bytes = new Uint8Array(total);
    let at = 0;
    for (const b of parts) {
      bytes.set(b, at);
      at += b.length;
    }
    return { name: `${key}.${day}.mseed`, bytes };
  });
}
