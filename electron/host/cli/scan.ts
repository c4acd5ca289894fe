/**
 * `daybreak scan --stations STATIONXML --out OUT.xml [options] PATH...`: the overnight scan. Reads the
 * miniSEED at PATH (files, or folders searched recursively), filters, triggers (STA/LTA per site),
 * associates (network coincidence) and picks (AIC P and S), then writes QuakeML 1.2: one event per
 * candidate with its picks (evaluation mode automatic, status preliminary), and for each located
 * candidate its local magnitude (core/magnitude eventMagnitude: IASPEI 2013 ML on the larger
 * horizontal, median over stations) with the Wood-Anderson amplitudes and station magnitudes.
 *
 * How the night is processed (memory bounded by chunk length x stations, not by the night):
 *  1. Every file's record headers are walked in chunks (no samples decoded): the record index.
 *  2. Trigger pass: the night is cut into time chunks (`--chunk`, default 600 s); for each chunk only
 *     the records of the chosen verticals in it are read and decoded (day files split at midnight are
 *     joined by the collector); each channel's causal filter and STA/LTA carry their state from chunk
 *     to chunk, so the triggers are those of one pass over the whole night whatever the chunk length.
 *  3. Coincidence over all triggers (a few numbers each) gives the candidate events.
 *  4. Pick pass: per event, only the records around it are read again, at every site (from
 *     `filterPad` seconds before the earliest P window or re-trigger LTA, so the filter has settled;
 *     to the end of the longest S window) and picked (core/scan eventPicks: core/pick's
 *     pickEventSites, with a P-only location widening the S window for distant events).
 *     A located candidate's triggers that its origin explains at neither P nor S (a second event
 *     3-20 s after the first: a doublet, an early aftershock) go through the coincidence again; three
 *     or more sites that agree make a candidate of their own, picked without the first event's
 *     onsets and written when its origin fits (core/pick unexplainedTriggers, core/scan/duplicates.ts
 *     leaveOutOthersOnsets). A candidate whose origin fits badly (two events seconds apart, the first
 *     the weaker, in one candidate) is picked and located again on the triggers of its earliest P
 *     wave front, which keeps that origin when it fits; otherwise its triggers later than that front
 *     allows for P go through the coincidence again, judged as above (core/pick/front.ts); once such a
 *     split candidate is written, the mixed one is picked again without its onsets and kept so when
 *     it fits better.
 *     Each candidate is located (core/scan eventOrigin, outliers left out at weight 0); misfits of
 *     the location are read again around their predicted times and the event located again
 *     (core/scan/reread.ts).
 *  5. One event read twice is written once (core/scan/duplicates.ts leaveOutDuplicates).
 *  6. Magnitude: per located event, the horizontals around its amplitude windows are read (with a
 *     margin for the response-removal taper) and measured.
 *
 * Exit codes: 0 done; 1 done, but some input was bad or unknown and was reported (bad records, a file
 * named on the command line that is not miniSEED, channels without metadata); 2 unusable arguments.
 * Files found in folders that are not miniSEED (StationXML, JSON, text) are skipped with a note. The
 * output is written to a temporary file beside OUT and renamed over it when complete.
 */
import { openSync, readSync, closeSync, readFileSync, renameSync, statSync, unlinkSync, writeFileSync } from 'node:fs';
import { basename, dirname } from 'node:path';
import { channelKey, parseChannelKey, sampleTime, stationKey, type ChannelData, type ChannelId } from '../../../core/model';
import { isoFromMicros, type Micros } from '../../../core/time';
import { isMiniSeed3, looksLikeRecordStart } from '../../../core/mseed';
import { parseStationXml, findChannel, missingMetadata, type Inventory } from '../../../core/stationxml';
import { designForChannel, verticalPolarity } from '../../../core/dsp';
import {
  afterFront, chooseSiteStreams, coincidence, earliestFront, LOCAL_EVENT_PICKING, unexplainedTriggers,
  type CandidateEvent, type OriginPick, type Pick, type SitePosition, type StationTrigger,
} from '../../../core/pick';
import { pickComment, preferredOrigin, writeQuakeMl, type QmlEvent, type QmlOrigin } from '../../../core/quakeml';
import {
  channelResponse, eventMagnitude, magnitudeOrigin, stationWindows, type EventMagnitude, type HorizontalTrace, type MagnitudeStation,
} from '../../../core/magnitude';
import { CAUTION } from '../../../core/caution';
import { presetSettings, SCAN_PRESETS, type ScanPreset, type ScanSettings } from '../../../core/scan/settings';
import { choosePreset } from '../../../core/scan/presetChoice';
import { atomicTempPath, removeStaleTemps } from '../atomicTemp';
import { TriggerStream } from '../../../core/scan/triggerStream';
import { eventPicks, pickId, rereadSites, type PickChannel, type PickSite } from '../../../core/scan/eventPicks';
import { earliestOriginFromP, eventOrigin, siteLocation, type OriginOutcome, type SiteCoordinates } from '../../../core/scan/eventOrigin';
import { FIT_S, leaveOutDuplicates, leaveOutOthersOnsets, originPredictor } from '../../../core/scan/duplicates';
import { rereadMisfits, type RereadChange } from '../../../core/scan/reread';
import { DEFAULT_MODEL, MIN_PHASES, parseVelocityModel, type VelocityModel } from '../../../core/location';
import { listFiles } from '../mseedFiles';
import { indexFile, readWindow, type IndexedFile } from '../scan/recordFiles';
import { duration } from './info';

const USAGE = `usage: daybreak scan --stations STATIONXML --out OUT.xml [options] PATH...

  PATH                 miniSEED files, or folders searched recursively (other files there are skipped)
  --stations FILE      FDSN StationXML with every station to use (others are reported and left out)
  --out FILE           QuakeML 1.2 to write (replaced atomically when the scan is done)
  --preset NAME        settings: local (default; local earthquakes, 40-200 Hz), near (near-source
                       microseismic at about 500 Hz in short event cuts), or auto (near when the
                       sites are 3 km apart or less in the median, else local)
  --band LO,HI         trigger and pick band-pass, Hz (preset: 2,15 or 5,150)
  --sta S --lta S      STA/LTA windows, seconds (preset: 0.5/20 or 0.05/1)
  --on R --off R       trigger-on and trigger-off ratios (4 and 2)
  --min-sites N        sites that must trigger together (3)
  --vmin V             slowest P velocity the coincidence allows, km/s (3)
  --chunk S            seconds of data processed at a time (600); bounds memory
  --model FILE         velocity model JSON for the origins (default: core/location's DEFAULT_MODEL)
  --agency ID          creationInfo agencyID (default "daybreak")
  --author NAME        creationInfo author (default "daybreak scan")
  --authority A        authority of the smi: identifiers (default "daybreak.local")
  --progress MODE      bar (default on a terminal), none (default otherwise), or lines: one line
                       "progress FRACTION WHAT" on stderr at most 4 times a second, for programs

exit codes: 0 done; 1 done, some input was bad or unknown (reported); 2 unusable arguments;
3 failed (the reason on stderr; OUT left as it was)
`;

