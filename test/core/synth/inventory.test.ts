import { describe, expect, it } from 'vitest';
import { parseStationXml, writeStationXml } from '../../../core/stationxml';
import { demoScenario } from '../../../core/synth/demo';
import { scenarioInventory } from '../../../core/synth/inventory';
import { python } from './python';

describe('scenarioInventory', () => {
  const sc = demoScenario();
  const inv = parseStationXml(writeStationXml(scenarioInventory(sc)), 'demo.xml');
  const channels = inv.networks[0].stations.flatMap((s) => s.channels);

  it('describes every scenario channel with its orientation and sample rate, and survives a StationXML write and read', () => {
    expect(channels).toHaveLength(sc.stations.reduce((n, s) => n + s.channels.length, 0));
    for (const st of sc.stations) {
      for (const c of st.channels) {
        const m = channels.find((x) => x.id.station === st.code && x.id.location === c.location && x.id.channel === c.code)!;
        expect(m.azimuth).toBe(c.azimuth);
        expect(m.dip).toBe(c.dip);
        expect(m.sampleRate).toBe(c.sampleRate);
        expect(m.latitude).toBe(st.latitude);
        expect(m.elevation).toBe(st.elevationM);
      }
    }
  });

  it('gives each channel an overall sensitivity equal to the product of its stage gains (StationXML 1.2 InstrumentSensitivity; SEED manual v2.4 blockette 58, stage 0)', () => {
    for (const c of channels) {
      const product = c.stages.reduce((p, s) => p * (s.gain?.value ?? 1), 1);
      expect(c.sensitivity!.value).toBeCloseTo(product, 6);
      expect(c.stages.every((s) => s.gain?.frequency === c.sensitivity!.frequency)).toBe(true);
    }
  });

  it('normalizes each sensor stage: |A0 · H(i 2π fn)| = 1 at the normalization frequency, by scipy.signal.freqs_zpk', () => {
    const pz = channels.map((c) => c.stages[0].filter).filter((f) => f?.kind === 'polesZeros');
    const mags = python<number[]>(`
out = []
for f in inp:
    z = [complex(a['re'], a['im']) for a in f['zeros']]; p = [complex(a['re'], a['im']) for a in f['poles']]
    w, h = scipy.signal.freqs_zpk(z, p, f['normalizationFactor'], worN=[2*np.pi*f['normalizationFrequency']])
    out.append(float(abs(h[0])))
print(json.dumps(out))`, pz);
    expect(mags.length).toBe(channels.length);
    for (const m of mags) expect(m).toBeCloseTo(1, 9);
  });

  it('uses ground-motion input units the magnitude code can convert: m/s for seismometers, m/s**2 for the accelerometer', () => {
    const units = new Set(channels.map((c) => `${c.id.channel.slice(0, 2)} ${c.sensitivity!.inputUnits}`));
    expect([...units].sort()).toEqual(['BH m/s', 'EH m/s', 'HH m/s', 'HN m/s**2']);
  });
});
