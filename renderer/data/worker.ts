/**
 * Data worker: decodes miniSEED, computes overview levels and filters event windows off the main
 * thread, so the interface never waits on them.
 */
import { MiniSeedCollector, readMiniSeedBuffer } from '../../core/mseed';
import { indexRecords } from '../../core/mseed/recordIndex';
import { levelBins } from '../../core/view/levels';
import { channelKey, sampleTime, type Segment } from '../../core/model';
import { designForChannel, filterSegments } from '../../core/dsp';
import type {
  ChannelLevels, ChannelSummary, IndexReply, IndexRequest, WindowPiece, WindowReply, WindowRequest, WorkerReply, WorkerRequest,
} from './protocol';

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
    levels.push({ key, firstBin: first, rms, peak });
    transfer.push(rms.buffer, peak.buffer);
  }
  const reply: IndexReply = {
    type: 'index', id: msg.id, path: msg.path, channelKeys: keys, recChannel, recOffset, recLength, recStart, recEnd,
    channels, levels, errors: res.files[0]?.errors ?? [], logChannels: res.logs.map((l) => channelKey(l.id)),
  };
  post(reply, transfer);
}

/** The last decoded window, kept so that a new filter on the same window needs no reading or decoding. */
let cached: { key: string; result: ReturnType<MiniSeedCollector['finish']> } | null = null;

function handleWindow(msg: WindowRequest): void {
  let res;
  if (msg.chunks.length === 0 && cached && cached.key === msg.cacheKey) {
    res = cached.result;
  } else {
    const c = new MiniSeedCollector();
    const files = msg.chunks.map((ch) => c.addFile(ch.path));
    msg.chunks.forEach((ch, i) => c.scan(files[i], ch.bytes, ch.base, true));
    c.plan();
    msg.chunks.forEach((ch, i) => c.decode(files[i], ch.bytes, ch.base));
    res = c.finish();
    cached = { key: msg.cacheKey, result: res };
  }
  const wanted = new Set(msg.channels);
  const pieces: WindowPiece[] = [];
  const notes: string[] = [];
  const transfer: Transferable[] = [];
  for (const ch of res.channels) {
    const key = channelKey(ch.id);
    if (!wanted.has(key) || ch.segments.length === 0) continue;
    let filtered: Float64Array[] | null = null;
    if (msg.filter) {
      try {
        const f = designForChannel(msg.filter, ch.segments[0].sampleRate);
        if (f.note) notes.push(`${key}: ${f.note}`);
        filtered = filterSegments(f.sos, ch.segments.map((s) => s.samples), { zeroPhase: msg.zeroPhase });
      } catch (err) {
        notes.push(`${key}: not filtered: ${err instanceof Error ? err.message : err}`);
      }
    }
    ch.segments.forEach((seg, si) => {
      const piece = trim(key, seg, filtered ? filtered[si] : null, msg.start, msg.end);
      if (piece) { pieces.push(piece); transfer.push(piece.samples.buffer); }
    });
  }
  const errors = res.files.flatMap((f) => f.errors.map((e) => ({ path: f.path, ...e })));
  const reply: WindowReply = { type: 'window', id: msg.id, pieces, notes, errors };
  post(reply, transfer);
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
  for (let i = i0; i < i1; i++) {
    out[i - i0] = src[i];
    const r = Math.abs(seg.samples[i]);
    if (r > rawPeak) rawPeak = r;
  }
  return { key, start: sampleTime(seg, i0), sampleRate: rate, samples: out, rawPeak, clipped: flatTopped(seg.samples, i0, i1, rawPeak) };
}

/**
 * Clipping as it shows in the data (common practice when the digitiser's full scale is not known):
 * at least 4 consecutive samples sitting at the window's largest absolute value, on a trace whose
 * peak is well above quantisation (over 1000 counts).
 */
function flatTopped(x: ArrayLike<number>, i0: number, i1: number, peak: number): boolean {
  if (peak <= 1000) return false;
  let run = 0;
  for (let i = i0; i < i1; i++) {
    if (Math.abs(x[i]) === peak) {
      if (++run >= 4) return true;
    } else run = 0;
  }
  return false;
}
