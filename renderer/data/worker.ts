/**
 * Data worker: decodes miniSEED, computes overview levels and filters event windows off the main
 * thread, so the interface never waits on them.
 */
import { MiniSeedCollector, readMiniSeedBuffer } from '../../core/mseed';
import { indexRecords } from '../../core/mseed/recordIndex';
import { levelBins, looksClipped } from '../../core/view/levels';
import { buildEnvelope } from '../../core/view/envelope';
import { channelKey, sampleTime, type Segment } from '../../core/model';
import { designForChannel, filterSegments } from '../../core/dsp';
import type {
  ChannelLevels, ChannelSummary, IndexReply, IndexRequest, WindowPiece, WindowReply, WindowRequest, WorkerReply, WorkerRequest,
} from './protocol';
import { KEPT_WINDOWS, NOT_KEPT } from './protocol';

const post = (msg: WorkerReply, transfer: Transferable[] = []) => (self as unknown as Worker).postMessage(msg, transfer);

self.onmessage = (e: MessageEvent<WorkerRequest>) => {
  const msg = e.data;
  try {
    if (msg.type === 'index') handleIndex(msg);
    else if (msg.type === 'window') handleWindow(msg);
  } catch (err) {
    post({ type: 'fail', id: msg.id, message: err instanceof Error ? err.message : String(err) });
  }
};

function handleIndex(msg: IndexRequest): void {
  const idx = indexRecords(msg.bytes, msg.path);
  const keys: string[] = [];
  const keyIndex = new Map<string, number>();
  const n = idx.records.length;
  const recChannel = new Int32Array(n);
  const recOffset = new Float64Array(n);
  const recLength = new Int32Array(n);
  const recStart = new Float64Array(n);
  const recEnd = new Float64Array(n);
  idx.records.forEach((r, i) => {
    let k = keyIndex.get(r.channel);
    if (k === undefined) { k = keys.length; keys.push(r.channel); keyIndex.set(r.channel, k); }
    recChannel[i] = k; recOffset[i] = r.offset; recLength[i] = r.length; recStart[i] = r.start; recEnd[i] = r.end;
  });
  const res = readMiniSeedBuffer(msg.bytes, msg.path);
  const channels: ChannelSummary[] = [];
  const levels: ChannelLevels[] = [];
  const transfer: Transferable[] = [recChannel.buffer, recOffset.buffer, recLength.buffer, recStart.buffer, recEnd.buffer];
  for (const ch of res.channels) {
    const key = channelKey(ch.id);
    channels.push({
      key,
      segments: ch.segments.map((s) => ({
        start: s.start, end: s.end, sampleRate: s.sampleRate, samples: s.samples.length, encoding: s.encoding,
        recordLength: s.recordLength, timingQualityMin: s.timing.qualityMin, questionableTimeRecords: s.timing.questionableTimeRecords,
        clockLockedRecords: s.timing.clockLockedRecords, records: s.timing.records,
      })),
      gaps: ch.gaps.map((g) => ({ start: g.start, end: g.end })),
      overlaps: ch.overlaps.map((o) => ({ start: o.start, end: o.end })),
      duplicatesDropped: ch.duplicatesDropped,
    });
    if (ch.segments.length === 0) continue;
    const first = Math.floor(ch.segments[0].start / msg.binMicros);
    const last = Math.floor(ch.segments[ch.segments.length - 1].end / msg.binMicros);
    const lv = levelBins(ch.segments, first * msg.binMicros, msg.binMicros, last - first + 1);
    const rms = Float32Array.from(lv.rms);
    const peak = Float32Array.from(lv.peak);
    levels.push({ key, firstBin: first, rms, peak, clipped: lv.clipped });
    transfer.push(rms.buffer, peak.buffer, lv.clipped.buffer);
  }
  const reply: IndexReply = {
    type: 'index', id: msg.id, path: msg.path, channelKeys: keys, recChannel, recOffset, recLength, recStart, recEnd,
    channels, levels, errors: res.files[0]?.errors ?? [], logChannels: res.logs.map((l) => channelKey(l.id)),
  };
  post(reply, transfer);
}

type Decoded = ReturnType<MiniSeedCollector['finish']>;
type DecodedChannel = Decoded['channels'][number];

/**
 * What this worker keeps of the view's last windows (window key -> channel key -> decoded channel),
 * so that a new filter on the same window, or more rows of it, needs no reading or decoding of what
 * is already here. Only channels asked for are kept (a read range may hold parts of others). The
 * oldest window goes first.
 */
const kept = new Map<string, Map<string, DecodedChannel>>();

