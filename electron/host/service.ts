/**
 * The host side of the renderer-host contract (Node): file access and persistence, shared by the
 * desktop shell (over IPC) and the browser mode (over HTTP). Every request is validated here, once,
 * whatever carried it; paths are confined to the folders the user opened and the demo folder.
 */
import { readdir, readFile, stat, open } from 'node:fs/promises';
import { readFileSync } from 'node:fs';
import { dirname, join, relative, resolve, sep } from 'node:path';
import type {
  AppInfo, Dataset, DatasetFile, DemoStatus, FileKind, HostErrorCode, HostRequestName, HostRequests,
  HostResult, RequestOf, ResponseOf,
} from '../contract';
import { DEFAULT_SETTINGS, HOST_REQUEST_NAMES, SCAN_PRESET_SETTINGS, type ReviewFileState, type Settings } from '../contract';
import { GENERATOR_VERSION } from '../../core/synth/demo';
import { ReviewLocks, reviewPathFor, writeAtomically } from './reviewStore';
import { ScanJobs } from './scanJob';

export class HostError extends Error {
  constructor(readonly code: HostErrorCode, message: string) {
    super(message);
    this.name = 'HostError';
  }
}

export interface HostServiceOptions {
  mode: AppInfo['mode'];
  version: string;
  /** Folder of the demo scenario. */
  demoRoot: string;
  /** The user's own folder (review files of read-only datasets go here). */
  userDir: string;
  /** Creates the demo scenario in `root`, reporting progress 0-1. */
  generateDemo?: (root: string, onProgress: (fraction: number, message: string) => void) => Promise<void>;
}

type Handlers = { [N in HostRequestName]: (req: RequestOf<N>) => Promise<ResponseOf<N>> };

/** The file whose presence marks a finished demo scenario (written last by the generator). */
export const DEMO_COMPLETE_MARKER = 'scenario-complete.json';

/**
 * Whether the demo folder `root` holds a finished scenario of the current generator. The generator's
 * marker names its seed and version (GENERATOR_VERSION); one of an earlier version (or none) means
 * the folder is written again, so a user never reviews a demo the generator no longer makes. A marker
 * without a seed was not written by the generator (a folder prepared by hand, or by a test) and is
 * taken as it is; one that cannot be read means the folder is written again.
 */
export function demoIsCurrent(root: string): boolean {
  let marker: unknown;
  try {
    marker = JSON.parse(readFileSync(join(root, DEMO_COMPLETE_MARKER), 'utf8'));
  } catch {
    return false;
  }
  if (!marker || typeof marker !== 'object') return false;
  const m = marker as { seed?: unknown; generator?: unknown };
  return m.seed === undefined || m.generator === GENERATOR_VERSION;
}

const MAX_FILES_LISTED = 200_000;
const MAX_RANGE_BYTES = 256 << 20;

interface OpenedDataset {
  files: DatasetFile[];
  reviewPath: string;
}

export class HostService {
  private readonly openRoots = new Map<string, OpenedDataset>();
  private demo: DemoStatus;
  private readonly handlers: Handlers;

  constructor(private readonly opts: HostServiceOptions) {
    const root = resolve(opts.demoRoot);
    this.demo = {
      root,
      state: demoIsCurrent(root) ? 'ready' : 'missing',
      progress: 0,
      message: '',
    };
    this.handlers = {
      'app.info': async () => ({ mode: this.opts.mode, version: this.opts.version }),
      'demo.status': async () => ({ ...this.demo }),
      'demo.ensure': async () => this.ensureDemo(),
      'dataset.open': async (req) => this.openDataset(req.root),
      'file.read': async (req) => this.readDatasetFile(req.root, req.path),
      'file.readRange': async (req) => this.readDatasetRange(req.root, req.path, req.offset, req.length),
      'file.readRanges': async (req) => this.readDatasetRanges(req.root, req.ranges),
      'review.open': async (req) => this.openReview(req.root, req.force === true),
      'review.save': async (req) => this.saveReview(req.root, req.content),
      'export.write': async (req) => this.writeExport(req.root, req.name, req.content),
      'scan.start': async (req) => this.startScan(req.root),
      'scan.cancel': async (req) => this.scans.cancel(this.checkOpened(req.root)),
      'scan.status': async (req) => this.scans.status(this.checkOpened(req.root)),
      'scan.result': async (req) => this.scans.result(this.checkOpened(req.root)),
      'settings.get': async () => this.readSettings(),
      'settings.set': async (req) => this.writeSettings(req),
    };
  }

