import { describe, expect, it } from 'vitest';
import { eventMagnitude, magnitudeOrigin, type MagnitudeOrigin, type MagnitudeStation } from '../../../core/magnitude/eventMagnitude';
import { channelResponse } from '../../../core/magnitude/response';
import { channelKey } from '../../../core/model';
import type { ChannelMeta } from '../../../core/stationxml/types';
import { scenarioInventory } from '../../../core/synth/inventory';
import { renderStation } from '../../../core/synth/render';
import type { Scenario } from '../../../core/synth/types';
import { quake, ringStations, tinyScenario } from '../synth/scenarioFixtures';

/**
 * The generator's amplitudes follow the IASPEI (2013) standard ML on the larger horizontal
 * (core/synth/mlLaw): ML = log10(A/nm) + 1.11·log10(R/km) + 0.00189·R − 2.09, R hypocentral
 * (IASPEI Working Group on Magnitudes 2013, eq. 1). The test recomputes each station magnitude with
 * that formula from the amplitude and the generator's own hypocentral distance.
 */
const iaspei = (metres: number, r: number) => Math.log10(metres * 1e9) + 1.11 * Math.log10(r) + 0.00189 * r - 2.09;

interface Case { sc: Scenario; origin: MagnitudeOrigin; stations: MagnitudeStation[]; hypoKm: Map<string, number>; sTime: Map<string, number> }

function caseOf(ml: number, depth: number, north: number, east: number, usePicks: boolean): Case {
  const stations = ringStations(7, 20);
  const sc = tinyScenario(stations, [quake('a', 15, ml, depth, { strike: 200, dip: 55, rake: 100 }, north, east)], 70);
  const ev = sc.events[0];
  const inv = scenarioInventory(sc);
  const metas = new Map<string, ChannelMeta>(inv.networks[0].stations.flatMap((s) => s.channels.map((c) => [channelKey(c.id), c] as const)));
  const out: MagnitudeStation[] = [];
  const hypoKm = new Map<string, number>(), sTime = new Map<string, number>();
  // ringStations' T04 has a vertical only: no magnitude there.
  for (const st of stations.filter((x) => x.channels.some((ch) => ch.dip === 0))) {
    const r = renderStation(sc, st.code);
    const ea = r.events[0];
    hypoKm.set(`XX.${st.code}`, ea.hypocentralKm);
    sTime.set(`XX.${st.code}`, ea.s.time);
    const loc = st.channels[0].location;
    const hs = r.channels.filter((c) => c.spec.dip === 0 && c.id.location === loc);
    const meta0 = metas.get(channelKey(hs[0].id)) as ChannelMeta;
    out.push({
      position: { latitude: meta0.latitude, longitude: meta0.longitude, elevationM: meta0.elevation - meta0.depth },
      traces: hs.map((c) => ({
        channel: c.id, counts: c.samples, sampleRate: c.sampleRate, start: c.start,
        response: channelResponse(metas.get(channelKey(c.id)) as ChannelMeta), fullScaleCounts: c.spec.instrument.clipCounts,
      })),
      p: usePicks ? ea.p.time : null, s: usePicks ? ea.s.time : null, sPickId: usePicks ? `S-${st.code}` : null,
    });
  }
  return {
    sc, stations: out, hypoKm, sTime,
    origin: { id: 'o1', time: ev.origin, latitude: ev.latitude, longitude: ev.longitude, depthKm: ev.depthKm },
  };
}

