/**
 * Named settings for the whole detection-and-picking chain. Each names where its numbers come from.
 */
import { LOCAL_EARTHQUAKE_ONSET, LOCAL_EARTHQUAKE_S_WINDOW, type OnsetOptions, type SWindowOptions } from './onset';
import { LOCAL_EARTHQUAKE_STA_LTA, type StaLtaOptions } from './staLta';

export interface PickingPreset {
  readonly staLta: StaLtaOptions;
  readonly onset: OnsetOptions;
  readonly sWindow: SWindowOptions;
}

/** Local earthquakes recorded at 40-200 Hz (see staLta.ts and onset.ts for the sources). */
export const LOCAL_EARTHQUAKE: PickingPreset = Object.freeze({
  staLta: LOCAL_EARTHQUAKE_STA_LTA,
  onset: LOCAL_EARTHQUAKE_ONSET,
  sWindow: LOCAL_EARTHQUAKE_S_WINDOW,
});

/**
 * Local earthquakes on a busy night: as LOCAL_EARTHQUAKE but with a 20 s LTA. The coda of a local
 * ML 2-3 event lasts one to two minutes; a 60 s LTA still holds it when the next event arrives, and
 * a P with an SNR of 15 (5 s noise window) then stays below the trigger-on ratio. Daybreak's choice,
 * measured on the synthetic nights of test/bench/accuracy.bench.ts (one event every 2-3 minutes):
 * with 60 s one event in 34 with P above SNR 5 at 4 or more sites was missed and 97 % of P with
 * SNR >= 10 were picked; with 20 s none was missed and all were picked, with no false candidate
 * event. (A shorter LTA where events come often is the usual advice - from memory of NMSOP-2
 * IS 8.1, not checked.)
 */
export const LOCAL_EARTHQUAKE_BUSY: PickingPreset = Object.freeze({
  staLta: Object.freeze({ ...LOCAL_EARTHQUAKE_STA_LTA, lta: 20 }),
  onset: LOCAL_EARTHQUAKE_ONSET,
  sWindow: LOCAL_EARTHQUAKE_S_WINDOW,
});

/**
 * Near-field microseismic records at 500 Hz, like ../shared/data/real-microseismic (geophones 50-250 m
 * from the source, P travel times 0.02-0.1 s, event cuts starting 2 s before the first P). Daybreak's
 * choices, set on those records (not tuned to other data):
 * - STA 0.05 s (a few periods of the 20-100 Hz onsets), LTA 1 s, warm-up 1.5 s (triggers from 1.5 s
 *   into a record: the first P comes about 2 s in); trigger ratios as for local earthquakes.
 * - AIC window 0.3 s before to 0.05 s after the trigger (S follows P by about 0.15-0.2 s there).
 * - SNR windows 0.5 s of noise and 0.05 s of signal (as the data's README measures energy rises);
 *   impulsive onsets within 0.01 s.
 * - Vp/Vs up to 4: at those records the analysts' S-P times are about 2.3 times the P travel times
 *   (Vp/Vs about 3.3), as in unconsolidated near-surface ground.
 */
export const NEAR_FIELD_MICROSEISMIC: PickingPreset = Object.freeze({
  staLta: Object.freeze({ ...LOCAL_EARTHQUAKE_STA_LTA, sta: 0.05, lta: 1, warmUp: 1.5, preEvent: 0.5, postEvent: 1 }),
  onset: Object.freeze({ ...LOCAL_EARTHQUAKE_ONSET, before: 0.3, after: 0.05, snrNoise: 0.5, snrSignal: 0.05, impulsiveWidth: 0.01 }),
  sWindow: Object.freeze({ ...LOCAL_EARTHQUAKE_S_WINDOW, vpVsMin: 1.5, vpVsMax: 4, maxPTravelTime: 0.5 }),
});