  /** Answers one request; never throws. `request` comes from outside and is validated here. */
  async handle<N extends HostRequestName>(name: N, request: unknown): Promise<HostResult<ResponseOf<N>>> {
    try {
      if (!HOST_REQUEST_NAMES.includes(name)) throw new HostError('bad-request', `unknown request "${String(name)}"`);
      if (typeof request !== 'object' || request === null || Array.isArray(request)) {
        throw new HostError('bad-request', `request "${name}" needs an object argument`);
      }
      const handler = this.handlers[name] as (req: HostRequests[N][0]) => Promise<ResponseOf<N>>;
      return { ok: true, value: await handler(request as RequestOf<N>) };
    } catch (e) {
      if (e instanceof HostError) return { ok: false, code: e.code, message: e.message };
      const err = e as NodeJS.ErrnoException;
      if (err && err.code === 'ENOENT') return { ok: false, code: 'not-found', message: err.message };
      if (err && (err.code === 'EACCES' || err.code === 'EPERM')) return { ok: false, code: 'io', message: err.message };
      return { ok: false, code: 'internal', message: err instanceof Error ? err.message : String(e) };
    }
  }

  private ensureDemo(): DemoStatus {
    if (this.demo.state === 'ready' || this.demo.state === 'generating') return { ...this.demo };
    const generate = this.opts.generateDemo;
    if (!generate) throw new HostError('internal', 'this host cannot generate the demo scenario');
    this.demo = { ...this.demo, state: 'generating', progress: 0, message: 'starting' };
    generate(this.demo.root, (progress, message) => {
      this.demo = { ...this.demo, progress, message };
    }).then(
      () => { this.demo = { ...this.demo, state: 'ready', progress: 1, message: 'ready' }; },
      (e: unknown) => { this.demo = { ...this.demo, state: 'failed', message: e instanceof Error ? e.message : String(e) }; },
    );
    return { ...this.demo };
  }

  readonly locks = new ReviewLocks();

  private async openReview(rootArg: unknown, force: boolean): Promise<ReviewFileState> {
    const root = this.checkOpened(rootArg);
    const path = this.opened(root).reviewPath;
    const holder = await this.locks.acquire(path, force);
    const content = await readFile(path, 'utf8').catch((e: NodeJS.ErrnoException) => {
      if (e.code === 'ENOENT') return null;
      throw e;
    });
    return { path, content, lockedBy: holder ? { pid: holder.pid, host: holder.host, since: holder.since } : null };
  }

  private async saveReview(rootArg: unknown, content: unknown): Promise<{ path: string; bytes: number }> {
    const root = this.checkOpened(rootArg);
    if (typeof content !== 'string' || content.length > 64 << 20) throw new HostError('bad-request', 'content must be text of at most 64 MiB');
    const path = this.opened(root).reviewPath;
    if (!this.locks.holds(path)) throw new HostError('locked', `another copy of Daybreak holds ${path}; open it again to take over`);
    await writeAtomically(path, content);
    return { path, bytes: Buffer.byteLength(content) };
  }

  private async writeExport(rootArg: unknown, name: unknown, content: unknown): Promise<{ path: string }> {
    const root = this.checkOpened(rootArg);
    if (typeof name !== 'string' || !/^[\w][\w.-]{0,120}$/.test(name)) throw new HostError('bad-request', 'export name must be letters, digits, . _ - (up to 121)');
    if (typeof content !== 'string' || content.length > 256 << 20) throw new HostError('bad-request', 'content must be text of at most 256 MiB');
    const path = join(dirname(this.opened(root).reviewPath), 'daybreak-exports', name);
    await writeAtomically(path, content);
    return { path };
  }

  readonly scans = new ScanJobs();

  private async startScan(rootArg: unknown) {
    const root = this.checkOpened(rootArg);
    const { files, reviewPath } = this.opened(root);
    const stations = files.find((f) => f.kind === 'stationxml');
    if (!stations) throw new HostError('bad-request', `no StationXML file in ${root}: the scan needs station coordinates`);
    const model = files.find((f) => f.kind === 'model');
    const { scanPreset } = await this.readSettings();
    return this.scans.start(root, join(root, stations.path), dirname(reviewPath), model ? join(root, model.path) : null, scanPreset);
  }

  private settingsPath(): string {
    return join(this.opts.userDir, 'settings.json');
  }