describe('eventMagnitude on generator events (core/synth), ring of 7 stations at 20 km, 6 with horizontals', () => {
  it('recovers ML 1.8 within 0.2 with S predicted from the origin, each station magnitude by the IASPEI 2013 formula', () => {
    const c = caseOf(1.8, 5, 3, -2, false);
    const r = eventMagnitude(c.origin, c.stations);
    expect(r.skipped).toEqual([]);
    expect(r.magnitude).not.toBeNull();
    const m = r.magnitude!;
    expect(Math.abs(m.mag - 1.8)).toBeLessThan(0.2);
    expect(m.stationCount).toBe(6);
    expect(r.stationMagnitudes).toHaveLength(6);
    expect(r.amplitudes).toHaveLength(12);
    for (const sm of r.stationMagnitudes) {
      const amp = r.amplitudes.find((a) => a.id === sm.amplitudeId)!;
      expect(amp.type).toBe('IAML');
      expect(amp.unit).toBe('m');
      expect(amp.magnitudeHint).toBe('ML');
      expect(amp.pickId).toBeNull();
      // The station magnitude is that of the larger of the two horizontals.
      const sibling = r.amplitudes.find((a) => a.id !== amp.id && a.waveformId!.station === amp.waveformId!.station)!;
      expect(amp.value).toBeGreaterThanOrEqual(sibling.value);
      const station = `XX.${amp.waveformId!.station}`;
      // Distances: the magnitude code's projection and datum vs the generator's geometry (differ by tens of metres: < 0.005 in ML).
      expect(sm.mag).toBeCloseTo(iaspei(amp.value, c.hypoKm.get(station)!), 2);
      expect(Math.abs(sm.mag - 1.8)).toBeLessThan(0.25);
      expect(sm.originId).toBe('o1');
      // Signal-to-noise from the 5 s before predicted P.
      expect(amp.snr!).toBeGreaterThan(10);
    }
    // Network value: the median of the 6 station magnitudes, uncertainty their standard deviation.
    const mags = r.stationMagnitudes.map((s) => s.mag).sort((a, b) => a - b);
    expect(m.mag).toBeCloseTo((mags[2] + mags[3]) / 2, 12);
    const mean = mags.reduce((s, x) => s + x, 0) / 6;
    expect(m.uncertainty).toBeCloseTo(Math.sqrt(mags.reduce((s, x) => s + (x - mean) ** 2, 0) / 5), 12);
    expect(m.contributions.map((k) => k.residual)).toEqual(r.stationMagnitudes.map((s) => s.mag - m.mag));
  });

  it('recovers ML 2.8 within 0.2 with the window from P and S picks, and ties the amplitudes to the S picks', () => {
    const c = caseOf(2.8, 8, -4, 5, true);
    const r = eventMagnitude(c.origin, c.stations, { idPrefix: 'ev1.ml' });
    expect(Math.abs(r.magnitude!.mag - 2.8)).toBeLessThan(0.2);
    expect(r.magnitude!.id).toBe('ev1.ml.mag');
    for (const a of r.amplitudes) {
      expect(a.pickId).toBe(`S-${a.waveformId!.station}`);
      const s = c.sTime.get(`XX.${a.waveformId!.station}`)!;
      expect(a.timeWindow!.reference).toBe(s);
      // Window from P to S + max(10 s, 2(S − P)): begins S − P before S.
      expect(a.timeWindow!.endS).toBeGreaterThanOrEqual(10);
      expect(a.time!).toBeGreaterThanOrEqual(s - a.timeWindow!.beginS * 1e6);
      expect(a.time!).toBeLessThanOrEqual(s + a.timeWindow!.endS * 1e6);
    }
  });

  it("'each' gives one station magnitude per horizontal, median over them (IASPEI 2013 practice)", () => {
    const c = caseOf(1.8, 5, 3, -2, false);
    const r = eventMagnitude(c.origin, c.stations, { combine: 'each' });
    expect(r.stationMagnitudes).toHaveLength(12);
    expect(r.stationMagnitudes.every((s) => s.amplitudeId !== null && s.waveformId!.channel.startsWith('HH'))).toBe(true);
    const mags = r.stationMagnitudes.map((s) => s.mag).sort((a, b) => a - b);
    expect(r.magnitude!.mag).toBeCloseTo((mags[5] + mags[6]) / 2, 12);
  });

  it('takes nothing from clipped traces and says why a too-short trace was left out', () => {
    const c = caseOf(1.8, 5, 3, -2, false);
    const st = c.stations.map((s, i) => (i === 0 ? { ...s, traces: s.traces.map((t) => ({ ...t, clipped: true })) } : s));
    const short = st[1].traces.map((t) => ({ ...t, counts: t.counts.subarray(0, 2800) }));
    st[1] = { ...st[1], traces: short };
    const r = eventMagnitude(c.origin, st);
    const clippedStation = c.stations[0].traces[0].channel.station;
    expect(r.amplitudes.some((a) => a.waveformId!.station === clippedStation)).toBe(false);
    expect(r.network.stations.find((s) => s.station === `XX.${clippedStation}`)!.channels.map((ch) => ch.excluded)).toEqual(['clipped', 'clipped']);
    expect(r.skipped.map((s) => s.key)).toEqual(short.map((t) => channelKey(t.channel)));
    expect(r.skipped[0].why).toMatch(/must lie inside the trace clear of its tapered ends/);
    expect(r.magnitude!.stationCount).toBe(4);
    expect(Math.abs(r.magnitude!.mag - 1.8)).toBeLessThan(0.2);
  });

  it('follows analyst edits: a moved amplitude pick is measured in its new window (manual), a removed one leaves the magnitude', () => {
    const c = caseOf(1.8, 5, 3, -2, true);
    const before = eventMagnitude(c.origin, c.stations);
    const [hn, he] = c.stations[0].traces.map((t) => channelKey(t.channel));
    const p = c.stations[0].p!;
    // Moved onto the noise 3 s before P: a far smaller amplitude, measured there.
    const moved: [number, number] = [p - 3.25e6, p - 2.75e6];
    const edits = new Map([[hn, { start: moved[0], end: moved[1] }], [he, { start: moved[0], end: moved[1] }]]);
    const r = eventMagnitude(c.origin, c.stations, { amplitudeEdits: edits });
    const a = r.amplitudes.find((x) => channelKey(x.waveformId!) === hn)!;
    expect(a.evaluationMode).toBe('manual');
    expect(a.time!).toBeGreaterThanOrEqual(moved[0]);
    expect(a.time!).toBeLessThanOrEqual(moved[1]);
    expect(a.timeWindow).toEqual({ reference: moved[0], beginS: 0, endS: 0.5 });
    const old = before.amplitudes.find((x) => channelKey(x.waveformId!) === hn)!;
    expect(a.value).toBeLessThan(old.value / 10);
    const st = `XX.${c.stations[0].traces[0].channel.station}`;
    const magOf = (x: typeof r) => x.network.stations.find((s) => s.station === st)!.magnitude!;
    expect(magOf(r)).toBeLessThan(magOf(before) - 1);
    // Removed: the station gives no magnitude, the others are unchanged.
    const gone = eventMagnitude(c.origin, c.stations, { amplitudeEdits: new Map([[hn, null], [he, null]]) });
    expect(gone.skipped).toEqual([{ key: hn, why: 'removed by the analyst' }, { key: he, why: 'removed by the analyst' }]);
    expect(gone.magnitude!.stationCount).toBe(5);
    expect(gone.stationMagnitudes.map((s) => s.mag)).toEqual(before.stationMagnitudes.filter((s) => `XX.${s.waveformId!.station}` !== st).map((s) => s.mag));
  });

  it('gives no magnitude when every trace clipped, and converts a QuakeML origin (depth m to km)', () => {
    const c = caseOf(1.8, 5, 3, -2, false);
    const r = eventMagnitude(c.origin, c.stations.map((s) => ({ ...s, traces: s.traces.map((t) => ({ ...t, clipped: true })) })));
    expect(r.magnitude).toBeNull();
    expect(r.amplitudes).toEqual([]);
    expect(magnitudeOrigin({
      id: 'x', time: 5, timeUncertainty: null, latitude: 1, longitude: 2, depthM: 7500, depthUncertaintyM: null, depthType: null,
      ellipse: null, horizontalUncertaintyM: null, quality: null, arrivals: [], evaluationMode: 'automatic', evaluationStatus: 'preliminary',
    })).toEqual({ id: 'x', time: 5, latitude: 1, longitude: 2, depthKm: 7.5 });
    expect(() => eventMagnitude(c.origin, c.stations, { vp: 3, vs: 3.5 })).toThrow(/vp > vs > 0 km\/s, got vp 3, vs 3.5/);
  });
});
