/**
 * The one interface between the renderer and the host (types only). The desktop shell carries it
 * over Electron IPC (preload + ipcMain), the browser mode over HTTP on 127.0.0.1; the renderer cannot
 * tell which. Each request has a name, a request type and a response type. Results are values, never
 * thrown errors: `{ ok: true, value } | { ok: false, code, message }` (only an error's message would
 * survive Electron's `handle`).
 */

export type HostResult<T> =
  | { ok: true; value: T }
  | { ok: false; code: HostErrorCode; message: string };

export type HostErrorCode =
  | 'bad-request'   // the request's arguments were not acceptable
  | 'not-found'     // a file or folder does not exist
  | 'forbidden'     // outside the folders the user opened
  | 'locked'        // another copy of the app holds the review file
  | 'io'            // the operating system refused
  | 'internal';

export type FileKind = 'miniseed' | 'stationxml' | 'model' | 'quakeml' | 'review' | 'other';

export interface DatasetFile {
  /** Path relative to the dataset root, with forward slashes. */
  path: string;
  size: number;
  kind: FileKind;
}

export interface Dataset {
  /** Absolute folder path, as the host names it. */
  root: string;
  files: DatasetFile[];
  /** Whether the review file can be written beside the data (else it goes to the user folder). */
  writable: boolean;
}

export interface DemoStatus {
  /** Absolute folder of the demo scenario. */
  root: string;
  state: 'missing' | 'generating' | 'ready' | 'failed';
  /** 0-1 while generating. */
  progress: number;
  message: string;
}

export interface AppInfo {
  mode: 'desktop' | 'browser';
  version: string;
}

/** The analyst's settings, kept in the user folder. */
export interface Settings {
  /** Written as creationInfo/author. */
  analyst: string;
  /** Written as creationInfo/agencyID. */
  agency: string;
  /** Authority part of QuakeML resource identifiers (smi:AUTHORITY/...). */
  authority: string;
  /**
   * Settings of the background scan (`daybreak scan --preset`): 'auto' chooses from the network's
   * size (core/scan/presetChoice), 'local' for local earthquakes, 'near' for near-source networks.
   */
  scanPreset: ScanPresetSetting;
}

export const SCAN_PRESET_SETTINGS = ['auto', 'local', 'near'] as const;
export type ScanPresetSetting = (typeof SCAN_PRESET_SETTINGS)[number];

export const DEFAULT_SETTINGS: Settings = { analyst: '', agency: '', authority: 'daybreak.local', scanPreset: 'auto' };

export interface ScanStatus {
  state: 'idle' | 'running' | 'done' | 'failed' | 'cancelled';
  message: string;
  /** Share of the work done, 0-1: while running, null until the scan first reports it; 1 when done; null after a failure or a cancel. */
  fraction: number | null;
  /** Once done: the settings the scan used, as its summary names them (e.g. "near (auto: why)"). */
  settings?: string;
  startedAt: string | null;
  /** Seconds since it started (or that it took). */
  seconds: number;
}

export interface ReviewFileState {
  path: string;
  content: string | null;
  lockedBy: { pid: number; host: string; since: string } | null;
}

/** Request name -> [request, response]. */
export interface HostRequests {
  'app.info': [Record<string, never>, AppInfo];
  'demo.status': [Record<string, never>, DemoStatus];
  /** Starts generating the demo scenario if it is missing; returns at once (poll demo.status). */
  'demo.ensure': [Record<string, never>, DemoStatus];
  'dataset.open': [{ root: string }, Dataset];
  /** Whole file bytes; `path` relative to an opened dataset's root. */
  'file.read': [{ root: string; path: string }, Uint8Array];
  /**
   * Opens the dataset's review file (content null when there is none yet) and takes its lock. When
   * another running copy holds the lock, `lockedBy` says who and nothing may be saved unless the
   * request is repeated with `force` (the analyst chose to take over).
   */
  'review.open': [{ root: string; force?: boolean }, ReviewFileState];
  /** Saves the whole review (atomically). Refused with 'locked' unless this copy holds the lock. */
  'review.save': [{ root: string; content: string }, { path: string; bytes: number }];
  /** Writes an export (QuakeML, CSV) atomically into the exports folder beside the review file. */
  'export.write': [{ root: string; name: string; content: string }, { path: string }];
  /** Starts the overnight scan of an opened dataset in the background (no-op while one runs). */
  'scan.start': [{ root: string }, ScanStatus];
  'scan.status': [{ root: string }, ScanStatus];
  /**
   * Stops a running scan: the state stays 'running' with the message 'cancelling' until the scan's
   * process is gone, then becomes 'cancelled' (its output file left as it was: the scan writes it
   * atomically at the end), or 'done' when the scan had already written its output.
   */
  'scan.cancel': [{ root: string }, ScanStatus];
  /** The finished scan's QuakeML text, or null when there is none. */
  'scan.result': [{ root: string }, string | null];
  'settings.get': [Record<string, never>, Settings];
  'settings.set': [Partial<Settings>, Settings];
  /** Bytes [offset, offset + length) of a file (fewer at its end). */
  'file.readRange': [{ root: string; path: string; offset: number; length: number }, Uint8Array];
  /**
   * Several byte ranges of dataset files in one answer, framed: a little-endian uint32 count n, then n
   * uint32 lengths (bytes actually read per range), then the ranges' bytes one after another
   * (see `splitRanges`).
   */
  'file.readRanges': [{ root: string; ranges: { path: string; offset: number; length: number }[] }, Uint8Array];
}

export type HostRequestName = keyof HostRequests;
export type RequestOf<N extends HostRequestName> = HostRequests[N][0];
export type ResponseOf<N extends HostRequestName> = HostRequests[N][1];

/** Names the host answers, for validation on both sides. */
export const HOST_REQUEST_NAMES: readonly HostRequestName[] = [
  'app.info', 'demo.status', 'demo.ensure', 'dataset.open', 'file.read', 'file.readRange', 'file.readRanges', 'review.open', 'review.save',
  'export.write', 'settings.get', 'settings.set', 'scan.start', 'scan.status', 'scan.cancel', 'scan.result',
];

/** Requests whose response is raw bytes (sent as application/octet-stream over HTTP). */
export const BINARY_RESPONSES: ReadonlySet<HostRequestName> = new Set<HostRequestName>(['file.read', 'file.readRange', 'file.readRanges']);

/** Splits a 'file.readRanges' answer into one view per range (no copies). */
export function splitRanges(framed: Uint8Array): Uint8Array[] {
  const view = new DataView(framed.buffer, framed.byteOffset, framed.byteLength);
  const n = view.getUint32(0, true);
  const out: Uint8Array[] = [];
  let at = 4 + 4 * n;
  for (let i = 0; i < n; i++) {
    const len = view.getUint32(4 + 4 * i, true);
    out.push(framed.subarray(at, at + len));
    at += len;
  }
  return out;
}

/** What the renderer holds: one method for every request. */
export interface HostApi {
  call<N extends HostRequestName>(name: N, request: RequestOf<N>): Promise<HostResult<ResponseOf<N>>>;
}