class ArgumentError extends Error {}

export interface ScanArgs {
  stations: string;
  /** Velocity model for the origins and the name written as its earthModelID. */
  model: VelocityModel;
  modelId: string;
  out: string;
  paths: string[];
  /** The preset named on the command line ('auto': chosen from the sites once they are known). */
  preset: ScanPreset | 'auto';
  /** The settings of a preset with the command line's own values (band, STA/LTA, ...) applied. */
  settingsFor: (preset: ScanPreset) => ScanSettings;
  /** settingsFor(preset), or settingsFor('local') until an 'auto' preset is chosen. */
  settings: ScanSettings;
  /** How progress is shown on stderr. */
  progress: 'bar' | 'lines' | 'none';
  agency: string;
  author: string;
  authority: string;
}

function num(name: string, v: string | undefined, min: number, max: number, integer = false): number {
  const x = Number(v);
  if (v === undefined || v.trim() === '' || !Number.isFinite(x) || x < min || x > max || (integer && !Number.isInteger(x))) {
    throw new ArgumentError(`${name} must be ${integer ? 'an integer' : 'a number'} from ${min} to ${max}, got "${v ?? ''}"`);
  }
  return x;
}

export function parseScanArgs(args: string[]): ScanArgs {
  const values = new Map<string, string>();
  const paths: string[] = [];
  const known = ['--progress', '--stations', '--out', '--preset', '--band', '--sta', '--lta', '--on', '--off', '--min-sites', '--vmin', '--chunk', '--agency', '--author', '--authority', '--model'];
  let optionsDone = false;
  for (let i = 0; i < args.length; i++) {
    const a = args[i];
    if (!optionsDone && a === '--') optionsDone = true;
    else if (!optionsDone && a.startsWith('--')) {
      const eq = a.indexOf('=');
      const name = eq > 0 ? a.slice(0, eq) : a;
      if (!known.includes(name)) throw new ArgumentError(`unknown option "${a}"`);
      const v = eq > 0 ? a.slice(eq + 1) : args[++i];
      if (v === undefined) throw new ArgumentError(`${name} needs a value`);
      values.set(name, v);
    } else if (!optionsDone && a.startsWith('-') && a !== '-') throw new ArgumentError(`unknown option "${a}"`);
    else paths.push(a);
  }
  const stations = values.get('--stations');
  const out = values.get('--out');
  if (!stations) throw new ArgumentError('--stations STATIONXML is required');
  if (!out) throw new ArgumentError('--out OUT.xml is required');
  if (paths.length === 0) throw new ArgumentError('no PATH given');
  const preset = values.get('--preset') ?? 'local';
  if (preset !== 'auto' && !SCAN_PRESETS.includes(preset as ScanPreset)) throw new ArgumentError(`--preset must be one of ${SCAN_PRESETS.join(', ')} or auto, got "${preset}"`);
  let corners: [number, number] | null = null;
  const band = values.get('--band');
  if (band !== undefined) {
    const parts = band.split(/[,:]/);
    if (parts.length !== 2) throw new ArgumentError(`--band must be LO,HI in Hz, got "${band}"`);
    const lo = num('--band low corner (Hz)', parts[0], 1e-3, 1e5);
    const hi = num('--band high corner (Hz)', parts[1], 1e-3, 1e5);
    if (!(hi > lo)) throw new ArgumentError(`--band high corner must be above the low corner, got "${band}"`);
    corners = [lo, hi];
  }
  const ownStaLta: Partial<Record<'sta' | 'lta' | 'triggerOn' | 'triggerOff', number>> = {};
  if (values.has('--sta')) ownStaLta.sta = num('--sta (s)', values.get('--sta'), 1e-3, 3600);
  if (values.has('--lta')) ownStaLta.lta = num('--lta (s)', values.get('--lta'), 1e-3, 86400);
  if (values.has('--on')) ownStaLta.triggerOn = num('--on', values.get('--on'), 1, 1e6);
  if (values.has('--off')) ownStaLta.triggerOff = num('--off', values.get('--off'), 0.01, 1e6);
  const minSites = values.has('--min-sites') ? num('--min-sites', values.get('--min-sites'), 1, 10000, true) : null;
  const vMin = values.has('--vmin') ? num('--vmin (km/s)', values.get('--vmin'), 0.01, 100) : null;
  const chunkSeconds = values.has('--chunk') ? num('--chunk (s)', values.get('--chunk'), 1, 86400 * 7) : null;
  const settingsFor = (name: ScanPreset): ScanSettings => {
    const base = presetSettings(name);
    const staLta = { ...base.staLta, ...ownStaLta };
    const sta = staLta.sta ?? 0.5, lta = staLta.lta ?? 60, on = staLta.triggerOn ?? 4, off = staLta.triggerOff ?? 2;
    // Each value not given on the command line is named as the preset's.
    const of = (k: keyof typeof ownStaLta) => (ownStaLta[k] === undefined ? ` (the ${name} preset's)` : '');
    if (!(lta > sta)) throw new ArgumentError(`--lta must be longer than --sta (${sta} s${of('sta')}), got ${lta}${of('lta')}`);
    if (!(off <= on)) throw new ArgumentError(`--off must be at most --on (${on}${of('triggerOn')}), got ${off}${of('triggerOff')}`);
    return {
      ...base, staLta,
      filter: corners ? { ...base.filter, corners } : base.filter,
      minSites: minSites ?? base.minSites,
      vMin: vMin ?? base.vMin,
      chunkSeconds: chunkSeconds ?? base.chunkSeconds,
    };
  };
  // Checked for every preset 'auto' may choose, so a bad combination is refused before any work.
  const settings = settingsFor(preset === 'auto' ? 'local' : preset as ScanPreset);
  if (preset === 'auto') for (const p of SCAN_PRESETS) settingsFor(p);
  const progress = values.get('--progress') ?? (process.stderr.isTTY ? 'bar' : 'none');
  if (progress !== 'bar' && progress !== 'lines' && progress !== 'none') throw new ArgumentError(`--progress must be bar, lines or none, got "${progress}"`);
  const agency = values.get('--agency') ?? 'daybreak';
  const author = values.get('--author') ?? 'daybreak scan';
  const authority = values.get('--authority') ?? 'daybreak.local';
  if (!/^[\w.\-~]{1,200}$/.test(authority)) throw new ArgumentError(`--authority must be 1-200 of letters, digits and .-_~, got "${authority}"`);
  let model = DEFAULT_MODEL;
  let modelId = 'default';
  const modelPath = values.get('--model');
  if (modelPath !== undefined) {
    let text: string;
    try { text = readFileSync(modelPath, 'utf8'); } catch { throw new ArgumentError(`--model: cannot read "${modelPath}"`); }
    try { model = parseVelocityModel(text, modelPath); } catch (e) { throw new ArgumentError(`--model: ${(e as Error).message}`); }
    modelId = basename(modelPath).replace(/\.json$/i, '').replace(/[^\w.\-~]/g, '_') || 'model';
  }
  for (const p of paths) {
    try { statSync(p); } catch { throw new ArgumentError(`no such file or folder: "${p}"`); }
  }
  try {
    if (!statSync(stations).isFile()) throw new Error();
  } catch { throw new ArgumentError(`--stations: no such file: "${stations}"`); }
  try {
    if (!statSync(dirname(out)).isDirectory()) throw new Error();
  } catch { throw new ArgumentError(`--out: the folder "${dirname(out)}" does not exist`); }
  return { stations, model, modelId, out, paths, preset: preset as ScanPreset | 'auto', settingsFor, settings, progress, agency, author, authority };
}

