/**
 * `daybreak info [--json] PATH...`: what the miniSEED files at PATH hold, per channel: segments,
 * gaps, overlaps, duplicates dropped, and the bad records found (file, byte offset, reason).
 *
 * PATH may be files or folders. Folders are searched recursively; a file found in a folder is read
 * only when its first bytes look like a miniSEED record header (so a README beside the data is not
 * reported as a bad record), while a file named on the command line is always read.
 *
 * Exit codes: 0 everything read, 1 some records or files were bad (and are reported), 2 unusable
 * arguments (no path, a path that does not exist, an unknown option).
 *
 * The `--json` output is a stable interface, documented in DEVELOPERS.md ("info --json"):
 * {@link InfoJson}. Progress goes to stderr, only when stderr is a terminal.
 */
import { openSync, readSync, closeSync, readdirSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { channelKey, encodingName, type ChannelData, type LogChannel, type Segment } from '../../../core/model';
import { isoFromMicros, microsFromIso, type Micros } from '../../../core/time';
import { isMiniSeed3, looksLikeRecordStart } from '../../../core/mseed';
import { readMiniSeedFiles } from '../mseedFiles';

const USAGE = `usage: daybreak info [--json] PATH...

  PATH     miniSEED files, or folders searched recursively
  --json   print one JSON object (format described in DEVELOPERS.md, "info --json")
`;

/** Version of the JSON layout; raised only when a field changes meaning or disappears. */
export const INFO_JSON_VERSION = 1;

export interface InfoSpanJson { start: string; end: string }

export interface InfoSegmentJson {
  /** Time of the first sample, ISO 8601 UTC with microseconds. */
  start: string;
  /** Time of the last sample. */
  end: string;
  /** Samples per second. */
  sampleRate: number;
  samples: number;
  /** SEED encoding name: ASCII, INT16, INT24, INT32, FLOAT32, FLOAT64, STEIM1, STEIM2. */
  encoding: string;
  /** Record length in bytes. */
  recordLength: number;
  records: number;
  /** Data-quality indicator: D, R, Q or M. */
  quality: string;
  /** Lowest and highest blockette 1001 timing quality (%), or null when no record had one. */
  timingQuality: { min: number; max: number } | null;
  /** Records with the clock-locked flag, the questionable-time flag, a leap second, a Steim integration-constant mismatch. */
  flags: { clockLocked: number; questionableTime: number; leapSecond: number; steimMismatch: number };
}

export interface InfoChannelJson {
  /** "NET.STA.LOC.CHA". */
  id: string;
  segments: InfoSegmentJson[];
  /** Missing data: start = the time after the last sample before it, end = the next first sample. */
  gaps: InfoSpanJson[];
  /** Data that overlaps what is held with different samples (kept apart). */
  overlaps: InfoSpanJson[];
  duplicatesDropped: number;
}

export interface InfoJson {
  version: number;
  files: { path: string; records: number; errors: { offset: number; reason: string }[] }[];
  channels: InfoChannelJson[];
  /** ASCII (log) channels: entries and the time of the first and last. */
  logs: { id: string; entries: number; start: string | null; end: string | null }[];
}

function segmentJson(s: Segment): InfoSegmentJson {
  const t = s.timing;
  return {
    start: isoFromMicros(s.start),
    end: isoFromMicros(s.end),
    sampleRate: s.sampleRate,
    samples: s.samples.length,
    encoding: encodingName(s.encoding),
    recordLength: s.recordLength,
    records: t.records,
    quality: s.quality,
    timingQuality: t.qualityMin === null || t.qualityMax === null ? null : { min: t.qualityMin, max: t.qualityMax },
    flags: {
      clockLocked: t.clockLockedRecords,
      questionableTime: t.questionableTimeRecords,
      leapSecond: t.leapSecondRecords,
      steimMismatch: t.steimMismatchRecords,
    },
  };
}

const span = (x: { start: Micros; end: Micros }): InfoSpanJson => ({ start: isoFromMicros(x.start), end: isoFromMicros(x.end) });

/** The `--json` object for what was read. Channels and logs sorted by id. */
export function infoJson(result: {
  files: { path: string; records: number; errors: { offset: number; reason: string }[] }[];
  channels: readonly ChannelData[];
  logs: readonly LogChannel[];
}): InfoJson {
  const byKey = <T extends { id: Parameters<typeof channelKey>[0] }>(a: T, b: T) => (channelKey(a.id) < channelKey(b.id) ? -1 : 1);
  return {
    version: INFO_JSON_VERSION,
    files: result.files.map((f) => ({ path: f.path, records: f.records, errors: f.errors.map((e) => ({ offset: e.offset, reason: e.reason })) })),
    channels: [...result.channels].sort(byKey).map((c) => ({
      id: channelKey(c.id),
      segments: c.segments.map(segmentJson),
      gaps: c.gaps.map(span),
      overlaps: c.overlaps.map(span),
      duplicatesDropped: c.duplicatesDropped,
    })),
    logs: [...result.logs].sort(byKey).map((l) => ({
      id: channelKey(l.id),
      entries: l.entries.length,
      start: l.entries.length ? isoFromMicros(l.entries[0].time) : null,
      end: l.entries.length ? isoFromMicros(l.entries[l.entries.length - 1].time) : null,
    })),
  };
}

// ---- the human-readable layout -------------------------------------------------------------

/** "2026-12-02 03:29:24.123456" (UTC; the Z is said once in the header). */
function when(iso: string): string {
  return iso.replace('T', ' ').replace('Z', '');
}

/** A duration in words: "0.010 s", "12 min 5.0 s", "3 h 02 min". */
export function duration(seconds: number): string {
  const a = Math.abs(seconds);
  const sign = seconds < 0 ? '-' : '';
  if (a < 60) return `${sign}${a < 10 ? a.toFixed(3) : a.toFixed(1)} s`;
  if (a < 3600) return `${sign}${Math.floor(a / 60)} min ${(a % 60).toFixed(1)} s`;
  const h = Math.floor(a / 3600);
  const m = Math.floor((a % 3600) / 60);
  return `${sign}${h} h ${String(m).padStart(2, '0')} min`;
}

function secondsBetween(a: string, b: string): number {
  return (microsFromIso(b) - microsFromIso(a)) / 1e6;
}

function table(rows: string[][], rightAligned: Set<number>): string[] {
  const widths = rows[0].map((_, i) => Math.max(...rows.map((r) => r[i].length)));
  return rows.map((r) => r.map((cell, i) => (rightAligned.has(i) ? cell.padStart(widths[i]) : cell.padEnd(widths[i]))).join('  ').trimEnd());
}

/** The human-readable report: one block per station, then logs, then files and their errors. */
export function infoText(info: InfoJson): string {
  const out: string[] = [];
  const stations = new Map<string, InfoChannelJson[]>();
  for (const c of info.channels) {
    const st = c.id.split('.').slice(0, 2).join('.');
    const list = stations.get(st);
    if (list) list.push(c);
    else stations.set(st, [c]);
  }
  const totalSamples = info.channels.reduce((n, c) => n + c.segments.reduce((m, s) => m + s.samples, 0), 0);
  const totalRecords = info.files.reduce((n, f) => n + f.records, 0);
  const totalErrors = info.files.reduce((n, f) => n + f.errors.length, 0);
  out.push(`${info.channels.length} channel${info.channels.length === 1 ? '' : 's'} at ${stations.size} station${stations.size === 1 ? '' : 's'}, ` +
    `${totalSamples.toLocaleString('en-US')} samples in ${totalRecords.toLocaleString('en-US')} records from ${info.files.length} file${info.files.length === 1 ? '' : 's'}; times UTC`);
  for (const [st, channels] of stations) {
    out.push('', `== ${st}`);
    const rows: string[][] = [['  loc.cha', 'first sample', 'last sample', 'Hz', 'samples', 'encoding', 'rec', 'q', 'timing %']];
    const notes: string[] = [];
    for (const c of channels) {
      const locCha = c.id.split('.').slice(2).join('.');
      c.segments.forEach((s, i) => {
        const tq = s.timingQuality ? (s.timingQuality.min === s.timingQuality.max ? `${s.timingQuality.min}` : `${s.timingQuality.min}-${s.timingQuality.max}`) : '-';
        rows.push([i === 0 ? `  ${locCha}` : '', when(s.start), when(s.end), String(s.sampleRate), s.samples.toLocaleString('en-US'),
          s.encoding, String(s.recordLength), s.quality, tq]);
        const f = s.flags;
        const marks = [
          f.questionableTime ? `${f.questionableTime} records with questionable time tag` : '',
          f.leapSecond ? `${f.leapSecond} with a leap second` : '',
          f.steimMismatch ? `${f.steimMismatch} with a Steim integration-constant mismatch` : '',
          s.records > 0 && f.clockLocked === 0 && s.timingQuality !== null ? 'clock never locked' : '',
        ].filter(Boolean);
        if (marks.length) notes.push(`  ${locCha} segment ${i + 1}: ${marks.join(', ')}`);
      });
      for (const g of c.gaps) notes.push(`  ${locCha} gap      ${when(g.start)} .. ${when(g.end)}  (${duration(secondsBetween(g.start, g.end))})`);
      for (const o of c.overlaps) notes.push(`  ${locCha} overlap  ${when(o.start)} .. ${when(o.end)}  (${duration(secondsBetween(o.start, o.end))}, samples differ, kept apart)`);
      if (c.duplicatesDropped) notes.push(`  ${locCha} ${c.duplicatesDropped} duplicate record${c.duplicatesDropped === 1 ? '' : 's'} dropped`);
    }
    out.push(...table(rows, new Set([3, 4, 6])));
    if (notes.length) out.push(...notes);
  }
  if (info.logs.length) {
    out.push('', '== logs');
    for (const l of info.logs) out.push(`  ${l.id}  ${l.entries} entr${l.entries === 1 ? 'y' : 'ies'}${l.start ? `  ${when(l.start)} .. ${when(l.end as string)}` : ''}`);
  }
  out.push('', `== files: ${info.files.length}, ${totalErrors ? `${totalErrors} problem${totalErrors === 1 ? '' : 's'}` : 'all records read'}`);
  for (const f of info.files) {
    if (f.errors.length === 0 && info.files.length > 20) continue;
    out.push(`  ${f.path}  ${f.records} record${f.records === 1 ? '' : 's'}${f.errors.length ? `, ${f.errors.length} bad` : ''}`);
    for (const e of f.errors) out.push(`    byte ${e.offset}: ${e.reason}`);
  }
  return out.join('\n') + '\n';
}

// ---- arguments, files, progress -------------------------------------------------------------

class ArgumentError extends Error {}

/** Files under `dir`, recursively, in name order, that start like a miniSEED record. */
function miniSeedFilesUnder(dir: string, found: string[]): void {
  const entries = readdirSync(dir, { withFileTypes: true }).sort((a, b) => (a.name < b.name ? -1 : 1));
  for (const e of entries) {
    if (e.name.startsWith('.')) continue;
    const p = join(dir, e.name);
    if (e.isDirectory()) miniSeedFilesUnder(p, found);
    else if (e.isFile() && startsLikeMiniSeed(p)) found.push(p);
  }
}

function startsLikeMiniSeed(path: string): boolean {
  const head = new Uint8Array(64);
  const fd = openSync(path, 'r');
  try {
    const n = readSync(fd, head, 0, head.length, 0);
    const bytes = head.subarray(0, n);
    // miniSEED 3 files are passed on too: the reader reports them as not supported yet.
    return looksLikeRecordStart(bytes, 0) || isMiniSeed3(bytes, 0);
  } finally {
    closeSync(fd);
  }
}

function parseArgs(args: string[]): { json: boolean; paths: string[] } {
  let json = false;
  const paths: string[] = [];
  let optionsDone = false;
  for (const a of args) {
    if (!optionsDone && a === '--') optionsDone = true;
    else if (!optionsDone && a === '--json') json = true;
    else if (!optionsDone && a.startsWith('-') && a !== '-') throw new ArgumentError(`unknown option "${a}"`);
    else paths.push(a);
  }
  if (paths.length === 0) throw new ArgumentError('no PATH given');
  const files: string[] = [];
  for (const p of paths) {
    let st;
    try {
      st = statSync(p);
    } catch {
      throw new ArgumentError(`no such file or folder: "${p}"`);
    }
    if (st.isDirectory()) miniSeedFilesUnder(p, files);
    else files.push(p);
  }
  return { json, paths: files };
}

/** A one-line progress display on a terminal, redrawn at most ten times a second. */
function progressLine(stream: NodeJS.WriteStream): { update: (text: string) => void; done: () => void } {
  let last = 0;
  let shown = false;
  return {
    update(text) {
      const now = Date.now();
      if (now - last < 100) return;
      last = now;
      shown = true;
      stream.write(`\r${text.slice(0, Math.max(10, (stream.columns ?? 80) - 1))}\x1b[K`);
    },
    done() {
      if (shown) stream.write('\r\x1b[K');
    },
  };
}

export async function info(args: string[]): Promise<number> {
  if (args.includes('--help') || args.includes('-h')) {
    process.stdout.write(USAGE);
    return 0;
  }
  let parsed;
  try {
    parsed = parseArgs(args);
  } catch (e) {
    if (!(e instanceof ArgumentError)) throw e;
    process.stderr.write(`daybreak info: ${e.message}\n${USAGE}`);
    return 2;
  }
  const progress = process.stderr.isTTY ? progressLine(process.stderr) : null;
  const files = parsed.paths.length;
  const result = await readMiniSeedFiles(parsed.paths, {
    onProgress: progress ? (done, total) => progress.update(progressText(files, done, total)) : undefined,
  });
  progress?.done();
  const report = infoJson(result);
  process.stdout.write(parsed.json ? `${JSON.stringify(report, null, 2)}\n` : infoText(report));
  const bad = report.files.some((f) => f.errors.length > 0);
  return bad ? 1 : 0;
}

/** "reading 340 files: 45% of 2.4 GB" (the reader passes over every file twice: headers, then samples). */
function progressText(files: number, done: number, total: number): string {
  const size = total / 2;
  const amount = size >= 1e9 ? `${(size / 1e9).toFixed(1)} GB` : `${(size / 1e6).toFixed(size < 1e7 ? 1 : 0)} MB`;
  return `reading ${files} file${files === 1 ? '' : 's'}: ${total > 0 ? Math.floor((100 * done) / total) : 100}% of ${amount}`;
}
