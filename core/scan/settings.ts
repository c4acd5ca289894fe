/**
 * Settings of the overnight scan: the filter the traces go through before triggering and picking,
 * the STA/LTA trigger, the network coincidence, the onset windows, and how the night is cut into
 * time chunks. Two presets:
 *
 * - `local` (default): local earthquakes recorded at 40-200 Hz by a network some tens of km across.
 *   Band-pass 2-15 Hz, order 4 (a common trigger band for local events: above the microseism peak
 *   below 1 Hz and below most cultural noise; common practice, not from a cited source), the
 *   STA/LTA settings of core/pick's LOCAL_EARTHQUAKE_BUSY preset (those of LOCAL_EARTHQUAKE_STA_LTA,
 *   IASPEI NMSOP-2 IS 8.1, with a 20 s LTA so a coda does not hide the next event's P; see
 *   core/pick/presets.ts), 3 sites in coincidence, and pickEventSites with its defaults
 *   (LOCAL_EVENT_PICKING). S is sought up to a P travel time of `maxPTravelTime` = 60 s (about
 *   400 km: regional events still get their Sn, 25 s after Pn at 250 km), and the P and S of an event
 *   judged distant are re-read on traces high-passed at 1 Hz, order 2 (`distantFilter`: above the
 *   microseism; no upper corner, see core/pick/eventSites.ts step 4; 0.75-2 Hz and orders 1-4 gave
 *   the same picks on the generated regional events it was chosen on). Picks that the event's
 *   location does not fit are read again around their predicted times (`reread`, reread.ts).
 * - `near`: near-source microseismic records at about 500 Hz cut into short windows (the P a couple
 *   of seconds after the record's start, travel times under 0.1 s, a network a few hundred metres
 *   across). Band-pass 5-150 Hz; STA 0.05 s, LTA 1 s (windows a tenth of the local ones, scaled
 *   to the tenfold higher frequencies); warm-up 0.5 s; the P window 0.25 s before to 0.1 s after the
 *   trigger (the trigger comes within a few STA windows of the onset); S sought up to 0.5 s of P
 *   travel time; coincidence with core/pick's default slowest velocity, 3 km/s. Daybreak's choices:
 *   the windows follow the rule "scale them with the dominant period"; the band was chosen among
 *   10-120, 2-200 and 5-150 Hz on the five real events of ../shared/data/real-microseismic (so the
 *   test on those events is not independent of this choice). pickEventSites runs without its phase
 *   check (sShare 1: no onset is taken as S): geophones at distances comparable to the source depth
 *   see P arrive far from vertical, so P energy need not be mostly vertical; on the real events the
 *   check took one P for S and lost it. Its other windows are scaled as above (energy share over
 *   0.05 s, P sought at most 0.5 s before an onset); no re-read for distant events, and misfits of the
 *   location are not read again (reread.ts's bounds are seconds; these travel times are under 0.1 s).
 */
import type { FilterRequest } from '../dsp/designForChannel';
import type { RereadOptions } from './reread';
import { LOCAL_EARTHQUAKE_BUSY, type EventPickOptions, type OnsetOptions, type StaLtaOptions, type SWindowOptions } from '../pick';

export interface ScanSettings {
  /** Causal filter before triggering and picking (designed per channel: corners clamped below Nyquist). */
  readonly filter: FilterRequest;
  readonly staLta: Partial<StaLtaOptions>;
  /** Sites that must trigger together (network coincidence). */
  readonly minSites: number;
  /** Slowest P velocity the coincidence allows, km/s, and extra seconds between triggers. */
  readonly vMin: number;
  readonly slack: number;
  readonly onset: Partial<OnsetOptions>;
  readonly sWindow: Partial<SWindowOptions>;
  /**
   * Longest P travel time to the first site that triggered, seconds: bounds the S search at each site
   * (Tp at site i lies in [tP_i - tP_first, tP_i - tP_first + firstTravelMax]).
   */
  readonly firstTravelMax: number;
  /**
   * Longest P travel time the S search allows anywhere, seconds: the scan reads data for S up to
   * (Vp/Vs - 1) times this after the last P, and a P-only location may extend the S window up to it.
   */
  readonly maxPTravelTime: number;
  /**
   * pickEventSites options other than those set above (phase check, re-trigger level, SNR floor);
   * unset ones take LOCAL_EVENT_PICKING's values.
   */
  readonly eventPicking: Partial<Pick<EventPickOptions, 'sShare' | 'shareSeconds' | 'maxSMinusP' | 'retrigger' | 'minSnr'>>;
  /**
   * Filter of the traces on which pickEventSites re-reads the P and S of a distant event (its step 4:
   * a high-pass only, so the emergent onset's first, highest frequencies are kept), designed per
   * channel; null: no re-read.
   */
  readonly distantFilter: FilterRequest | null;
  /**
   * Misfits of a located event read again around their predicted times (reread.ts), with these
   * options (unset ones take LOCAL_REREAD's); null: not read again.
   */
  readonly reread: Partial<RereadOptions> | null;
  /** Length of the time chunks the night is processed in, seconds. */
  readonly chunkSeconds: number;
  /**
   * Data read ahead of an event's picking window so the causal filter has settled, seconds. The
   * filter's impulse response must have decayed within it (a 4th-order 2 Hz high-pass: a few s).
   */
  readonly filterPad: number;
}

export type ScanPreset = 'local' | 'near';
export const SCAN_PRESETS: readonly ScanPreset[] = ['local', 'near'];

export const LOCAL_SCAN_SETTINGS: ScanSettings = Object.freeze<ScanSettings>({
  filter: { kind: 'bandpass' as const, order: 4, corners: [2, 15] as [number, number] },
  staLta: LOCAL_EARTHQUAKE_BUSY.staLta,
  minSites: 3,
  vMin: 3.0,
  slack: 1.0,
  onset: {},
  sWindow: {},
  firstTravelMax: 10,
  maxPTravelTime: 60,
  eventPicking: {},
  distantFilter: { kind: 'highpass' as const, order: 2, corners: 1 },
  reread: {},
  chunkSeconds: 600,
  filterPad: 20,
});

export const NEAR_SCAN_SETTINGS: ScanSettings = Object.freeze<ScanSettings>({
  filter: { kind: 'bandpass' as const, order: 4, corners: [5, 150] as [number, number] },
  staLta: { sta: 0.05, lta: 1, warmUp: 0.5, preEvent: 0.5, postEvent: 1 },
  minSites: 3,
  vMin: 3.0,
  slack: 0.1,
  onset: { before: 0.25, after: 0.1, snrNoise: 0.5, snrSignal: 0.05, impulsiveWidth: 0.01, polarityWindow: 0.02 },
  sWindow: {},
  firstTravelMax: 0.5,
  maxPTravelTime: 0.5,
  eventPicking: { sShare: 1, shareSeconds: 0.05, maxSMinusP: 0.5 },
  distantFilter: null,
  reread: null,
  chunkSeconds: 600,
  filterPad: 1,
});

export function presetSettings(name: ScanPreset): ScanSettings {
  if (name === 'local') return LOCAL_SCAN_SETTINGS;
  if (name === 'near') return NEAR_SCAN_SETTINGS;
  throw new RangeError(`preset must be one of ${SCAN_PRESETS.join(', ')}, got "${String(name)}"`);
}
