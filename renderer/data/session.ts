/**
 * One opened dataset in the renderer: its files, the station metadata, a record index and overview
 * levels per channel (built once, in workers, with progress), and event windows read on demand from
 * just the byte ranges they need.
 */
import { splitRanges, type Dataset, type HostApi } from '../../electron/contract';
import { parseStationXml, channelsOf, type ChannelMeta, type Inventory } from '../../core/stationxml';
import type { FilterRequest } from '../../core/dsp';
import type { Micros } from '../../core/time';
import { WorkerPool } from './workers';
import { KEPT_WINDOWS, NOT_KEPT, type ChannelSummary, type IndexReply, type WindowChunk, type WindowPiece, type WindowReply } from './protocol';

/** Overview bin length: 20 s (µs). */
export const OVERVIEW_BIN_MICROS = 20_000_000;

interface FileIndex {
  path: string;
  channelKeys: string[];
  recChannel: Int32Array; recOffset: Float64Array; recLength: Int32Array; recStart: Float64Array; recEnd: Float64Array;
}

export interface ChannelInfo {
  key: string;
  summaries: ChannelSummary[];
  /** Overview levels keyed by absolute bin number. */
  levels: Map<number, { rms: number; peak: number; clipped: boolean }>;
  meta: ChannelMeta | undefined;
}

export class CancelledError extends Error {
  constructor() {
    super('cancelled');
    this.name = 'CancelledError';
  }
}

export interface Problem { file: string; offset?: number; reason: string }

export class DataSession {
  readonly pool = new WorkerPool(2);
  readonly files: FileIndex[] = [];
  readonly channels = new Map<string, ChannelInfo>();
  readonly problems: Problem[] = [];
  inventory: Inventory | null = null;
  /** Overall time span of the data, µs. */
  span: [Micros, Micros] = [Infinity, -Infinity];

  constructor(private readonly host: HostApi, readonly dataset: Dataset) {}


  /** Time the last `open` took, ms. */
  openMs = 0;

  /** Reads station metadata and indexes every miniSEED file, reporting progress 0-1. */
  async open(onProgress: (fraction: number, note: string) => void): Promise<void> {
    const t0 = performance.now();
    for (const f of this.dataset.files.filter((x) => x.kind === 'stationxml')) {
      const r = await this.host.call('file.read', { root: this.dataset.root, path: f.path });
      if (!r.ok) { this.problems.push({ file: f.path, reason: r.message }); continue; }
      try {
        this.inventory = parseStationXml(new TextDecoder().decode(r.value), f.path);
      } catch (e) {
        this.problems.push({ file: f.path, reason: e instanceof Error ? e.message : String(e) });
      }
    }
    const mseed = this.dataset.files.filter((x) => x.kind === 'miniseed');
    const total = mseed.reduce((s, f) => s + f.size, 0) || 1;
    let done = 0;
    let next = 0;
    const worker = async () => {
      while (next < mseed.length && !this.cancelled) {
        const f = mseed[next++];
        const r = await this.host.call('file.read', { root: this.dataset.root, path: f.path });
        if (!r.ok) { this.problems.push({ file: f.path, reason: r.message }); continue; }
        const bytes = r.value;
        const reply = await this.pool.request<IndexReply>({ type: 'index', path: f.path, bytes, binMicros: OVERVIEW_BIN_MICROS }, [bytes.buffer]);
        this.addIndex(reply);
        done += f.size;
        onProgress(done / total, f.path);
      }
    };
    await Promise.all([worker(), worker()]);
    if (this.cancelled) throw new CancelledError();
    this.openMs = performance.now() - t0;
    const metas = this.inventory ? channelsOf(this.inventory) : [];
    for (const ch of this.channels.values()) {
      const [net, sta, loc, cha] = ch.key.split('.');
      ch.meta = metas.find((m) => m.id.network === net && m.id.station === sta && m.id.location === loc && m.id.channel === cha);
    }
  }

  private addIndex(r: IndexReply): void {
    this.files.push({ path: r.path, channelKeys: r.channelKeys, recChannel: r.recChannel, recOffset: r.recOffset, recLength: r.recLength, recStart: r.recStart, recEnd: r.recEnd });
    for (const e of r.errors) this.problems.push({ file: r.path, offset: e.offset, reason: e.reason });
    for (const s of r.channels) {
      const ch = this.channelInfo(s.key);
      ch.summaries.push(s);
      for (const seg of s.segments) {
        if (seg.start < this.span[0]) this.span[0] = seg.start;
        if (seg.end > this.span[1]) this.span[1] = seg.end;
      }
    }
    for (const lv of r.levels) {
      const ch = this.channelInfo(lv.key);
      for (let k = 0; k < lv.rms.length; k++) {
        if (Number.isNaN(lv.rms[k])) continue;
        const bin = lv.firstBin + k;
        const had = ch.levels.get(bin);
        // A bin split across two files (midnight) keeps the larger level, and is clipped if either part is.
        const clipped = lv.clipped[k] === 1 || (had?.clipped ?? false);
        if (!had || lv.rms[k] > had.rms) ch.levels.set(bin, { rms: lv.rms[k], peak: lv.peak[k], clipped });
        else had.clipped = clipped;
      }
    }
  }

