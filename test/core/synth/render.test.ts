import { describe, expect, it } from 'vitest';
import { firstArrival } from '../../../core/location/travelTime';
import { DEMO_MODEL } from '../../../core/synth/demo';
import { distanceAzimuth } from '../../../core/synth/geometry';
import { doubleCoupleRadiation } from '../../../core/synth/radiation';
import { Rng } from '../../../core/synth/random';
import { renderStation } from '../../../core/synth/render';
import { broadbandSensor, DIGITIZER_GAIN_40VPP, responseScale } from '../../../core/synth/response';
import { butterworth } from '../../../core/dsp/butterworth';
import { sosfilt } from '../../../core/dsp/sosfilt';
import { python } from './python';
import { quake, ringStations, T0, tinyScenario } from './scenarioFixtures';

function indexOf(t: number, fs: number): number {
  return ((t - T0) * fs) / 1e6;
}

describe('renderStation', () => {
  it('puts nothing before the P arrival: without noise every sample before the P time is exactly 0', () => {
    const stations = ringStations(6, 18);
    const sc = tinyScenario(stations, [quake('a', 3.3337, 2.0, 7.3, { strike: 40, dip: 60, rake: -70 })], 40);
    for (const st of stations) {
      const r = renderStation(sc, st.code, { noise: false });
      const tp = r.events[0].p.time;
      for (const c of r.channels) {
        const first = Math.ceil(indexOf(tp, c.sampleRate)); // first sample at or after the arrival
        let nonzeroBefore = 0;
        for (let i = 0; i < first; i++) if (c.samples[i] !== 0) nonzeroBefore++;
        expect(nonzeroBefore).toBe(0);
        let after = 0;
        for (let i = first; i < first + c.sampleRate; i++) after = Math.max(after, Math.abs(c.samples[i]));
        expect(after).toBeGreaterThan(0);
      }
    }
  });

  it('gives the P first motion on the vertical the sign of the Aki & Richards P radiation (up for compression) for random mechanisms', () => {
    const rng = new Rng(11);
    const stations = ringStations(8, 25);
    let checked = 0;
    for (let k = 0; k < 6; k++) {
      const mech = { strike: rng.uniform(0, 360), dip: rng.uniform(20, 90), rake: rng.uniform(-180, 180) };
      const ev = quake(`e${k}`, 2, 2.5, rng.uniform(3, 15), mech);
      const sc = tinyScenario(stations, [ev], 15);
      for (const st of stations) {
        const da = distanceAzimuth(ev.latitude, ev.longitude, st.latitude, st.longitude);
        const tt = firstArrival(DEMO_MODEL, 'P', da.distanceKm, ev.depthKm, 0);
        const rp = doubleCoupleRadiation(mech, tt.takeoffDeg, da.azimuthDeg).p;
        if (Math.abs(rp) < 0.1) continue; // near a nodal plane the first motion is too small to call
        const z = renderStation(sc, st.code, { noise: false }).channels.find((c) => c.spec.dip === -90)!;
        const first = Math.ceil(indexOf(ev.origin + tt.time * 1e6, z.sampleRate));
        let peak = 0;
        for (let i = first; i < first + 0.3 * z.sampleRate; i++) peak = Math.max(peak, Math.abs(z.samples[i]));
        let i = first;
        while (Math.abs(z.samples[i]) < 0.05 * peak) i++;
        expect(Math.sign(z.samples[i])).toBe(Math.sign(rp));
        checked++;
      }
    }
    expect(checked).toBeGreaterThan(30);
  });

  it('makes S larger on the horizontals than on the vertical, and P larger on the vertical than on each horizontal, at most stations', () => {
    const stations = ringStations(8, 20).filter((s) => s.channels.length === 3 && s.channels[1].code.endsWith('N'));
    const sc = tinyScenario(stations, [quake('a', 2, 2.0, 8, { strike: 10, dip: 70, rake: 30 })], 20);
    let sH = 0, pZ = 0;
    for (const st of stations) {
      const r = renderStation(sc, st.code, { noise: false });
      const ea = r.events[0];
      const peakIn = (x: Int32Array, fs: number, t: number, len: number) => {
        let m = 0;
        const i0 = Math.ceil(indexOf(t, fs));
        for (let i = i0; i < i0 + len * fs; i++) m = Math.max(m, Math.abs(x[i]));
        return m;
      };
      const [z, n, e] = r.channels;
      const sWin = Math.min(3, (ea.s.time - ea.p.time) / 1e6);
      if (Math.max(peakIn(n.samples, 100, ea.s.time, 3), peakIn(e.samples, 100, ea.s.time, 3)) > peakIn(z.samples, 100, ea.s.time, 3)) sH++;
      if (peakIn(z.samples, 100, ea.p.time, sWin * 0.5) > Math.max(peakIn(n.samples, 100, ea.p.time, sWin * 0.5), peakIn(e.samples, 100, ea.p.time, sWin * 0.5)) * 0.8) pZ++;
    }
    expect(sH).toBeGreaterThanOrEqual(stations.length - 1);
    expect(pZ).toBeGreaterThanOrEqual(stations.length - 2);
  });

  it('follows the ML law: scipy/numpy remove the instrument, simulate a Wood-Anderson (0.8 s, h 0.7) and the IASPEI formula gives back the ML within 0.15', () => {
    const stations = ringStations(6, 15);
    const ml = 2.3, depth = 6;
    const sc = tinyScenario(stations, [quake('a', 2, ml, depth, { strike: 200, dip: 55, rake: 100 }, 4, -3)], 40);
    const cases: { x: Int32Array[]; fs: number; zeros: unknown; poles: unknown; scale: number; r: number; accel: boolean }[] = [];
    for (const st of stations) {
      const r = renderStation(sc, st.code, { noise: false });
      const h = r.channels.filter((c) => c.spec.dip === 0 && c.id.location === st.channels[0].location);
      if (h.length === 0) continue;
      const inst = h[0].spec.instrument;
      cases.push({ x: h.map((c) => c.samples), fs: h[0].sampleRate, zeros: inst.zeros, poles: inst.poles, scale: responseScale(inst), r: r.events[0].hypocentralKm, accel: false });
    }
    const mls = python<number[]>(`
out = []
w0 = 2*np.pi/0.8; h = 0.7
for c in inp:
    fs = c['fs']; peaks = []
    for x in c['x']:
        x = np.array(x, float); n = 1 << int(np.ceil(np.log2(len(x)*2)))
        f = np.fft.rfftfreq(n, 1/fs); s = 2j*np.pi*f
        z = [complex(a['re'], a['im']) for a in c['zeros']]; p = [complex(a['re'], a['im']) for a in c['poles']]
        H = c['scale'] * np.prod([s - q for q in z], axis=0) / np.prod([s - q for q in p], axis=0) * s  # counts per m of displacement
        H[0] = 1
        wa = s**2 / (s**2 + 2*h*w0*s + w0**2)
        taper = np.clip((f - 0.2) / 0.3, 0, 1)  # remove the lowest frequencies, where the deconvolution is unstable
        y = np.fft.irfft(np.fft.rfft(x, n) / H * wa * taper, n)[:len(x)]
        peaks.append(np.max(np.abs(y)) * 1e9)
    A = max(peaks); R = c['r']
    out.append(float(np.log10(A) + 1.11*np.log10(R) + 0.00189*R - 2.09))
print(json.dumps(out))`, cases);
    expect(mls.length).toBeGreaterThanOrEqual(4);
    for (const m of mls) expect(Math.abs(m - ml)).toBeLessThan(0.15);
  });

  it('renders an explosion with compressional first motion at every station, weak S and a strong low-frequency Rg wave', () => {
    const stations = ringStations(6, 20).filter((s) => s.channels.length === 3);
    const ev = quake('x', 2, 2.0, -0.2, null, 3, 2);
    const sc = tinyScenario(stations, [ev], 40);
    for (const st of stations) {
      const r = renderStation(sc, st.code, { noise: false });
      const ea = r.events[0];
      expect(ea.p.motion.up).toBeGreaterThan(0);
      const z = r.channels[0];
      const i0 = Math.ceil(indexOf(ea.p.time, z.sampleRate));
      // The first motion: the first sample beyond 1 % of the P peak (the spectrum cut at the Nyquist
      // frequency leaves a ripple of a few counts at the front, pulse.ts).
      let peak = 0;
      for (let k = i0; k < i0 + z.sampleRate; k++) peak = Math.max(peak, Math.abs(z.samples[k]));
      let i = i0;
      while (Math.abs(z.samples[i]) <= 0.01 * peak) i++;
      expect(z.samples[i]).toBeGreaterThan(0);
      // Rg: below 2 Hz (Butterworth low-pass) the largest vertical motion comes after S (Rg is slower than S).
      const low = sosfilt(butterworth(4, 2, 'lowpass', z.sampleRate), z.samples);
      let pPeak = 0, late = 0;
      for (let k = i0; k < i0 + 2 * z.sampleRate; k++) pPeak = Math.max(pPeak, Math.abs(low[k]));
      const iS = Math.ceil(indexOf(ea.s.time, z.sampleRate));
      for (let k = iS + 100; k < low.length; k++) late = Math.max(late, Math.abs(low[k]));
      expect(late).toBeGreaterThan(3 * pPeak);
      // Weak S: the S radiation used is 0.12 of the P one in both components.
      expect(Math.abs(ea.radiation.sv)).toBeCloseTo(0.12, 12);
    }
  });

  it('applies the sample faults: a reversed channel is the negative of the normal one, a dead channel is flat, a spike lands on its sample', () => {
    const [st] = ringStations(1, 10);
    const ev = quake('a', 2, 1.5, 5, { strike: 0, dip: 80, rake: 10 });
    const spikeAt = T0 + 7_250_000;
    const faults = [
      { kind: 'reversedPolarity' as const, channel: 'XX.T00.00.HHZ' },
      { kind: 'deadChannel' as const, channel: 'XX.T00.00.HHE', value: -211 },
      { kind: 'spike' as const, channel: 'XX.T00.00.HHN', time: spikeAt, counts: 100_000 },
    ];
    const plain = renderStation(tinyScenario([st], [ev], 20), 'T00');
    const bad = renderStation(tinyScenario([st], [ev], 20, faults), 'T00');
    const [z0, n0] = plain.channels, [z1, n1, e1] = bad.channels;
    for (let i = 0; i < z0.samples.length; i += 7) expect(z1.samples[i] + z0.samples[i]).toBe(0);
    expect(new Set(e1.samples).size).toBe(1);
    expect(e1.samples[0]).toBe(-211);
    const k = indexOf(spikeAt, 100);
    expect(n1.samples[k] - n0.samples[k]).toBe(100_000);
    expect(n1.samples[k + 1]).toBe(n0.samples[k + 1]);
  });

  it('clips at the digitizer full scale and says where', () => {
    const [plain] = ringStations(1, 1.5);
    // A high-gain digitizer (8 times the usual counts per volt), as at the demo's KIRN.
    const inst = broadbandSensor(DIGITIZER_GAIN_40VPP * 8);
    const st = { ...plain, channels: plain.channels.map((c) => ({ ...c, instrument: inst })) };
    const sc = tinyScenario([st], [quake('big', 2, 3.5, 3, { strike: 0, dip: 45, rake: 90 })], 30);
    const r = renderStation(sc, 'T00', { noise: false });
    const clip = st.channels[0].instrument.clipCounts;
    const c = r.channels.find((ch) => ch.clippedAt.length > 0)!;
    expect(c).toBeDefined();
    expect(Math.abs(c.samples[c.clippedAt[0]])).toBe(clip);
    for (const ch of r.channels) for (let i = 0; i < ch.samples.length; i += 3) expect(Math.abs(ch.samples[i])).toBeLessThanOrEqual(clip);
  });

  it('is deterministic: the same scenario gives the same samples', () => {
    const [st] = ringStations(1, 12);
    const sc = tinyScenario([st], [quake('a', 2, 1.0, 5, { strike: 0, dip: 80, rake: 10 })], 20);
    const a = renderStation(sc, 'T00'), b = renderStation(sc, 'T00');
    expect(Buffer.from(a.channels[1].samples.buffer).equals(Buffer.from(b.channels[1].samples.buffer))).toBe(true);
  });

  it('rejects an unknown station', () => {
    expect(() => renderStation(tinyScenario(ringStations(1, 5), []), 'NOPE')).toThrow(/station must be one of T00/);
  });
});