  private async readSettings(): Promise<Settings> {
    const text = await readFile(this.settingsPath(), 'utf8').catch(() => null);
    if (!text) return { ...DEFAULT_SETTINGS };
    let raw: Partial<Settings>;
    try {
      raw = JSON.parse(text) as Partial<Settings>;
    } catch {
      return { ...DEFAULT_SETTINGS };
    }
    // Field by field: one this version cannot use (hand-edited, or a scan preset of another
    // version) falls back to its default alone, and the others are kept.
    const kept: Partial<Settings> = {};
    for (const k of Object.keys(DEFAULT_SETTINGS) as (keyof Settings)[]) {
      try {
        Object.assign(kept, pickSettings({ [k]: raw?.[k] }));
      } catch { /* the default */ }
    }
    return { ...DEFAULT_SETTINGS, ...kept };
  }

  private async writeSettings(req: unknown): Promise<Settings> {
    const next = { ...(await this.readSettings()), ...pickSettings(req as Partial<Settings>) };
    if (!/^[\w.\-~]{1,200}$/.test(next.authority)) throw new HostError('bad-request', `authority must be 1-200 of letters, digits and .-_~, got "${next.authority}"`);
    await writeAtomically(this.settingsPath(), JSON.stringify(next, null, 1));
    return next;
  }

  private checkOpened(rootArg: unknown): string {
    const root = this.checkRootArg(rootArg);
    if (!this.openRoots.has(root)) throw new HostError('forbidden', `folder was not opened: ${root}`);
    return root;
  }

  /** What opening `root` found: its files and where its review file goes (looked up once, at opening). */
  private opened(root: string): OpenedDataset {
    const o = this.openRoots.get(root);
    if (!o) throw new HostError('forbidden', `folder was not opened: ${root}`);
    return o;
  }

  private async openDataset(rootArg: unknown): Promise<Dataset> {
    const root = this.checkRootArg(rootArg);
    const st = await stat(root).catch(() => null);
    if (!st) throw new HostError('not-found', `folder not found: ${root}`);
    if (!st.isDirectory()) throw new HostError('bad-request', `not a folder: ${root}`);
    const files: DatasetFile[] = [];
    await listFiles(root, root, files);
    files.sort((a, b) => (a.path < b.path ? -1 : a.path > b.path ? 1 : 0));
    const reviewPath = await reviewPathFor(root, this.opts.userDir);
    this.openRoots.set(root, { files, reviewPath });
    // The review file goes beside the data exactly when the folder may be written.
    return { root, files, writable: dirname(reviewPath) === root };
  }

  private async readDatasetFile(rootArg: unknown, pathArg: unknown): Promise<Uint8Array> {
    const bytes = await readFile(this.datasetPath(rootArg, pathArg));
    // A view that owns its whole buffer, so IPC's structured clone copies no more than the file.
    if (bytes.byteOffset === 0 && bytes.byteLength === bytes.buffer.byteLength) return new Uint8Array(bytes.buffer);
    return new Uint8Array(bytes);
  }

  private async readDatasetRange(rootArg: unknown, pathArg: unknown, offset: unknown, length: unknown): Promise<Uint8Array> {
    if (!Number.isSafeInteger(offset) || (offset as number) < 0) throw new HostError('bad-request', `offset must be an integer >= 0, got ${String(offset)}`);
    if (!Number.isSafeInteger(length) || (length as number) < 0 || (length as number) > MAX_RANGE_BYTES) {
      throw new HostError('bad-request', `length must be an integer 0..${MAX_RANGE_BYTES}, got ${String(length)}`);
    }
    const handle = await open(this.datasetPath(rootArg, pathArg), 'r');
    try {
      const buf = new Uint8Array(length as number);
      let got = 0;
      while (got < buf.length) {
        const { bytesRead } = await handle.read(buf, got, buf.length - got, (offset as number) + got);
        if (bytesRead === 0) break;
        got += bytesRead;
      }
      return got === buf.length ? buf : buf.slice(0, got);
    } finally {
      await handle.close();
    }
  }

  private async readDatasetRanges(rootArg: unknown, ranges: unknown): Promise<Uint8Array> {
    if (!Array.isArray(ranges) || ranges.length > 100_000) throw new HostError('bad-request', 'ranges must be a list of at most 100,000 {path, offset, length}');
    let total = 0;
    for (const r of ranges) {
      const len = (r as { length?: unknown })?.length;
      if (!Number.isSafeInteger(len) || (len as number) < 0) throw new HostError('bad-request', `range length must be an integer >= 0, got ${String(len)}`);
      total += len as number;
    }
    if (total > MAX_RANGE_BYTES) throw new HostError('bad-request', `ranges add up to ${total} bytes, more than ${MAX_RANGE_BYTES}`);
    const parts = await Promise.all(ranges.map((r: { path?: unknown; offset?: unknown; length?: unknown }) => this.readDatasetRange(rootArg, r.path, r.offset, r.length)));
    const head = 4 + 4 * parts.length;
    const out = new Uint8Array(head + parts.reduce((n, p) => n + p.length, 0));
    const view = new DataView(out.buffer);
    view.setUint32(0, parts.length, true);
    let at = head;
    parts.forEach((p, i) => {
      view.setUint32(4 + 4 * i, p.length, true);
      out.set(p, at);
      at += p.length;
    });
    return out;
  }

