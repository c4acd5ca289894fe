import { describe, expect, it } from 'vitest';
import { renderStation } from '../../../core/synth/render';
import { measureSnr, scenarioTruth, stationTruth } from '../../../core/synth/truth';
import { isoFromMicros } from '../../../core/time';
import { python } from './python';
import { quake, ringStations, tinyScenario } from './scenarioFixtures';

describe('truth', () => {
  const stations = ringStations(5, 20);
  const ev = quake('a', 40, 1.6, 8, { strike: 100, dip: 60, rake: 20 });
  const faults = [{ kind: 'reversedPolarity' as const, channel: 'XX.T00.00.HHZ' },
    { kind: 'clockOffset' as const, station: 'T02', start: ev.origin - 10e6, end: ev.origin + 60e6, offsetMicros: 750_000, timingQuality: 10 }];
  const sc = tinyScenario(stations, [ev], 90, faults);

  it('measures SNR as scipy does: 1-20 Hz Butterworth (order 4) sosfilt, RMS of 1 s after over RMS of 5 s before (to 1e-6)', () => {
    const rs = renderStation(sc, 'T00');
    const z = rs.channels[0];
    const tp = rs.events[0].p.time;
    const ours = measureSnr([z], tp)!;
    const at = Math.round(((tp - z.start) * 100) / 1e6);
    const ref = python<number>(`
x = np.array(inp['x'], float); at = inp['at']; fs = 100
seg = x[at - 35*fs: at + fs]
y = scipy.signal.sosfilt(scipy.signal.butter(4, [1, 20], 'bandpass', fs=fs, output='sos'), seg)
a = 35*fs
print(json.dumps(float(np.sqrt(np.mean(y[a:a+fs]**2)) / np.sqrt(np.mean(y[a-5*fs:a]**2)))))`, { x: z.samples, at });
    expect(ours / ref).toBeCloseTo(1, 6);
    expect(ours).toBeGreaterThan(3);
  });

  it('gives each arrival the true time, the time as tagged by a wrong clock, the first-motion polarity and the reversed channel', () => {
    const all = stations.map((s) => stationTruth(sc, renderStation(sc, s.code)));
    const truth = scenarioTruth(sc, all);
    const e = truth.events[0];
    expect(e.arrivals).toHaveLength(2 * stations.length);
    for (const a of e.arrivals) {
      const ea = renderStation(sc, a.station, { noise: false }).events[0];
      const w = a.wave === 'P' ? ea.p : ea.s;
      expect(a.timeMicros).toBe(w.time);
      if (a.wave === 'P') expect(a.polarity).toBe(ea.p.motion.up >= 0 ? 'positive' : 'negative');
      expect(a.recordedTime).toBe(a.station === 'T02'
        ? isoFromMicros(a.timeMicros + 750_000)
        : a.time);
      expect(a.reversedChannels).toEqual(a.station === 'T00' ? ['XX.T00.00.HHZ'] : []);
      expect(a.inGap).toBe(false);
    }
    expect(truth.faults[1].start).toMatch(/^2026-03-01T10:00:30/);
  });
});
