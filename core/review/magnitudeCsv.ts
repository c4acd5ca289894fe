/**
 * Amplitudes and magnitudes as a CSV table: one row per station magnitude, with its event's network
 * magnitude, the amplitude it came from and the channel. The first line is a comment with the
 * caution (lines starting with #), as in the pick table (reviewToCsv).
 */
import { CAUTION } from '../caution';
import { isoFromMicros } from '../time';
import type { QmlEvent } from '../quakeml/types';
import { csvField } from './export';

export const MAGNITUDE_CSV_COLUMNS = [
  'event_id', 'magnitude_id', 'magnitude_type', 'network_magnitude', 'network_uncertainty', 'station_count', 'preferred',
  'station_magnitude_id', 'network', 'station', 'location', 'channel', 'station_magnitude', 'residual',
  'amplitude_id', 'amplitude_type', 'amplitude_m', 'period_s', 'snr', 'amplitude_time', 'window_reference', 'window_begin_s', 'window_end_s',
  'pick_id', 'evaluation_mode', 'evaluation_status',
] as const;

/**
 * One row per station magnitude of each event (events without any give no row). A station magnitude
 * counted by several of the event's magnitudes gives a row for each; one counted by none a row with
 * empty network columns. Amplitude columns are empty when the station magnitude names no amplitude.
 */
export function magnitudesToCsv(events: readonly QmlEvent[]): string {
  const lines = [`# ${CAUTION}`, MAGNITUDE_CSV_COLUMNS.join(',')];
  for (const ev of events) {
    const amps = new Map((ev.amplitudes ?? []).map((a) => [a.id, a]));
    for (const sm of ev.stationMagnitudes ?? []) {
      const a = sm.amplitudeId ? amps.get(sm.amplitudeId) ?? null : null;
      const w = sm.waveformId ?? a?.waveformId ?? null;
      const owners = (ev.magnitudes ?? []).filter((m) => m.contributions.some((c) => c.stationMagnitudeId === sm.id));
      for (const m of owners.length ? owners : [null]) {
        const residual = m?.contributions.find((c) => c.stationMagnitudeId === sm.id)?.residual ?? null;
        lines.push([
          ev.id, m?.id ?? null, m?.type ?? sm.type, m?.mag ?? null, m?.uncertainty ?? null, m?.stationCount ?? null,
          m ? (ev.preferredMagnitudeId === m.id ? 'true' : 'false') : null,
          sm.id, w?.network ?? null, w?.station ?? null, w?.location ?? null, w?.channel ?? null, sm.mag, residual,
          a?.id ?? null, a?.type ?? null, a?.value ?? null, a?.periodS ?? null, a?.snr ?? null, a?.time != null ? isoFromMicros(a.time) : null,
          a?.timeWindow ? isoFromMicros(a.timeWindow.reference) : null, a?.timeWindow?.beginS ?? null, a?.timeWindow?.endS ?? null,
          a?.pickId ?? null, a?.evaluationMode ?? m?.evaluationMode ?? null, a?.evaluationStatus ?? m?.evaluationStatus ?? null,
        ].map(csvField).join(','));
      }
    }
  }
  return `${lines.join('\n')}\n`;
}
