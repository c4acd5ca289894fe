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
import type { ChannelSummary, IndexReply, WindowChunk, WindowReply } from './protocol';

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
  levels: Map<number, { rms: number; peak: number }>;
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

  /** Reads station metadata and indexes every miniSEED file, reporting progress 0-1. */
  private lastWindowKey = '';

  /** Time the last `open` took, ms. */
  openMs = 0;

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
        // A bin split across two files (midnight) keeps the larger level.
        if (!had || lv.rms[k] > had.rms) ch.levels.set(bin, { rms: lv.rms[k], peak: lv.peak[k] });
      }
    }
  }

  private channelInfo(key: string): ChannelInfo {
    let ch = this.channels.get(key);
    if (!ch) { ch = { key, summaries: [], levels: new Map(), meta: undefined }; this.channels.set(key, ch); }
    return ch;
  }

  /**
   * Samples of `channels` in [start, end), filtered as asked (causal unless `zeroPhase`). Reads
   * `warmup` seconds more before the window so the filter has settled at its start.
   */
  async window(channels: string[], start: Micros, end: Micros, filter: FilterRequest | null, zeroPhase = false, warmup = 20, forView = true): Promise<WindowReply> {
    const want = new Set(channels);
    const readFrom = start - warmup * 1e6;
    // Windows for the view always go to worker 0, which keeps the last decoded window: a new filter
    // on the same window is then filtering only. Other reads (e.g. for magnitudes) go to worker 1.
    const cacheKey = `${readFrom}|${end}|${channels.join(',')}`;
    if (forView && cacheKey === this.lastWindowKey) {
      return this.pool.request<WindowReply>({ type: 'window', chunks: [], channels, start, end, filter, zeroPhase, cacheKey }, [], 0);
    }
    const ranges: { path: string; offset: number; length: number }[] = [];
    for (const f of this.files) {
      const keyWanted = f.channelKeys.map((k) => want.has(k));
      if (!keyWanted.some(Boolean)) continue;
      const mine: { path: string; offset: number; length: number }[] = [];
      for (let i = 0; i < f.recOffset.length; i++) {
        if (!keyWanted[f.recChannel[i]] || f.recEnd[i] <= readFrom || f.recStart[i] >= end) continue;
        const last = mine[mine.length - 1];
        const off = f.recOffset[i];
        if (last && off <= last.offset + last.length + 65536) last.length = Math.max(last.length, off + f.recLength[i] - last.offset);
        else mine.push({ path: f.path, offset: off, length: f.recLength[i] });
      }
      ranges.push(...mine);
    }
    // One request for every range: the host reads them in parallel and frames them in one answer.
    const r = await this.host.call('file.readRanges', { root: this.dataset.root, ranges });
    if (!r.ok) {
      this.problems.push({ file: this.dataset.root, reason: r.message });
      return { type: 'window', id: 0, pieces: [], notes: [`could not read the window: ${r.message}`], errors: [] };
    }
    const parts = splitRanges(r.value);
    const chunks: WindowChunk[] = ranges.map((rg, i) => ({ path: rg.path, base: rg.offset, bytes: parts[i] }));
    if (forView) this.lastWindowKey = cacheKey;
    return this.pool.request<WindowReply>({ type: 'window', chunks, channels, start, end, filter, zeroPhase, cacheKey }, [r.value.buffer], forView ? 0 : 1);
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
