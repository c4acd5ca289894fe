import { describe, expect, it } from 'vitest';
import { windowFromOrigin, windowFromPicks, type TimeWindow } from '../../../core/magnitude/amplitude';
import {
  localMagnitude, measureWoodAndersonAmplitude, median, type StationDistance, type WoodAndersonAmplitude,
} from '../../../core/magnitude/localMagnitude';
import { channelResponse } from '../../../core/magnitude/response';
import { IASPEI_2013, RICHTER_1935 } from '../../../core/magnitude/scales';
import { channelKey, type ChannelId } from '../../../core/model';
import type { ChannelMeta } from '../../../core/stationxml/types';
import { demoScenario } from '../../../core/synth/demo';
import { scenarioInventory } from '../../../core/synth/inventory';
import { renderStation } from '../../../core/synth/render';
import { broadbandSensor, DIGITIZER_GAIN_40VPP } from '../../../core/synth/response';
import type { Scenario, StationSpec } from '../../../core/synth/types';
import { quake, ringStations, tinyScenario } from '../synth/scenarioFixtures';

const T = 1_700_000_000_000_000;
const W: TimeWindow = { start: T, end: T + 10e6 };

function amp(station: string, cha: string, metres: number, clipped = false, standard = 'UC1990', snr: number | null = null): WoodAndersonAmplitude {
  const channel: ChannelId = { network: 'XX', station, location: '00', channel: cha };
  return { channel, key: channelKey(channel), amplitudeM: metres, time: T, periodS: null, measure: 'zeroToPeak', standard, window: W, clipped, snr };
}