function miniSeedKind(path: string): 'mseed2' | 'mseed3' | 'other' {
  const head = new Uint8Array(64);
  const fd = openSync(path, 'r');
  try {
    const n = readSync(fd, head, 0, head.length, 0);
    const bytes = head.subarray(0, n);
    if (looksLikeRecordStart(bytes, 0)) return 'mseed2';
    return isMiniSeed3(bytes, 0) ? 'mseed3' : 'other';
  } finally {
    closeSync(fd);
  }
}

interface Progress { update: (fraction: number, text: string) => void; done: () => void }

/** Progress as lines "progress FRACTION WHAT" for a program reading stderr, at most 4 a second. */
function progressLines(stream: NodeJS.WritableStream): Progress {
  let last = 0;
  return {
    update(fraction, text) {
      const now = Date.now();
      if (now - last < 250) return;
      last = now;
      stream.write(`progress ${Math.max(0, Math.min(1, fraction)).toFixed(4)} ${text.replace(/\s+/g, ' ')}\n`);
    },
    done() {
      stream.write('progress 1.0000 writing\n');
    },
  };
}

/** A one-line progress bar on a terminal, redrawn at most ten times a second. */
function progressBar(stream: NodeJS.WriteStream): Progress {
  let last = 0;
  let shown = false;
  return {
    update(fraction, text) {
      const now = Date.now();
      if (now - last < 100) return;
      last = now;
      shown = true;
      const width = 24;
      const f = Math.max(0, Math.min(1, fraction));
      const full = Math.round(f * width);
      const line = `[${'#'.repeat(full)}${'-'.repeat(width - full)}] ${String(Math.floor(f * 100)).padStart(3)}% ${text}`;
      stream.write(`\r${line.slice(0, Math.max(10, (stream.columns ?? 80) - 1))}\x1b[K`);
    },
    done() {
      if (shown) stream.write('\r\x1b[K');
    },
  };
}

/** The part of a segment's samples with times in [from, to) µs, with the time of its first sample. */
function cut(seg: ChannelData['segments'][number], from: Micros, to: Micros): { samples: ChannelData['segments'][number]['samples']; start: Micros } | null {
  const n = seg.samples.length;
  const timeOf = (i: number) => sampleTime(seg, i);
  const firstAtOrAfter = (t: Micros) => {
    let lo = 0, hi = n;
    while (lo < hi) { const mid = (lo + hi) >> 1; if (timeOf(mid) < t) lo = mid + 1; else hi = mid; }
    return lo;
  };
  const a = firstAtOrAfter(from);
  const b = firstAtOrAfter(to);
  if (b <= a) return null;
  return { samples: seg.samples.subarray(a, b), start: timeOf(a) };
}

interface SiteInfo {
  key: string;
  vertical: ChannelId;
  horizontals: readonly [ChannelId, ChannelId] | null;
  position: SitePosition;
  /** The vertical sensor's position, for the locator (elevation minus burial depth, m). */
  coordinates: SiteCoordinates;
}

export interface ScanSummary {
  files: number;
  skippedFiles: { path: string; why: string }[];
  badRecords: { path: string; offset: number; reason: string }[];
  channels: number;
  hours: number;
  candidates: number;
  located: number;
  /** Channels left out of a magnitude, and why ("NET.STA.LOC.CHA: reason"), once per event. */
  magnitudeNotes: string[];
  /** Located events with a local magnitude. */
  magnitudes: number;
  picks: { P: number; S: number };
  /** Candidates left out as another candidate read twice: "ID (the same picks as ID)" or "ID (its picks fit ID's origin)". */
  duplicates: string[];
  /** Candidates made of another's triggers: "ID (inside ID's window)", or left out: "ID left out (why)". */
  split: { text: string; leftOut: boolean }[];
  /** Candidates located on their earliest P wave front: "ID (N of M sites)". */
  fronts: string[];
  /** Mixed first candidates located again without the onsets of the events split from them: "ID (standard error A -> B s)". */
  cleaned: string[];
  /** Picks the location did not fit, read again: replaced by a new reading, or dropped. */
  reread: { replaced: number; dropped: number };
  skippedChannels: { id: string; why: string }[];
  seconds: number;
  /** The preset used, and for --preset auto why it was chosen. */
  settings: string;
}