  /** Absolute path of a file inside an opened dataset (or the demo folder); refuses anything outside. */
  private datasetPath(rootArg: unknown, pathArg: unknown): string {
    const root = this.checkRootArg(rootArg);
    if (!this.openRoots.has(root) && root !== this.demo.root) {
      throw new HostError('forbidden', `folder was not opened: ${root}`);
    }
    if (typeof pathArg !== 'string' || pathArg.length === 0 || pathArg.includes('\0')) {
      throw new HostError('bad-request', 'path must be a non-empty relative path');
    }
    const full = resolve(root, pathArg);
    const rel = relative(root, full);
    if (rel.startsWith('..') || resolve(root, rel) !== full || rel === '') {
      throw new HostError('forbidden', `path leaves the dataset folder: ${pathArg}`);
    }
    return full;
  }

  private checkRootArg(rootArg: unknown): string {
    if (typeof rootArg !== 'string' || rootArg.length === 0 || rootArg.includes('\0')) {
      throw new HostError('bad-request', 'root must be a folder path');
    }
    return resolve(rootArg);
  }
}

/**
 * The kind of a dataset file, from its name and, for XML, the root element in its first bytes
 * (`head`). Content is checked again when the file is read.
 */
export function fileKindOf(name: string, head = ''): FileKind {
  const lower = name.toLowerCase();
  if (/\.(mseed|miniseed|msd|seed)$/.test(lower) || /\.d\d{3}$/.test(lower)) return 'miniseed';
  if (lower.endsWith('.xml')) {
    if (/<(\w+:)?FDSNStationXML[\s/>]/.test(head)) return 'stationxml';
    if (/<(\w+:)?quakeml[\s/>]/i.test(head)) return 'quakeml';
    return 'other';
  }
  if (lower.endsWith('.qml') || lower.endsWith('.quakeml')) return 'quakeml';
  if (lower.endsWith('.review.json')) return 'review';
  if (lower.endsWith('model.json')) return 'model';
  return 'other';
}

function pickSettings(raw: Partial<Settings>): Partial<Settings> {
  const out: Partial<Settings> = {};
  for (const k of ['analyst', 'agency', 'authority'] as const) {
    const v = raw[k];
    if (v === undefined) continue;
    if (typeof v !== 'string' || v.length > 200) throw new HostError('bad-request', `${k} must be text of at most 200 characters`);
    out[k] = v;
  }
  if (raw.scanPreset !== undefined) {
    if (!SCAN_PRESET_SETTINGS.includes(raw.scanPreset)) throw new HostError('bad-request', `scanPreset must be one of ${SCAN_PRESET_SETTINGS.join(', ')}, got "${String(raw.scanPreset)}"`);
    out.scanPreset = raw.scanPreset;
  }
  return out;
}

async function readHead(path: string, bytes: number): Promise<string> {
  const h = await open(path, 'r');
  try {
    const buf = Buffer.alloc(bytes);
    const { bytesRead } = await h.read(buf, 0, bytes, 0);
    return buf.subarray(0, bytesRead).toString('utf8');
  } finally {
    await h.close();
  }
}

async function listFiles(root: string, dir: string, out: DatasetFile[]): Promise<void> {
  const entries = await readdir(dir, { withFileTypes: true });
  for (const e of entries) {
    if (out.length >= MAX_FILES_LISTED) throw new HostError('bad-request', `more than ${MAX_FILES_LISTED} files under ${root}`);
    if (e.name.startsWith('.')) continue;
    const full = join(dir, e.name);
    if (e.isDirectory()) await listFiles(root, full, out);
    else if (e.isFile()) {
      const st = await stat(full);
      const head = e.name.toLowerCase().endsWith('.xml') ? await readHead(full, 2048) : '';
      out.push({ path: relative(root, full).split(sep).join('/'), size: st.size, kind: fileKindOf(e.name, head) });
    }
  }
}