describe('localMagnitude on given amplitudes (hand-computed with the IASPEI 2013 formula)', () => {
  const dist = new Map<string, StationDistance>([
    ['XX.AAA', { epicentralKm: 8, hypocentralKm: 10 }],
    ['XX.BBB', { epicentralKm: 30, hypocentralKm: 30 }],
    ['XX.CCC', { epicentralKm: 100, hypocentralKm: 100 }],
  ]);
  // log10(A nm) + distance term: 10 km → 1.11 + 0.0189 − 2.09 = −0.9611; 30 km → 1.6396... ; 100 km → 0.319.
  const d10 = 1.11 + 0.0189 - 2.09, d30 = 1.11 * Math.log10(30) + 0.0567 - 2.09, d100 = 0.319;
  const amps = [
    amp('AAA', 'HHN', 1000e-9), amp('AAA', 'HHE', 500e-9),
    amp('BBB', 'HHN', 100e-9), amp('BBB', 'HHE', 200e-9),
    amp('CCC', 'HHN', 10e-9), amp('CCC', 'HHE', 30e-9, true),
  ];
  it("'each' counts every unclipped horizontal as one datum (IASPEI 2013) and takes their median", () => {
    const r = localMagnitude(amps, dist, { scale: IASPEI_2013 });
    const data = [3 + d10, Math.log10(500) + d10, 2 + d30, Math.log10(200) + d30, 1 + d100];
    expect(r.count).toBe(5);
    expect(r.stationCount).toBe(3);
    expect(r.value).toBeCloseTo([...data].sort((a, b) => a - b)[2], 12);
    const mean = data.reduce((s, m) => s + m, 0) / 5;
    expect(r.std).toBeCloseTo(Math.sqrt(data.reduce((s, m) => s + (m - mean) ** 2, 0) / 4), 12);
    const clipped = r.stations.find((s) => s.station === 'XX.CCC')?.channels.find((c) => c.key.endsWith('HHE'));
    expect(clipped?.excluded).toBe('clipped');
    expect(clipped?.magnitude).toBeNull();
  });
  it("'max' takes each station's larger horizontal; 'mean' the mean of its channel magnitudes; neither uses a station with a clipped horizontal", () => {
    const mx = localMagnitude(amps, dist, { scale: IASPEI_2013, combine: 'max' });
    // CCC's HHE clipped: with 'max' the station gives no datum (its HHN alone could understate it).
    expect(mx.stations.map((s) => s.magnitude)).toEqual([expect.closeTo(3 + d10, 12), expect.closeTo(Math.log10(200) + d30, 12), null]);
    expect(mx.value).toBeCloseTo((3 + d10 + Math.log10(200) + d30) / 2, 12);
    expect(mx.count).toBe(2);
    const mn = localMagnitude(amps, dist, { scale: IASPEI_2013, combine: 'mean' });
    expect(mn.stations[0].magnitude).toBeCloseTo((3 + Math.log10(500)) / 2 + d10, 12);
  });
  it('applies a channel correction before a station correction, and a station correction to all its channels', () => {
    const r = localMagnitude(amps, dist, { scale: IASPEI_2013, combine: 'max', stationCorrections: { 'XX.AAA': 0.2, 'XX.BBB.00.HHE': -0.35 } });
    expect(r.stations[0].magnitude).toBeCloseTo(3 + d10 + 0.2, 12);
    // BBB: HHN 100 nm (no correction) vs HHE 200 nm − 0.35 (89 nm): the larger corrected amplitude is HHN.
    expect(r.stations[1].magnitude).toBeCloseTo(2 + d30, 12);
  });
  it('gives no value, zero count and null spreads when every trace clipped', () => {
    const r = localMagnitude([amp('AAA', 'HHN', 1e-6, true)], dist, { scale: IASPEI_2013 });
    expect([r.value, r.mad, r.std, r.count]).toEqual([null, null, null, 0]);
  });
  it('refuses amplitudes simulated with another Wood-Anderson than the scale was calibrated with', () => {
    expect(() => localMagnitude([amp('AAA', 'HHN', 1e-6)], dist, { scale: RICHTER_1935 })).toThrow(/simulated with Wood-Anderson UC1990, but scale Richter1935 needs AW1925/);
  });
  it('refuses a station without a distance, and excludes stations beyond the scale range', () => {
    expect(() => localMagnitude([amp('ZZZ', 'HHN', 1e-6)], dist, { scale: IASPEI_2013 })).toThrow(/no distance given for station XX.ZZZ/);
    const far = localMagnitude([amp('AAA', 'HHN', 1e-6, false, 'AW1925')], new Map([['XX.AAA', { epicentralKm: 700, hypocentralKm: 700 }]]), { scale: RICHTER_1935 });
    expect(far.stations[0].channels[0].excluded).toBe('distance out of range');
  });
  it('leaves out amplitudes below minSnr and keeps those without a ratio', () => {
    const r = localMagnitude([amp('AAA', 'HHN', 1e-6, false, 'UC1990', 2.5), amp('AAA', 'HHE', 2e-6, false, 'UC1990', 1.5), amp('BBB', 'HHN', 1e-7)], dist, { scale: IASPEI_2013, minSnr: 2 });
    expect(r.stations.flatMap((s) => s.channels.map((c) => c.excluded))).toEqual([null, 'low signal-to-noise', null]);
    expect(r.count).toBe(2);
  });
  it('median of an even count is the mean of the two middle values', () => {
    expect(median([4, 1, 3, 2])).toBe(2.5);
    expect(median([5, 1, 3])).toBe(3);
  });
});

/** Renders `sc`, measures every horizontal of the first sensor (or of `location`) and returns the amplitudes and distances. */
function measureScenario(sc: Scenario, stations: readonly StationSpec[], opts: { location?: string; fromOrigin?: boolean } = {}): {
  amps: WoodAndersonAmplitude[]; dist: Map<string, StationDistance>;
} {
  const inv = scenarioInventory(sc);
  const metas = new Map<string, ChannelMeta>(inv.networks[0].stations.flatMap((s) => s.channels.map((c) => [channelKey(c.id), c] as const)));
  const amps: WoodAndersonAmplitude[] = [];
  const dist = new Map<string, StationDistance>();
  for (const st of stations) {
    const r = renderStation(sc, st.code);
    const ea = r.events[0];
    dist.set(`XX.${st.code}`, { epicentralKm: ea.epicentralKm, hypocentralKm: ea.hypocentralKm });
    const w = opts.fromOrigin
      ? windowFromOrigin({ origin: ea.event.origin, distanceKm: ea.hypocentralKm })
      : windowFromPicks({ p: ea.p.time, s: ea.s.time });
    const loc = opts.location ?? st.channels[0].location;
    for (const c of r.channels) {
      if (c.spec.dip !== 0 || c.id.location !== loc) continue;
      const meta = metas.get(channelKey(c.id));
      if (!meta) throw new Error(`no metadata for ${channelKey(c.id)}`);
      const a = measureWoodAndersonAmplitude({
        channel: c.id, counts: c.samples, sampleRate: c.sampleRate, start: c.start, response: channelResponse(meta), fullScaleCounts: c.spec.instrument.clipCounts,
      }, w, { scale: IASPEI_2013, noiseWindow: { start: ea.p.time - 12e6, end: ea.p.time - 2e6 } });
      if (a) amps.push(a);
    }
  }
  return { amps, dist };
}