export async function scan(args: string[]): Promise<number> {
  if (args.includes('--help') || args.includes('-h')) {
    process.stdout.write(USAGE);
    return 0;
  }
  let a: ScanArgs;
  let inv: Inventory;
  try {
    a = parseScanArgs(args);
    try {
      inv = parseStationXml(readFileSync(a.stations, 'utf8'), a.stations);
    } catch (e) {
      throw new ArgumentError(`--stations: ${(e as Error).message}`);
    }
  } catch (e) {
    if (!(e instanceof ArgumentError)) throw e;
    process.stderr.write(`daybreak scan: ${e.message}\n${USAGE}`);
    return 2;
  }
  try {
    return await scanNight(a, inv);
  } catch (e) {
    // Exit code 3, not Node's 1 for an uncaught error: 1 means the scan was done and some input was
    // bad, and the desk's scan job would read the previous output as this scan's.
    process.stderr.write(`${a.progress === 'bar' ? '\n' : ''}daybreak scan: failed: ${e instanceof Error ? e.message : String(e)}\n`);
    return 3;
  }
}

/** The scan itself, once its arguments and StationXML are read; returns the exit code (0 or 1). */
async function scanNight(a: ScanArgs, inv: Inventory): Promise<number> {
  const t0 = performance.now();
  let s = a.settings;
  const bar = a.progress === 'bar' ? progressBar(process.stderr) : a.progress === 'lines' ? progressLines(process.stderr) : null;
  const summary: ScanSummary = {
    files: 0, skippedFiles: [], badRecords: [], channels: 0, hours: 0, candidates: 0, located: 0, magnitudeNotes: [], magnitudes: 0, picks: { P: 0, S: 0 }, duplicates: [], split: [], fronts: [], cleaned: [], reread: { replaced: 0, dropped: 0 }, skippedChannels: [], seconds: 0, settings: a.preset,
  };
  let bad = false;

  // Files: miniSEED 2 is read; others found in folders are skipped with a note.
  const named = new Set(a.paths.filter((p) => statSync(p).isFile()));
  const found = await listFiles(a.paths);
  const mseed: { path: string; size: number }[] = [];
  for (const f of found) {
    const kind = f.size === 0 ? 'other' : miniSeedKind(f.path);
    if (kind === 'mseed2') { mseed.push(f); continue; }
    const why = kind === 'mseed3' ? 'miniSEED 3, not supported yet' : `not miniSEED${f.size === 0 ? ' (empty)' : ''}`;
    summary.skippedFiles.push({ path: f.path, why });
    if (named.has(f.path) || kind === 'mseed3') bad = true;
  }
  summary.files = mseed.length;

  // Pass 0: record index.
  const totalBytes = mseed.reduce((n, f) => n + f.size, 0);
  let doneBytes = 0;
  const files: IndexedFile[] = [];
  for (const f of mseed) {
    bar?.update(0.2 * (doneBytes / Math.max(1, totalBytes)), `indexing ${basename(f.path)}`);
    const ix = await indexFile(f.path, f.size);
    doneBytes += f.size;
    for (const p of ix.index.problems) summary.badRecords.push({ path: f.path, offset: p, reason: 'not a readable miniSEED record' });
    files.push(ix);
  }

  // Channels seen, their spans; metadata.
  const spans = new Map<string, { id: ChannelId; start: Micros; end: Micros }>();
  for (const f of files) {
    for (const r of f.index.records) {
      const sp = spans.get(r.channel);
      if (sp) { sp.start = Math.min(sp.start, r.start); sp.end = Math.max(sp.end, r.end); } else spans.set(r.channel, { id: parseChannelKey(r.channel), start: r.start, end: r.end });
    }
  }
  summary.channels = spans.size;
  const missing = missingMetadata(inv, [...spans.values()]);
  for (const m of missing.waveforms) {
    summary.skippedChannels.push({ id: m.key, why: m.reason === 'no-channel' ? 'not in the StationXML' : 'no StationXML epoch covers its data' });
    bad = true;
  }
  for (const m of missing.stateOfHealth) summary.skippedChannels.push({ id: m.key, why: 'state of health or log, no metadata' });
  const missingKeys = new Set([...missing.waveforms, ...missing.stateOfHealth].map((m) => m.key));
  const usable = [...spans.values()].filter((c) => !missingKeys.has(channelKey(c.id)) && c.id.channel.length === 3);
  const streams = chooseSiteStreams(usable.map((c) => c.id));
  const chosen = new Set<string>();
  const sites = new Map<string, SiteInfo>();
  const midOf = (id: ChannelId) => { const sp = spans.get(channelKey(id)); return sp ? Math.round((sp.start + sp.end) / 2) : 0; };
  for (const st of streams) {
    const meta = findChannel(inv, st.vertical, midOf(st.vertical));
    if (!meta) continue;
    sites.set(st.site, {
      key: st.site, vertical: st.vertical, horizontals: st.horizontals, position: { latitude: meta.latitude, longitude: meta.longitude },
      coordinates: { latitude: meta.latitude, longitude: meta.longitude, elevationM: meta.elevation - meta.depth },
    });
    chosen.add(channelKey(st.vertical));
    if (st.horizontals) for (const h of st.horizontals) chosen.add(channelKey(h));
  }
  for (const c of usable) {
    const key = channelKey(c.id);
    if (chosen.has(key)) continue;
    const site = sites.get(stationKey(c.id));
    summary.skippedChannels.push({
      id: key,
      why: site ? `site ${site.key} uses ${site.vertical.location}.${site.vertical.channel.slice(0, 2)}` : 'no vertical at this site (or not a ground-motion channel)',
    });
  }
  if (a.preset === 'auto') {
    const positions = [...sites.values()].map((x) => x.coordinates);
    if (positions.length >= 2) {
      const choice = choosePreset(positions);
      s = a.settingsFor(choice.preset);
      summary.settings = `${choice.preset} (auto: ${choice.reason})`;
    } else summary.settings = `local (auto: fewer than two sites with data and coordinates)`;
  } else summary.settings = a.preset;

  // Filters per sample rate (corners clamped per channel by designForChannel).
  const sosCache = new Map<number, Float64Array>();
  const sosFor = (rate: number) => {
    let sos = sosCache.get(rate);
    if (!sos) { sos = designForChannel(s.filter, rate).sos; sosCache.set(rate, sos); }
    return sos;
  };

  // Pass 1: triggers, chunk by chunk.
  const verticals = new Set([...sites.values()].map((x) => channelKey(x.vertical)));
  let tStart = Infinity, tEnd = -Infinity;
  for (const k of verticals) { const sp = spans.get(k)!; tStart = Math.min(tStart, sp.start); tEnd = Math.max(tEnd, sp.end); }
  const streamsByKey = new Map<string, TriggerStream>();
  const triggers: StationTrigger[] = [];
  const decodeErrors = new Set<string>();
  const noteErrors = (errs: { path: string; error: { offset: number; reason: string } }[]) => {
    for (const e of errs) {
      const k = `${e.path}\u0000${e.error.offset}`;
      if (decodeErrors.has(k)) continue;
      decodeErrors.add(k);
      summary.badRecords.push({ path: e.path, offset: e.error.offset, reason: e.error.reason });
    }
  };
  const chunk = Math.round(s.chunkSeconds * 1e6);
  let dataSeconds = 0;
  if (verticals.size > 0) {
    for (let from = tStart; from < tEnd; from += chunk) {
      const to = Math.min(from + chunk, tEnd);
      bar?.update(0.2 + 0.6 * ((from - tStart) / Math.max(1, tEnd - tStart)), `triggering ${isoFromMicros(from).slice(0, 19)}`);
      const w = await readWindow(files, verticals, from, to);
      noteErrors(w.errors);
      for (const ch of w.channels) {
        const key = channelKey(ch.id);
        for (const seg of ch.segments) {
          const part = cut(seg, from, to);
          if (!part) continue;
          let ts = streamsByKey.get(key);
          if (ts && ts.sampleRate !== seg.sampleRate) {
            triggers.push(...ts.finish());
            ts = undefined;
          }
          if (!ts) {
            try {
              ts = new TriggerStream(ch.id, seg.sampleRate, sosFor(seg.sampleRate), s.staLta);
            } catch (e) {
              summary.skippedChannels.push({ id: key, why: (e as Error).message });
              verticals.delete(key);
              break;
            }
            streamsByKey.set(key, ts);
          }
          triggers.push(...ts.push(part.samples, part.start));
          dataSeconds += part.samples.length / seg.sampleRate;
        }
      }
    }
    for (const ts of streamsByKey.values()) triggers.push(...ts.finish());
  }
  summary.hours = dataSeconds / 3600 / Math.max(1, verticals.size);

  // Coincidence.
  const positions = new Map<string, SitePosition>();
  for (const x of sites.values()) positions.set(x.key, x.position);
  const networks = [...new Set([...sites.values()].map((x) => x.vertical.network))].sort();
  const network = networks.length === 1 && /^[A-Za-z0-9_-]{1,16}$/.test(networks[0]) ? networks[0] : 'NET';
  const coincide = { minSites: s.minSites, vMin: s.vMin, slack: s.slack, network };
  const events: CandidateEvent[] = triggers.length ? coincidence(triggers, positions, coincide) : [];

  // Pass 2: picks per event, at every site whose data covers it (sites that did not trigger are
  // searched with pickEventSites' lower re-trigger level).
  const onsetBefore = s.onset.before ?? 1.0;
  const snrNoise = s.onset.snrNoise ?? 5;
  const vpVsMax = s.sWindow.vpVsMax ?? 2.0;
  const lta = s.staLta.lta ?? 60;
  const coords = new Map([...sites.values()].map((x) => [x.key, x.coordinates]));
  const locations = new Map([...coords].map(([key, c]) => [key, siteLocation(c)]));
  const earliestOrigin = (pp: readonly OriginPick[]) => earliestOriginFromP(pp, coords, a.model, s.maxPTravelTime);
  const qmlEvents: QmlEvent[] = [];
  const predict = originPredictor(locations, a.model);
  // Candidates found inside other events' coincidence windows, with those events (earliest first).
  const foundIn = new Map<CandidateEvent, QmlEvent[]>();
  // The candidate each of those was found inside, and from which triggers.
  const insideOf = new Map<CandidateEvent, { id: string; why: string }>();
  // Candidates split off a mixed one by the triggers later than its earliest P wave front, with it;
  // each mixed candidate with its event as written and the split candidates written from it.
  const splitFrom = new Map<CandidateEvent, CandidateEvent>();
  const mixed = new Map<CandidateEvent, { qe: QmlEvent; splits: QmlEvent[] }>();
  // A first event located again without the onsets of an event split from it, and that event.
  const distinct: [QmlEvent, QmlEvent][] = [];
  // A location's standard error (Infinity when not located) and the phases it used.
  const fitOf = (o: OriginOutcome) => (o.ok
    ? { se: o.origin.quality?.standardError ?? Infinity, used: o.origin.quality?.usedPhaseCount ?? 0 }
    : { se: Infinity, used: 0 });
  // What a candidate split off another must show to be written: its own origin fits its picks as well
  // as an origin must to predict anything (FIT_S), with more phases used than the four unknowns (with
  // four, any four times fit exactly).
  const fitsAsSplit = (o: OriginOutcome) => fitOf(o).se <= FIT_S && fitOf(o).used > MIN_PHASES;
  // A candidate made during the loop is picked in its turn: queued after the k-th, in time order,
  // under an identifier no other candidate has.
  const queue = (made: readonly CandidateEvent[], k: number) => {
    for (const m of made) {
      let at = k + 1;
      while (at < events.length && events[at].time <= m.time) at++;
      events.splice(at, 0, m);
    }
  };
  const coincideAgain = (list: StationTrigger[]) => coincidence(list, positions, { ...coincide, reserved: new Set(events.map((e) => e.id)) });
  // One candidate picked and located (misfits read again); `earlier`: the events it was found inside.
  const readEvent = async (ev: CandidateEvent, earlier: readonly QmlEvent[] | undefined) => {
    const ons = ev.triggers.map((t) => t.on);
    const firstOn = Math.min(...ons), lastOn = Math.max(...ons);
    // Ahead: the filter's settling, the LTA of the re-trigger (from the first trigger less the
    // slack), and the AIC and SNR windows of P. After: S up to the longest P travel time allowed.
    const ahead = s.filterPad + Math.max(onsetBefore + snrNoise, lta + s.slack);
    const from = firstOn - Math.round(ahead * 1e6);
    const to = lastOn + Math.round(((vpVsMax - 1) * ((lastOn - firstOn) / 1e6 + Math.max(s.firstTravelMax, s.maxPTravelTime)) * 1.2 + 2 + (s.onset.snrSignal ?? 1)) * 1e6);
    const want = new Set<string>();
    for (const x of sites.values()) {
      want.add(channelKey(x.vertical));
      if (x.horizontals) for (const h of x.horizontals) want.add(channelKey(h));
    }
    const w = await readWindow(files, want, from, to);
    noteErrors(w.errors);
    const byKey = new Map(w.channels.map((c) => [channelKey(c.id), c]));
    const pickSites = new Map<string, PickSite>();
    const chan = (id: ChannelId): PickChannel => {
      const c = byKey.get(channelKey(id));
      const meta = findChannel(inv, id, ev.time);
      const segments = (c?.segments ?? []).filter((g) => g.end >= from && g.start < to);
      return { id, segments, azimuth: meta?.azimuth ?? null };
    };
    for (const x of sites.values()) {
      if (!byKey.has(channelKey(x.vertical))) continue;
      const meta = findChannel(inv, x.vertical, ev.time);
      let polarity: 1 | -1 = 1;
      if (meta && meta.dip !== null && Math.abs(meta.dip) >= 60) {
        polarity = verticalPolarity(meta.dip, meta.sensitivity?.value || 1);
      }
      pickSites.set(x.key, {
        vertical: chan(x.vertical), polarity, position: x.position,
        horizontals: x.horizontals ? [chan(x.horizontals[0]), chan(x.horizontals[1])] : null,
      });
    }
    let picks = eventPicks(ev, pickSites, sosFor, s, earliestOrigin);
    if (earlier) picks = leaveOutOthersOnsets(picks, earlier, predict);
    let qe = toQmlEvent(ev, picks);
    let changes: readonly RereadChange[] = [];
    let o = eventOrigin(ev.id, picks, qe.picks.map((p) => p.id), coords, a.model, a.modelId);
    if (o.ok && s.reread) {
      // Misfits of the location read again around their predicted times (core/scan/reread.ts).
      // A failure here (a site or solution the travel times refuse) keeps the picks as they were.
      let r: ReturnType<typeof rereadMisfits> | null = null;
      try {
        r = rereadMisfits(picks, qe.picks.map((p) => p.id), o.origin, rereadSites(pickSites, locations, sosFor), a.model, s.reread);
      } catch (e) {
        qe.comment = `${qe.comment}; misfits not read again: ${(e as Error).message}`;
      }
      if (r && r.changes.length) {
        // A misfit read again may take the other events' onset near its predicted time: left out as before.
        const next = earlier ? leaveOutOthersOnsets(r.picks, earlier, predict) : r.picks;
        const again = eventOrigin(ev.id, next, next.map((p) => pickId(ev.id, p)), coords, a.model, a.modelId);
        if (again.ok) {
          picks = next;
          qe = toQmlEvent(ev, picks, r.changes);
          o = again;
          changes = r.changes;
        }
      }
    }
    if (o.ok) {
      qe.origins.push(o.origin);
      qe.preferredOriginId = o.origin.id;
    } else qe.comment = `${qe.comment}; not located: ${o.message}`;
    return { qe, o, changes };
  };
  for (let k = 0; k < events.length; k++) {
    const ev = events[k];
    bar?.update(0.8 + 0.2 * (k / events.length), `picking ${ev.id}`);
    const earlier = foundIn.get(ev);
    let { qe, o, changes } = await readEvent(ev, earlier);
    let fits = fitOf(o).se <= FIT_S;
    if (!fits && !earlier) {
      // Two events seconds apart whose triggers made one candidate (the first the weaker): its
      // origin fits neither and predicts nothing (core/pick/front.ts). The triggers one P wave front
      // can hold, from the earliest, within the bound of the picker's network first P (its
      // firstPSpeed and the slack), are picked and located alone. When that origin fits as a split
      // candidate's must (below), it is the candidate's, and the triggers it explains at neither P
      // nor S go through the coincidence again (below). Otherwise the triggers later than the front
      // allows for P go through it, and the candidates they make are judged as split ones (below).
      const front = earliestFront(ev, positions, LOCAL_EVENT_PICKING.firstPSpeed, s.slack, s.minSites);
      if (front) {
        const r = await readEvent(front, undefined);
        const was = o.ok ? `standard error ${(o.origin.quality?.standardError ?? NaN).toFixed(2)} s` : 'not located';
        if (fitsAsSplit(r.o)) {
          ({ qe, o, changes } = r);
          fits = true;
          qe.comment = `${qe.comment}; located on its earliest P wave front, ${front.sites.length} of its ${ev.sites.length} sites (all of them: ${was})`;
          summary.fronts.push(`${ev.id} (${front.sites.length} of ${ev.sites.length} sites)`);
        } else {
          const later = afterFront(ev, front, positions, LOCAL_EVENT_PICKING.firstPSpeed, s.slack);
          if (new Set(later.map((t) => stationKey(t.id))).size >= s.minSites) {
            const made = coincideAgain(later);
            for (const m of made) {
              // No earlier origin predicts anything here, so none of its onsets is left out.
              foundIn.set(m, []);
              insideOf.set(m, { id: ev.id, why: 'from triggers later than its earliest P wave front allows for P' });
              splitFrom.set(m, ev);
            }
            if (made.length) mixed.set(ev, { qe, splits: [] });
            queue(made, k);
          }
        }
      }
    }
    for (const c of changes) summary.reread[c.pick ? 'replaced' : 'dropped']++;
    if (earlier) {
      // A candidate found inside another's window is written only when it fits as a split candidate
      // must (fitsAsSplit): triggers in an event's coda and late S triggers agree by chance, and
      // their picks locate nowhere.
      if (!fitsAsSplit(o)) {
        const why = !o.ok ? 'not located' : !fits ? `standard error ${(o.origin.quality?.standardError ?? NaN).toFixed(2)} s` : `${fitOf(o).used} phases used`;
        summary.split.push({ text: `${ev.id} left out (${why})`, leftOut: true });
        continue;
      }
      const inside = insideOf.get(ev)!;
      summary.split.push({ text: `${ev.id} (inside ${inside.id}'s window)`, leftOut: false });
      qe.comment = `${qe.comment}; found inside ${inside.id}'s coincidence window, ${inside.why}`;
    }
    qmlEvents.push(qe);
    const from = splitFrom.get(ev);
    if (from) {
      // A candidate split off a mixed one (above) is written: the mixed one still holds this event's
      // onsets. It is picked again less the picks within JOIN_S of the P or S this origin (and any
      // split off it before) predicts at their site, as a candidate found inside another's window
      // is, and located again; that version is kept when it is located on more than MIN_PHASES
      // phases with a smaller standard error than the mixed one's. The two are then told apart for
      // the one-event-read-twice check (their picks no longer share onsets by construction).
      const mx = mixed.get(from)!;
      mx.splits.push(qe);
      const r = await readEvent(from, mx.splits);
      const was = preferredOrigin(mx.qe)?.quality?.standardError ?? Infinity;
      const { se: now, used } = fitOf(r.o);
      if (used > MIN_PHASES && now < was) {
        const ids = mx.splits.map((x) => x.id).join(', ');
        const wasText = Number.isFinite(was) ? `${was.toFixed(2)} s` : 'not located';
        r.qe.comment = `${r.qe.comment}; located again without the onsets of ${ids}, split from it (standard error ${wasText} with them)`;
        qmlEvents[qmlEvents.indexOf(mx.qe)] = r.qe;
        mx.qe = r.qe;
        for (const x of mx.splits) distinct.push([r.qe, x]);
        summary.cleaned.push(`${from.id} (standard error ${wasText} -> ${now.toFixed(2)} s)`);
      }
    }
    // A second event inside this one's coincidence window (a doublet, an early aftershock): the
    // triggers its origin explains at neither P nor S, where three or more sites of them agree, make
    // candidates of their own (core/pick unexplainedTriggers), picked and located in their turn. Only
    // an origin that fits its picks (standard error within duplicates.ts's FIT_S) predicts anything.
    if (fits) {
      const located = qe;
      const left = unexplainedTriggers(ev, (site) => predict(located, site), s.slack, s.minSites);
      if (new Set(left.map((t) => stationKey(t.id))).size >= s.minSites) {
        const more = coincideAgain(left);
        for (const m of more) {
          foundIn.set(m, [...(earlier ?? []), located]);
          insideOf.set(m, { id: located.id, why: 'from triggers its origin did not explain' });
        }
        queue(more, k);
      }
    }
  }

  // One event read twice (straggling triggers, a regional event's S triggering again, or far sites
  // triggering on a local event's S) is written once: the copy whose origin fits better
  // (core/scan/duplicates.ts). Before the magnitudes, so no data are read for a copy left out, and
  // the copy kept is measured with the picks it took over.
  const { kept, dropped } = leaveOutDuplicates(qmlEvents, predict, undefined, undefined, undefined, distinct);
  summary.duplicates = dropped.map((d) => (d.reason === 'same picks' ? `${d.id} (the same picks as ${d.duplicateOf})` : `${d.id} (its picks fit ${d.duplicateOf}'s origin)`));
  for (const qe of kept) {
    const origin = qe.origins[0];
    if (!origin) continue;
    const ml = await magnitudeFor(qe, origin, [...sites.values()], async (want, from, to) => {
      const got = await readWindow(files, want, from, to);
      noteErrors(got.errors);
      return got.channels;
    }, inv);
    for (const sk of ml.skipped) summary.magnitudeNotes.push(`${sk.key}: ${sk.why}`);
  }
  summary.candidates = kept.length;
  for (const e of kept) for (const p of e.picks) summary.picks[p.phaseHint === 'S' ? 'S' : 'P']++;
  summary.located = kept.filter((e) => e.origins.length > 0).length;
  summary.magnitudes = kept.filter((e) => (e.magnitudes?.length ?? 0) > 0).length;

  // Output, atomically.
  const xml = writeQuakeMl({ events: kept }, {
    authority: a.authority, agencyId: a.agency, author: a.author, creationTime: Date.now() * 1000, version: 'daybreak scan 0.1',
  });
  bar?.done();
  writeAtomically(a.out, xml);
  summary.seconds = (performance.now() - t0) / 1000;
  process.stdout.write(summaryText(summary, a.out));
  return bad || summary.badRecords.length > 0 ? 1 : 0;
}