  private channelInfo(key: string): ChannelInfo {
    let ch = this.channels.get(key);
    if (!ch) { ch = { key, summaries: [], levels: new Map(), meta: undefined }; this.channels.set(key, ch); }
    return ch;
  }

  /**
   * What the workers keep of the view's last windows: window key -> channel -> the worker that holds
   * it decoded (-1: the channel has no data in that window). The oldest window is forgotten first.
   */
  private readonly keptViews = new Map<string, Map<string, number>>();

  /** Where the last window's time went, ms (host read, then per worker decode / filter / pack, then the wait for the slowest worker). */
  lastWindowTiming = { hostMs: 0, workerMs: 0, decodeMs: [] as number[], filterMs: [] as number[], packMs: [] as number[], workers: 0 };

  /**
   * Samples of `channels` in [start, end), filtered as asked (causal unless `zeroPhase`). Reads
   * `warmup` seconds more before the window so the filter has settled at its start.
   *
   * Windows for the view (`forView`) are shared between the workers: files that hold the same
   * channel stay together (a channel split over two day files is filtered as one piece, as before),
   * the groups are dealt out by size, and every worker decodes and filters its share in parallel and
   * keeps it. Channels of the window a worker already keeps are not read again: a new filter, or the
   * rest of the rows after the rows in view, is filtering only, again in parallel. Other reads (e.g.
   * for magnitudes) go to the last worker and leave what the workers keep alone.
   */
  async window(channels: string[], start: Micros, end: Micros, filter: FilterRequest | null, zeroPhase = false, warmup = 20, forView = true): Promise<WindowReply> {
    const readFrom = start - warmup * 1e6;
    const windowKey = `${readFrom}|${end}`;
    for (let attempt = 0; ; attempt++) {
      try {
        return await this.windowOnce(channels, windowKey, readFrom, start, end, filter, zeroPhase, forView);
      } catch (e) {
        // A worker lost what it kept (e.g. it was asked for more windows since): read it all again.
        if (!(e instanceof Error && e.message === NOT_KEPT) || attempt > 0) throw e;
        this.keptViews.delete(windowKey);
      }
    }
  }

  private async windowOnce(channels: string[], windowKey: string, readFrom: Micros, start: Micros, end: Micros,
    filter: FilterRequest | null, zeroPhase: boolean, forView: boolean): Promise<WindowReply> {
    const t0 = performance.now();
    let held = forView ? this.keptViews.get(windowKey) : undefined;
    if (forView && !held) {
      held = new Map();
      this.keptViews.set(windowKey, held);
      // The workers keep as many windows as this (see worker.ts): forget the oldest beyond that.
      while (this.keptViews.size > KEPT_WINDOWS) this.keptViews.delete(this.keptViews.keys().next().value!);
    }
    const missing = channels.filter((c) => !held?.has(c));
    const requests: Promise<WindowReply>[] = [];
    // Channels kept decoded: filtering only, in the worker that holds them.
    if (held) {
      const byWorker = new Map<number, string[]>();
      for (const c of channels) {
        const w = held.get(c);
        if (w !== undefined && w >= 0) byWorker.set(w, [...(byWorker.get(w) ?? []), c]);
      }
      for (const [w, chs] of byWorker) {
        requests.push(this.pool.request<WindowReply>({ type: 'window', chunks: [], channels: chs, start, end, filter, zeroPhase, cacheKey: windowKey, keep: true }, [], w));
      }
    }
    let hostMs = 0;
    const notes: string[] = [];
    if (missing.length > 0) {
      const want = new Set(missing);
      const ranges: { path: string; offset: number; length: number }[] = [];
      const rangeChannels: Set<string>[] = [];
      for (const f of this.files) {
        const keyWanted = f.channelKeys.map((k) => want.has(k));
        if (!keyWanted.some(Boolean)) continue;
        const mine: { path: string; offset: number; length: number }[] = [];
        const inFile = new Set<string>();
        for (let i = 0; i < f.recOffset.length; i++) {
          if (!keyWanted[f.recChannel[i]] || f.recEnd[i] <= readFrom || f.recStart[i] >= end) continue;
          inFile.add(f.channelKeys[f.recChannel[i]]);
          const last = mine[mine.length - 1];
          const off = f.recOffset[i];
          if (last && off <= last.offset + last.length + 65536) last.length = Math.max(last.length, off + f.recLength[i] - last.offset);
          else mine.push({ path: f.path, offset: off, length: f.recLength[i] });
        }
        for (const m of mine) { ranges.push(m); rangeChannels.push(inFile); }
      }
      // One request for every range: the host reads them in parallel and frames them in one answer.
      const r = ranges.length ? await this.host.call('file.readRanges', { root: this.dataset.root, ranges }) : null;
      hostMs = performance.now() - t0;
      if (r && !r.ok) {
        this.problems.push({ file: this.dataset.root, reason: r.message });
        notes.push(`could not read the window: ${r.message}`);
      } else if (r) {
        const parts = splitRanges(r.value);
        const chunks: WindowChunk[] = ranges.map((rg, i) => ({ path: rg.path, base: rg.offset, bytes: parts[i] }));
        if (!forView) {
          requests.push(this.pool.request<WindowReply>({ type: 'window', chunks, channels: missing, start, end, filter, zeroPhase, cacheKey: windowKey, keep: false }, [r.value.buffer], this.pool.size - 1));
        } else {
          shareOut(chunks, rangeChannels, this.pool.size).forEach((g, w) => {
            const share = missing.filter((c) => g.channels.has(c));
            for (const c of share) held!.set(c, w);
            // Every worker gets its own copy of its chunks (one buffer each), transferred without a further copy.
            const own = g.chunks.map((c) => ({ ...c, bytes: c.bytes.slice() }));
            requests.push(this.pool.request<WindowReply>({ type: 'window', chunks: own, channels: share, start, end, filter, zeroPhase, cacheKey: windowKey, keep: true }, own.map((c) => c.bytes.buffer), w));
          });
        }
      }
      if (held && !notes.length) for (const c of missing) if (!held.has(c)) held.set(c, -1);
    }
    const t1 = performance.now();
    const replies = await Promise.all(requests);
    const merged = this.merged(replies, hostMs, performance.now() - t1);
    merged.notes.push(...notes);
    return merged;
  }

