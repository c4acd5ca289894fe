import { describe, expect, it } from 'vitest';
import { hitAmplitude, movedAmplitudeWindow, type AmplitudeMarks } from '../../../renderer/picks/amplitudeLayer';
import type { QmlAmplitude } from '../../../core/quakeml';
import type { SiteRow } from '../../../renderer/traces/traceView';

const T = 1_700_000_000_000_000;
function amp(id: string, channel: string, dt: number): QmlAmplitude {
  return {
    id, value: 1e-6, type: 'IAML', unit: 'm', periodS: null, snr: null, timeWindow: null, time: T + dt * 1e6,
    waveformId: { network: 'XX', station: 'A', location: '00', channel }, pickId: null, magnitudeHint: 'ML', evaluationMode: 'automatic', evaluationStatus: 'preliminary',
  };
}
const row = { key: 'XX.A', label: 'A', components: [{ key: 'XX.A.00.HHZ' }, { key: 'XX.A.00.HHN' }, { key: 'XX.A.00.HHE' }] } as unknown as SiteRow;
const marks: AmplitudeMarks = { amplitudes: [amp('n', 'HHN', 5), amp('e', 'HHE', 5.1), amp('n2', 'HHN', 5.3)], stationMagnitudes: [], selected: null, toView: (t) => (t - T) / 1e6 };

describe('amplitude picks on the traces', () => {
  it('finds the nearest amplitude pick in the pointer band within the tolerance, none in another band or beyond it', () => {
    expect(hitAmplitude(row, 1, 5.12, 0.2, marks)?.id).toBe('n');
    expect(hitAmplitude(row, 1, 5.2, 0.2, marks)?.id).toBe('n2');
    expect(hitAmplitude(row, 2, 5.12, 0.2, marks)?.id).toBe('e');
    expect(hitAmplitude(row, 0, 5, 0.2, marks)).toBeNull();
    expect(hitAmplitude(row, 1, 5.7, 0.2, marks)).toBeNull();
  });
  it('measures a dropped amplitude pick in ±0.25 s around it by default, and names a bad half width', () => {
    expect(movedAmplitudeWindow(T)).toEqual({ start: T - 250_000, end: T + 250_000 });
    expect(movedAmplitudeWindow(T, 0.1)).toEqual({ start: T - 100_000, end: T + 100_000 });
    expect(() => movedAmplitudeWindow(T, 0)).toThrow('half width must be > 0 s, got 0');
  });
});