/**
 * Digitizer full scale assumed for the clipping check, counts: StationXML carries none, so a 24-bit
 * converter (2^23 − 1, common practice) is assumed.
 */
const FULL_SCALE_COUNTS = 8388607;

/**
 * The local magnitude of a located event: reads the horizontals of every site with two around their
 * amplitude and noise windows (S from the event's S pick at the site, else predicted), with a margin
 * of 10 % of the span plus 5 s each side for the response-removal taper, and adds the amplitudes,
 * station magnitudes and magnitude to `qe`.
 */
export async function magnitudeFor(
  qe: QmlEvent, origin: QmlOrigin, siteList: readonly SiteInfo[],
  read: (want: Set<string>, from: Micros, to: Micros) => Promise<ChannelData[]>, inv: Inventory,
): Promise<EventMagnitude> {
  const mo = magnitudeOrigin(origin);
  const picked = new Map<string, { p?: Micros; s?: Micros; sId?: string }>();
  for (const p of qe.picks) {
    const k = stationKey(p.waveformId);
    const e = picked.get(k) ?? {};
    if (p.phaseHint === 'P' && e.p === undefined) e.p = p.time;
    if (p.phaseHint === 'S' && e.s === undefined) { e.s = p.time; e.sId = p.id; }
    picked.set(k, e);
  }
  const plans = siteList.filter((x) => x.horizontals).map((x) => {
    const pk = picked.get(x.key) ?? {};
    const st = { position: x.coordinates, p: pk.p ?? null, s: pk.s ?? null };
    return { site: x, st, sId: pk.sId ?? null, w: stationWindows(mo, st) };
  });
  const stations: MagnitudeStation[] = [];
  const notes: { key: string; why: string }[] = [];
  if (plans.length > 0) {
    const lo = Math.min(...plans.map((q) => q.w.noise.start)), hi = Math.max(...plans.map((q) => q.w.window.end));
    const margin = Math.round(0.1 * (hi - lo)) + 5e6;
    const from = lo - margin, to = hi + margin;
    const want = new Set(plans.flatMap((q) => q.site.horizontals!.map((h) => channelKey(h))));
    const byKey = new Map((await read(want, from, to)).map((c) => [channelKey(c.id), c]));
    for (const q of plans) {
      const traces: HorizontalTrace[] = [];
      for (const id of q.site.horizontals!) {
        const key = channelKey(id);
        const c = byKey.get(key);
        const meta = findChannel(inv, id, mo.time);
        if (!meta) { notes.push({ key, why: 'no StationXML epoch at the event' }); continue; }
        if (!c) { notes.push({ key, why: 'no data around the event' }); continue; }
        // The longest run inside the read window (a gap leaves the shorter side out).
        let best: ReturnType<typeof cut> = null, rate = 0;
        for (const seg of c.segments) {
          const part = cut(seg, from, to);
          if (part && (!best || part.samples.length > best.samples.length)) { best = part; rate = seg.sampleRate; }
        }
        if (!best) { notes.push({ key, why: 'no data around the event' }); continue; }
        let response;
        try { response = channelResponse(meta); } catch (e) { notes.push({ key, why: (e as Error).message.replace(`${key}: `, '') }); continue; }
        traces.push({ channel: id, counts: best.samples, sampleRate: rate, start: best.start, response, fullScaleCounts: FULL_SCALE_COUNTS });
      }
      stations.push({ ...q.st, traces, sPickId: q.sId });
    }
  }
  const r0 = eventMagnitude(mo, stations, { idPrefix: `${qe.id}.ml` });
  const r = { ...r0, skipped: [...notes, ...r0.skipped] };
  qe.amplitudes = r.amplitudes;
  qe.stationMagnitudes = r.stationMagnitudes;
  if (r.magnitude) {
    qe.magnitudes = [r.magnitude];
    qe.preferredMagnitudeId = r.magnitude.id;
  }
  return r;
}