describe('end to end on the synthetic generator (core/synth), whose amplitudes follow the IASPEI 2013 law on the larger horizontal', () => {
  const stations = ringStations(7, 20);
  const events = [
    { ml: 1.8, depth: 5, north: 3, east: -2, fromOrigin: false },
    { ml: 2.8, depth: 8, north: -4, east: 5, fromOrigin: true },
  ];
  for (const ev of events) {
    it(`recovers ML ${ev.ml} within 0.2 from at least 4 unclipped stations (larger horizontal, window from ${ev.fromOrigin ? 'origin and distance' : 'P and S'})`, () => {
      const sc = tinyScenario(stations, [quake('a', 15, ev.ml, ev.depth, { strike: 200, dip: 55, rake: 100 }, ev.north, ev.east)], 70);
      const { amps, dist } = measureScenario(sc, stations, { fromOrigin: ev.fromOrigin });
      const r = localMagnitude(amps, dist, { scale: IASPEI_2013, combine: 'max' });
      expect(r.stationCount).toBeGreaterThanOrEqual(4);
      expect(Math.abs((r.value as number) - ev.ml)).toBeLessThan(0.2);
      // The 10 s before P hold only noise: the signal-to-noise ratios are large.
      for (const a of amps) expect(a.snr as number).toBeGreaterThan(10);
      for (const s of r.stations) expect(Math.abs((s.magnitude as number) - ev.ml)).toBeLessThan(0.2);
      // Each horizontal as a datum (IASPEI) reads lower at single stations, by the ratio of the horizontals.
      const each = localMagnitude(amps, dist, { scale: IASPEI_2013 });
      expect(each.count).toBe(2 * r.count);
      expect(each.value as number).toBeLessThanOrEqual((r.value as number) + 1e-9);
    });
  }
  it('recovers the magnitude from accelerometer horizontals (HN?, m/s**2) within 0.2', () => {
    const sc = tinyScenario(stations, [quake('a', 15, 2.2, 6, { strike: 30, dip: 70, rake: -20 }, 2, 2)], 70);
    const withHn = stations.filter((s) => s.channels.some((c) => c.location === '10'));
    const { amps, dist } = measureScenario(sc, withHn, { location: '10' });
    expect(amps.map((a) => a.channel.channel).sort()).toEqual(['HNE', 'HNN']);
    const r = localMagnitude(amps, dist, { scale: IASPEI_2013, combine: 'max' });
    expect(Math.abs((r.value as number) - 2.2)).toBeLessThan(0.2);
  });
  it('takes no magnitude from a clipped trace: a high-gain digitizer 1.5 km from an ML 3.5 (clipped flag from the digitizer full scale)', () => {
    const ring = ringStations(6, 20).filter((s) => s.channels.length === 3);
    const [near0] = ringStations(1, 1.5);
    const hot = broadbandSensor(DIGITIZER_GAIN_40VPP * 8);
    const near: StationSpec = { ...near0, code: 'NEAR', channels: near0.channels.map((c) => ({ ...c, instrument: hot })) };
    const all = [...ring, near];
    const sc = tinyScenario(all, [quake('big', 15, 3.5, 3, { strike: 0, dip: 45, rake: 90 })], 70);
    const { amps, dist } = measureScenario(sc, all);
    const r = localMagnitude(amps, dist, { scale: IASPEI_2013, combine: 'max' });
    const nearMag = r.stations.find((s) => s.station === 'XX.NEAR');
    expect(nearMag?.magnitude).toBeNull();
    // HHN reached full scale; HHE did not, but alone it would understate the larger horizontal.
    expect(nearMag?.channels.map((c) => c.excluded)).toEqual(['clipped', 'another horizontal clipped']);
    expect(r.stationCount).toBe(ring.length);
    expect(Math.abs((r.value as number) - 3.5)).toBeLessThan(0.2);
    // Each horizontal as its own datum (IASPEI 2013): the unclipped HHE still counts.
    const each = localMagnitude(amps, dist, { scale: IASPEI_2013 });
    expect(each.stations.find((s) => s.station === 'XX.NEAR')?.channels.map((c) => c.excluded)).toEqual(['clipped', null]);
  });
});