  private merged(replies: WindowReply[], hostMs: number, workerMs: number): WindowReply {
    this.lastWindowTiming = {
      hostMs, workerMs, workers: replies.length,
      decodeMs: replies.map((x) => x.timing.decodeMs), filterMs: replies.map((x) => x.timing.filterMs), packMs: replies.map((x) => x.timing.packMs),
    };
    const most = (f: (x: WindowReply) => number) => replies.reduce((m, x) => Math.max(m, f(x)), 0);
    return {
      type: 'window', id: 0,
      pieces: replies.flatMap((x) => x.pieces), notes: replies.flatMap((x) => x.notes), errors: replies.flatMap((x) => x.errors),
      timing: { decodeMs: most((x) => x.timing.decodeMs), filterMs: most((x) => x.timing.filterMs), packMs: most((x) => x.timing.packMs) },
    };
  }

  private cancelled = false;

  /** Stops an `open` in progress (it rejects with CancelledError) and frees the workers. */
  cancel(): void {
    this.cancelled = true;
    this.pool.terminate();
  }

  close(): void {
    this.pool.terminate();
  }
}

/**
 * Deals chunks out to `workers` groups of about equal bytes. Chunks that hold a common channel stay
 * in one group (its pieces must be decoded and filtered together); the largest groups go first, each
 * to the group with the fewest bytes so far. Groups that would be empty are left out.
 */
export function shareOut(chunks: WindowChunk[], chunkChannels: ReadonlySet<string>[], workers: number): { chunks: WindowChunk[]; channels: Set<string> }[] {
  if (!Number.isInteger(workers) || workers < 1) throw new RangeError(`workers must be a positive integer, got ${workers}`);
  if (chunkChannels.length !== chunks.length) throw new RangeError(`one channel set per chunk needed: ${chunks.length} chunks, ${chunkChannels.length} sets`);
  // Union-find over chunks joined by a shared channel.
  const parent = chunks.map((_, i) => i);
  const find = (i: number): number => (parent[i] === i ? i : (parent[i] = find(parent[i])));
  const owner = new Map<string, number>();
  chunkChannels.forEach((set, i) => {
    for (const c of set) {
      const o = owner.get(c);
      if (o === undefined) owner.set(c, i);
      else parent[find(i)] = find(o);
    }
  });
  const sets = new Map<number, { chunks: WindowChunk[]; channels: Set<string>; bytes: number }>();
  chunks.forEach((c, i) => {
    const root = find(i);
    let g = sets.get(root);
    if (!g) sets.set(root, (g = { chunks: [], channels: new Set(), bytes: 0 }));
    g.chunks.push(c);
    g.bytes += c.bytes.length;
    for (const ch of chunkChannels[i]) g.channels.add(ch);
  });
  const out = Array.from({ length: workers }, () => ({ chunks: [] as WindowChunk[], channels: new Set<string>(), bytes: 0 }));
  for (const g of [...sets.values()].sort((a, b) => b.bytes - a.bytes)) {
    const to = out.reduce((a, b) => (b.bytes < a.bytes ? b : a));
    to.chunks.push(...g.chunks);
    to.bytes += g.bytes;
    for (const ch of g.channels) to.channels.add(ch);
  }
  return out.filter((g) => g.chunks.length > 0).map(({ chunks: c, channels }) => ({ chunks: c, channels }));
}

/** Pieces grouped by channel key, in the order given. */
export function piecesByChannel(pieces: readonly WindowPiece[]): Map<string, WindowPiece[]> {
  const out = new Map<string, WindowPiece[]>();
  for (const p of pieces) {
    const list = out.get(p.key);
    if (list) list.push(p);
    else out.set(p.key, [p]);
  }
  return out;
}