/** The pick's comment (core/quakeml pickComment), saying when it was read again at the location's prediction. */
function scanPickComment(p: Pick, reread: RereadChange | undefined): string | undefined {
  const again = reread ? `read again at the location's predicted ${reread.phase} (the first reading was ${reread.residual.toFixed(2)} s off)` : '';
  return pickComment(p.snr, p.questionableTiming, again);
}

/** One event's QuakeML; `reread`: the misfits read again (their new picks say so; dropped ones are named in the event's comment). */
export function toQmlEvent(ev: CandidateEvent, picks: readonly Pick[], reread: readonly RereadChange[] = []): QmlEvent {
  const dropped = reread.filter((c) => c.pick === null);
  const dropNote = dropped.length
    ? `; dropped as not fitting the location, with no onset above the noise at the predicted time: ${dropped.map((c) => `${c.id} (${c.residual.toFixed(2)} s off)`).join(', ')}`
    : '';
  return {
    id: ev.id,
    type: null,
    typeCertainty: null,
    comment: `automatic candidate: ${ev.sites.length} sites triggered (${ev.sites.join(' ')}), first at ${isoFromMicros(ev.time)}${dropNote}`,
    picks: picks.map((p) => ({
      id: pickId(ev.id, p),
      waveformId: p.waveformId,
      time: p.time,
      lowerUncertainty: p.lowerUncertainty,
      upperUncertainty: p.upperUncertainty,
      phaseHint: p.phaseHint,
      onset: p.onset,
      polarity: p.phaseHint === 'P' ? (p.polarity ?? 'undecidable') : null,
      evaluationMode: 'automatic',
      evaluationStatus: 'preliminary',
      comment: scanPickComment(p, reread.find((c) => c.pick === p)),
    })),
    origins: [],
    preferredOriginId: null,
  };
}