function handleWindow(msg: WindowRequest): void {
  const t0 = performance.now();
  let channels: DecodedChannel[];
  let errors: WindowReply['errors'] = [];
  if (msg.chunks.length === 0) {
    const had = kept.get(msg.cacheKey);
    if (!had || msg.channels.some((c) => !had.has(c))) {
      post({ type: 'fail', id: msg.id, message: NOT_KEPT });
      return;
    }
    channels = msg.channels.map((c) => had.get(c)!);
  } else {
    const c = new MiniSeedCollector();
    const files = msg.chunks.map((ch) => c.addFile(ch.path));
    msg.chunks.forEach((ch, i) => c.scan(files[i], ch.bytes, ch.base, true));
    c.plan();
    msg.chunks.forEach((ch, i) => c.decode(files[i], ch.bytes, ch.base));
    const res = c.finish();
    errors = res.files.flatMap((f) => f.errors.map((e) => ({ path: f.path, ...e })));
    const wanted = new Set(msg.channels);
    channels = res.channels.filter((ch) => wanted.has(channelKey(ch.id)));
    if (msg.keep) {
      const into = kept.get(msg.cacheKey) ?? new Map<string, DecodedChannel>();
      kept.delete(msg.cacheKey);
      kept.set(msg.cacheKey, into);
      for (const ch of channels) into.set(channelKey(ch.id), ch);
      while (kept.size > KEPT_WINDOWS) kept.delete(kept.keys().next().value!);
    }
  }
  const t1 = performance.now();
  const notes: string[] = [];
  const filteredOf = msg.filter ? filterChannels(channels, msg.filter, msg.zeroPhase, notes) : null;
  const filterMs = performance.now() - t1;
  const pieces: WindowPiece[] = [];
  const transfer: Transferable[] = [];
  for (const ch of channels) {
    const key = channelKey(ch.id);
    const filtered = filteredOf?.get(ch) ?? null;
    ch.segments.forEach((seg, si) => {
      const piece = trim(key, seg, filtered ? filtered[si] : null, msg.start, msg.end);
      if (!piece) return;
      pieces.push(piece);
      transfer.push(piece.samples.buffer);
      for (const lv of piece.envelope.levels) transfer.push(lv.min.buffer, lv.max.buffer);
    });
  }
  const packMs = performance.now() - t1 - filterMs;
  const reply: WindowReply = { type: 'window', id: msg.id, pieces, notes, errors, timing: { decodeMs: msg.chunks.length ? t1 - t0 : 0, filterMs, packMs } };
  post(reply, transfer);
}

/**
 * Filters every channel's segments (causal unless `zeroPhase`): channels of one sample rate share one
 * design and one `filterSegments` call, which filters each segment on its own exactly as a call per
 * channel would (its initial state scaled to the segment's first sample) but works out that state once.
 * Channels that cannot be filtered get a note and stay unfiltered.
 */
function filterChannels(channels: DecodedChannel[], filter: NonNullable<WindowRequest['filter']>, zeroPhase: boolean, notes: string[]): Map<DecodedChannel, Float64Array[]> {
  const out = new Map<DecodedChannel, Float64Array[]>();
  const byRate = new Map<number, DecodedChannel[]>();
  for (const ch of channels) {
    if (ch.segments.length === 0) continue;
    const rate = ch.segments[0].sampleRate;
    byRate.set(rate, [...(byRate.get(rate) ?? []), ch]);
  }
  const failed = (ch: DecodedChannel, err: unknown) => notes.push(`${channelKey(ch.id)}: not filtered: ${err instanceof Error ? err.message : err}`);
  for (const [rate, group] of byRate) {
    let f: ReturnType<typeof designForChannel>;
    try {
      f = designFor(filter, rate);
    } catch (err) {
      for (const ch of group) failed(ch, err);
      continue;
    }
    if (f.note) for (const ch of group) notes.push(`${channelKey(ch.id)}: ${f.note}`);
    let all: Float64Array[] | null = null;
    try {
      all = filterSegments(f.sos, group.flatMap((ch) => ch.segments.map((s) => s.samples)), { zeroPhase });
    } catch {
      all = null; // one bad channel: filter them one by one below, so only it is left unfiltered
    }
    let k = 0;
    for (const ch of group) {
      if (all) {
        out.set(ch, all.slice(k, k + ch.segments.length));
        k += ch.segments.length;
        continue;
      }
      try {
        out.set(ch, filterSegments(f.sos, ch.segments.map((s) => s.samples), { zeroPhase }));
      } catch (err) {
        failed(ch, err);
      }
    }
  }
  return out;
}

/** Filter designs by request and sample rate: designed once, not once per channel (about 1 ms each). */
const designs = new Map<string, ReturnType<typeof designForChannel>>();

function designFor(filter: NonNullable<WindowRequest['filter']>, sampleRate: number): ReturnType<typeof designForChannel> {
  const key = `${JSON.stringify(filter)}@${sampleRate}`;
  let f = designs.get(key);
  if (!f) {
    f = designForChannel(filter, sampleRate);
    if (designs.size > 64) designs.clear();
    designs.set(key, f);
  }
  return f;
}

/** The part of a segment inside [start, end), as float32 for display. */
function trim(key: string, seg: Segment, values: Float64Array | null, start: number, end: number): WindowPiece | null {
  const n = seg.samples.length;
  let i0 = 0;
  let i1 = n;
  const rate = seg.sampleRate;
  if (seg.start < start) i0 = Math.min(n, Math.max(0, Math.ceil(((start - seg.start) * rate) / 1e6) - 1));
  if (seg.end >= end) i1 = Math.max(i0, Math.min(n, Math.floor(((end - seg.start) * rate) / 1e6) + 2));
  if (i1 <= i0) return null;
  const src = values ?? seg.samples;
  const out = new Float32Array(i1 - i0);
  let rawPeak = 0;
  const first = seg.samples[i0];
  let flat = i1 - i0 > 1;
  for (let i = i0; i < i1; i++) {
    out[i - i0] = src[i];
    const r = Math.abs(seg.samples[i]);
    if (r > rawPeak) rawPeak = r;
    if (seg.samples[i] !== first) flat = false;
  }
  if (flat && values) out.fill(0);
  return {
    key, start: sampleTime(seg, i0), sampleRate: rate, samples: out, rawPeak, clipped: looksClipped(seg.samples, i0, i1), flat,
    envelope: buildEnvelope(out),
  };
}