describe("the demo scenario's own events (core/synth/demo), each rendered alone over 210 s at the demo's 14 stations", () => {
  const demo = demoScenario();
  for (const id of ['reg-0233', 'eq-2317a', 'eq-0015']) {
    it(`${id}: ML within 0.2 of the scenario's value from at least 4 unclipped stations, SNR ≥ 3`, () => {
      const ev = demo.events.find((e) => e.id === id);
      if (!ev) throw new Error(`demo event ${id} is missing`);
      const sc: Scenario = { ...demo, start: ev.origin - 30e6, end: ev.origin + 180e6, events: [ev], faults: [] };
      const { amps, dist } = measureScenario(sc, sc.stations);
      const r = localMagnitude(amps, dist, { scale: IASPEI_2013, combine: 'max', minSnr: 3 });
      expect(r.stationCount).toBeGreaterThanOrEqual(4);
      expect(Math.abs((r.value as number) - ev.magnitude)).toBeLessThan(0.2);
      // The largest local event clips the high-gain digitizer at KIRN (the demo's design): no magnitude there.
      const kirn = r.stations.find((st) => st.station === 'XX.KIRN');
      if (id === 'eq-2317a') expect(kirn?.magnitude).toBeNull();
      else expect(kirn?.magnitude).not.toBeNull();
    });
  }
});

describe('measureWoodAndersonAmplitude argument checks', () => {
  it('names the channel and the bad sample rate, rejects an empty window and windows reaching into the taper', () => {
    const meta: ChannelMeta = {
      id: { network: 'XX', station: 'AAA', location: '00', channel: 'HHN' }, start: null, end: null, latitude: 0, longitude: 0, elevation: 0, depth: 0,
      azimuth: 0, dip: 0, sampleRate: 100, stages: [{ number: 1, inputUnits: 'm', outputUnits: 'count', decimation: null, gain: { value: 1e9, frequency: 1 }, filter: null }],
    };
    const trace = { channel: meta.id, counts: new Int32Array(1000), sampleRate: 0, start: T, response: channelResponse(meta) };
    expect(() => measureWoodAndersonAmplitude(trace, W, { scale: IASPEI_2013 })).toThrow(/XX.AAA.00.HHN: sample rate must be > 0 Hz, got 0/);
    expect(() => measureWoodAndersonAmplitude({ ...trace, sampleRate: 100 }, { start: T, end: T }, { scale: IASPEI_2013 })).toThrow(/window end must be after its start/);
    // 1000 samples at 100 Hz: the taper covers samples 0-48 and 951-999.
    expect(() => measureWoodAndersonAmplitude({ ...trace, sampleRate: 100 }, { start: T + 0.2e6, end: T + 5e6 }, { scale: IASPEI_2013 }))
      .toThrow(/XX.AAA.00.HHN: the window \(samples 20 to 501\) must lie inside the trace clear of its tapered ends \(samples 49 to 951\)/);
    expect(() => measureWoodAndersonAmplitude({ ...trace, sampleRate: 100 }, { start: T + 2e6, end: T + 5e6 }, { scale: IASPEI_2013, noiseWindow: { start: T - 1e6, end: T + 1e6 } }))
      .toThrow(/the noise window/);
    expect(measureWoodAndersonAmplitude({ ...trace, sampleRate: 100 }, { start: T + 2e6, end: T + 5e6 }, { scale: IASPEI_2013 })?.amplitudeM).toBe(0);
  });
});