/**
 * Writes `text` to a temporary file beside `path`, then renames it over `path` (never a half-written
 * file). A failed write removes the temporary file; a process killed during the write leaves it (no
 * handler runs inside the synchronous write), which the desk's scan job removes (scanJob.ts), and so
 * does the next write of the same output (removeStaleTemps: only files of processes that are gone).
 */
export function writeAtomically(path: string, text: string): void {
  removeStaleTemps(path);
  const tmp = atomicTempPath(path, process.pid);
  try {
    writeFileSync(tmp, text);
    renameSync(tmp, path);
  } catch (e) {
    try { unlinkSync(tmp); } catch { /* already gone */ }
    throw e;
  }
}

export function summaryText(sm: ScanSummary, out: string): string {
  const lines: string[] = [];
  lines.push(`daybreak scan: ${sm.candidates} candidate event${sm.candidates === 1 ? '' : 's'}, ${sm.picks.P} P and ${sm.picks.S} S picks written to ${out}`);
  lines.push(`  settings: ${sm.settings}`);
  lines.push(`  located: ${sm.located} of ${sm.candidates} (an origin each)`);
  if (sm.split.length) {
    const leftOut = sm.split.filter((x) => x.leftOut).length;
    lines.push(`  found inside another event's coincidence window, from triggers its origin did not explain or later than its earliest P wave front: ${sm.split.length - leftOut}${leftOut ? ` (and ${leftOut} left out: no origin within ${FIT_S} s on more than ${MIN_PHASES} phases)` : ''} (${sm.split.map((x) => x.text).join(', ')})`);
  }
  if (sm.fronts.length) lines.push(`  located on their earliest P wave front, the origin of all their sites not fitting: ${sm.fronts.length} (${sm.fronts.join(', ')})`);
  if (sm.cleaned.length) lines.push(`  located again without the onsets of the events split from them: ${sm.cleaned.length} (${sm.cleaned.join(', ')})`);
  if (sm.duplicates.length) lines.push(`  left out as the same event read twice: ${sm.duplicates.length} (${sm.duplicates.join(', ')})`);
  if (sm.reread.replaced + sm.reread.dropped > 0) {
    lines.push(`  picks the locations did not fit: ${sm.reread.replaced} read again at the predicted time, ${sm.reread.dropped} dropped (nothing there above the noise)`);
  }
  lines.push(`  magnitudes: ${sm.magnitudes} of ${sm.located} located (ML, IASPEI 2013)${sm.magnitudeNotes.length ? `, ${sm.magnitudeNotes.length} channel amplitudes left out` : ''}`);
  lines.push(`  files: ${sm.files} miniSEED read${sm.skippedFiles.length ? `, ${sm.skippedFiles.length} skipped` : ''}`);
  lines.push(`  channels: ${sm.channels} with data, ${sm.skippedChannels.length} not used`);
  lines.push(`  data: ${sm.hours.toFixed(2)} h per triggering channel`);
  lines.push(`  time taken: ${duration(sm.seconds)}`);
  for (const f of sm.skippedFiles) lines.push(`  skipped file ${f.path}: ${f.why}`);
  for (const c of sm.skippedChannels) lines.push(`  not used ${c.id}: ${c.why}`);
  const noteCounts = new Map<string, number>();
  for (const n of sm.magnitudeNotes) noteCounts.set(n, (noteCounts.get(n) ?? 0) + 1);
  for (const [n, k] of [...noteCounts].slice(0, 50)) lines.push(`  no amplitude ${n}${k > 1 ? ` (${k} events)` : ''}`);
  if (noteCounts.size > 50) lines.push(`  ... and ${noteCounts.size - 50} more channels without amplitudes`);
  for (const b of sm.badRecords.slice(0, 50)) lines.push(`  bad record ${b.path} byte ${b.offset}: ${b.reason}`);
  if (sm.badRecords.length > 50) lines.push(`  ... and ${sm.badRecords.length - 50} more bad records`);
  lines.push(`  ${CAUTION.split('\n').join(' ')}`);
  return lines.join('\n') + '\n';
}
