import { describe, expect, it } from 'vitest';
import {
  channelTriggers, LOCAL_EARTHQUAKE_STA_LTA, StaLtaDetector, staLtaRatio, staLtaTriggers, type StaLtaOptions,
} from '../../../core/pick/staLta';
import type { ChannelData, Segment } from '../../../core/model';
import type { StationTrigger } from '../../../core/pick/types';
import { numpy, numpyVersions } from './numpy';

const id = { network: 'XX', station: 'TST', location: '', channel: 'HHZ' };
const T0 = 1_764_633_600_000_000; // 2025-12-02T00:00:00Z
const versions = numpyVersions();

// Independent reference implementations in numpy: the classic ratio from cumulative sums, the
// recursive one as a plain Python loop, both with the seeding and median-of-three rules stated in
// core/pick/staLta.ts. One Python run computes every case (the machine is shared: few processes).
const REFERENCE = `
outputs = []
for c in range(len(inputs) // 2):
    x, (fs, ns, nl, cfk, desp, fref, seed) = inputs[2 * c], inputs[2 * c + 1]
    ns, nl, cfk, desp, seed = int(ns), int(nl), int(cfk), int(desp), int(seed)
    if cfk == 0:
        with np.errstate(over='ignore'): cf = x * x
    elif cfk == 1: cf = np.abs(x)
    else:
        d = np.diff(x, prepend=x[0]); cf = x * x + (fs / (2 * np.pi * fref)) ** 2 * d * d
    if desp:
        m = cf.copy()
        if len(cf) > 1: m[1] = min(cf[0], cf[1])
        if len(cf) > 2: m[2:] = np.median(np.stack([cf[:-2], cf[1:-1], cf[2:]]), axis=0)
        cf = m
    n = len(cf); i = np.arange(n); cs = np.concatenate([[0.0], np.cumsum(cf)])
    sta = (cs[i + 1] - cs[np.maximum(0, i + 1 - ns)]) / np.minimum(i + 1, ns)
    # LTA: plain mean while seeding; then the last nl values, the seed mean standing in for missing ones.
    mu = cs[seed] / seed
    lta = np.where(i + 1 <= seed, cs[i + 1] / (i + 1),
                   (cs[i + 1] - cs[np.maximum(0, i + 1 - nl)] + np.maximum(0, nl - (i + 1)) * mu) / nl)
    with np.errstate(all='ignore'):
        classic = np.where(lta > 0, sta / lta, 0.0)
    s = l = 0.0; rec = np.zeros(n)
    for j in range(n):
        k = j + 1
        s += (cf[j] - s) / min(k, ns)
        l += (cf[j] - l) / (k if k <= seed else nl)
        rec[j] = s / l if l > 0 else 0.0
    outputs += [classic, rec]
`;
const CF_CODE = { energy: 0, absolute: 1, envelope: 2 } as const;

type Case = { x: Float64Array; fs: number; o: StaLtaOptions };
/** Reference ratios (classic and recursive) for each case, from one Python run. */
function references(cases: readonly Case[]): { classic: Float64Array; recursive: Float64Array }[] {
  const inputs: Float64Array[] = [];
  for (const { x, fs, o } of cases) {
    const ns = Math.max(1, Math.round(o.sta * fs));
    const nl = Math.max(ns + 1, Math.round(o.lta * fs));
    const seed = Math.min(nl, Math.max(ns, Math.round(o.warmUp * fs)));
    inputs.push(x, new Float64Array([fs, ns, nl, CF_CODE[o.characteristic], o.despike ? 1 : 0, o.envelopeFrequency, seed]));
  }
  const out = numpy(REFERENCE, inputs);
  return cases.map((_, i) => ({ classic: out[2 * i], recursive: out[2 * i + 1] }));
}

// All noise records, from one Python run: numpy default_rng(seed).standard_normal, band-limited ones
// through scipy's 4th-order Butterworth band-pass (butter(..., output='sos'), causal sosfilt).
const NOISE_SPECS: Record<string, [n: number, seed: number, band: boolean]> = {
  ref: [30_000, 7, true], exact: [40_000, 11, false], hourWhite: [360_000, 1, false], hourBand: [360_000, 2, true],
  spikes: [120_000, 3, true], cut21: [1500, 21, true], cut22: [1500, 22, true], cut23: [1500, 23, true],
  cut24: [1500, 24, true], cut25: [1500, 25, true], warm: [6000, 31, true], gapA: [30_000, 41, true],
  gapB: [30_000, 42, true], openA: [3000, 51, true], openB: [3000, 52, true], chunks: [50_000, 61, true],
};
const NOISE: Record<string, Float64Array> = (() => {
  const keys = Object.keys(NOISE_SPECS);
  const script = `from scipy import signal
sos = signal.butter(4, [1, 20], 'bandpass', fs=100, output='sos')
outputs = []
for n, seed, band in ${JSON.stringify(keys.map((k) => NOISE_SPECS[k]).map(([n, seed, band]) => [n, seed, band ? 1 : 0]))}:
    x = np.random.default_rng(seed).standard_normal(n)
    outputs.append(signal.sosfilt(sos, x) if band else x)`;
  const arrays = numpy(script);
  return Object.fromEntries(keys.map((k, i) => [k, arrays[i]]));
})();
/** A fresh copy of a named noise record. */
function noise(name: keyof typeof NOISE_SPECS): Float64Array {
  return NOISE[name].slice();
}

function maxRelDiff(a: Float64Array, b: Float64Array): number {
  let m = 0;
  for (let i = 0; i < a.length; i++) m = Math.max(m, Math.abs(a[i] - b[i]) / Math.max(1e-300, Math.abs(b[i])));
  return m;
}

/** A 5 Hz wavelet (exponentially decaying sine) of amplitude amp starting at sample i0. */
function addWavelet(x: Float64Array, i0: number, fs: number, amp: number, seconds = 3): void {
  const n = Math.round(seconds * fs);
  for (let j = 0; j < n && i0 + j < x.length; j++) {
    const t = j / fs;
    x[i0 + j] += amp * Math.sin(2 * Math.PI * 5 * t) * Math.exp(-t / 1.0);
  }
}

describe('STA/LTA ratio', () => {
  const x6 = new Float64Array([1, 1, 2, 0, 3, 1]); // CF = x^2 = 1 1 4 0 9 1

  it('classic form equals the moving-window sums worked by hand (Ns = 2, Nl = 4, CF = x^2, seed of 2 samples)', () => {
    // STA (mean of the last 2): 1, 1, 2.5, 2, 4.5, 5.
    // LTA: plain mean over the 2-sample seed (1, 1); the seed mean 1 fills the two unseen slots, so
    // LTA = (1 + 1 + 1 + 4)/4 = 1.75, (1 + 1 + 4 + 0)/4 = 1.5, (1 + 4 + 0 + 9)/4 = 3.5, (4 + 0 + 9 + 1)/4 = 3.5.
    const r = staLtaRatio(x6, 1, { form: 'classic', sta: 2, lta: 4, warmUp: 2, despike: false });
    const want = [1, 1, 2.5 / 1.75, 2 / 1.5, 4.5 / 3.5, 5 / 3.5];
    want.forEach((w, i) => expect(r[i]).toBeCloseTo(w, 14));
  });

  it('classic form with a seed as long as the LTA window is the plain growing-then-moving window average (worked by hand)', () => {
    // LTA = 1, 1, 6/3 = 2, 6/4 = 1.5, 14/4 = 3.5, 14/4 = 3.5.
    const r = staLtaRatio(x6, 1, { form: 'classic', sta: 2, lta: 4, warmUp: 4, despike: false });
    const want = [1, 1, 2.5 / 2, 2 / 1.5, 4.5 / 3.5, 5 / 3.5];
    want.forEach((w, i) => expect(r[i]).toBeCloseTo(w, 14));
  });

  it('recursive form equals the Withers et al. (1998) recursion worked by hand (Ns = 2, Nl = 4, plain mean over a 2-sample seed)', () => {
    // STA_i = STA_{i-1} + (CF_i - STA_{i-1}) / min(i+1, Ns); LTA likewise with 1/(i+1) over the seed, then 1/Nl.
    // i=0: 1, 1 | i=1: 1, 1 | i=2: 1 + 3/2 = 2.5, 1 + 3/4 = 1.75 | i=3: 1.25, 1.75 - 1.75/4 = 1.3125
    // i=4: 1.25 + 7.75/2 = 5.125, 1.3125 + 7.6875/4 = 3.234375 | i=5: 3.0625, 3.234375 - 2.234375/4 = 2.67578125
    const r = staLtaRatio(x6, 1, { form: 'recursive', sta: 2, lta: 4, warmUp: 2, despike: false });
    const want = [1, 1, 2.5 / 1.75, 1.25 / 1.3125, 5.125 / 3.234375, 3.0625 / 2.67578125];
    want.forEach((w, i) => expect(r[i]).toBeCloseTo(w, 14));
  });

  it('median of three removes a single-sample spike from the CF before averaging (worked by hand)', () => {
    // x = 0.1 0.1 10 0.1 0.1: CF = .01 .01 100 .01 .01; medians of three = .01 everywhere, so the ratio is 1.
    for (const form of ['classic', 'recursive'] as const) {
      const r = staLtaRatio(new Float64Array([0.1, 0.1, 10, 0.1, 0.1]), 1, { form, sta: 2, lta: 4, warmUp: 2, despike: true });
      for (const v of r) expect(v).toBeCloseTo(1, 12);
    }
  });

  const cases: (Case & { name: string; form: 'classic' | 'recursive' })[] = [];
  const ref = noise('ref');
  addWavelet(ref, 12_000, 100, 8);
  for (const form of ['classic', 'recursive'] as const) {
    for (const characteristic of ['energy', 'absolute', 'envelope'] as const) {
      for (const despike of [false, true]) {
        cases.push({
          name: `${form} ratio with CF ${characteristic}${despike ? ' and median of three' : ''}`, form, x: ref, fs: 100,
          o: { ...LOCAL_EARTHQUAKE_STA_LTA, form, characteristic, despike, sta: 0.5, lta: 10 },
        });
      }
    }
  }
  // Longer than one 65,536-sample block, so the fused float64 loops of the recursive form run too.
  const long = noise('hourBand').subarray(0, 140_000);
  addWavelet(long, 12_000, 100, 8);
  for (const despike of [false, true]) {
    cases.push({
      name: `recursive ratio over 140,000 samples (fused loops after the first block)${despike ? ' with median of three' : ''}`,
      form: 'recursive', x: long, fs: 100, o: { ...LOCAL_EARTHQUAKE_STA_LTA, despike, sta: 0.5, lta: 10 },
    });
  }
  // Values that test how the loops take the median of three: runs of exact zeros and of equal CF
  // values (ties), and one sample whose square overflows to Infinity (a spike like any other: the
  // median of three never picks it). Before and after the first block boundary (65,536 samples).
  const edges = noise('hourBand').slice(140_000, 280_000);
  addWavelet(edges, 12_000, 100, 8);
  for (const start of [30_000, 90_000]) {
    edges.fill(0, start, start + 700);
    for (let i = start + 700; i < start + 1400; i++) edges[i] = i % 2 ? 0.5 : -0.5;
    for (let i = start + 1400; i < start + 1500; i++) edges[i] = edges[i - 3];
    edges[start + 2000] = 1e160;
  }
  for (const characteristic of ['energy', 'absolute'] as const) {
    cases.push({
      name: `recursive ratio with CF ${characteristic} and median of three over zero runs, ties and a sample whose square overflows`,
      form: 'recursive', x: edges, fs: 100, o: { ...LOCAL_EARTHQUAKE_STA_LTA, characteristic, sta: 0.5, lta: 10 },
    });
  }
  const refs = references(cases);
  cases.forEach((c, i) => {
    // Tolerance: the recursion is the same arithmetic in both; numpy's classic form subtracts cumulative
    // sums of 30,000 values, which costs it about four digits, hence 1e-10 there.
    const tol = c.form === 'classic' ? 1e-10 : 1e-12;
    it(`${c.name} matches an independent numpy implementation to ${tol} (${versions})`, () => {
      const want = refs[i][c.form];
      const got = staLtaRatio(c.x, c.fs, c.o);
      expect(got.length).toBe(want.length);
      expect(maxRelDiff(got, want)).toBeLessThan(tol);
      // The comparison covers the event: the ratio rises well above the trigger level there.
      expect(Math.max(...want.subarray(12_000, 12_200))).toBeGreaterThan(c.o.characteristic === 'energy' ? 8 : 3.5);
    });
  });

  it('classic running sums stay accurate after a loud burst followed by quiet noise (sums refreshed every Nl samples)', () => {
    const x = noise('exact');
    for (let i = 10_000; i < 12_000; i++) x[i] *= 1e6; // loud burst
    for (let i = 12_000; i < x.length; i++) x[i] *= 1e-3; // then very quiet
    const got = staLtaRatio(x, 100, { form: 'classic', despike: false, sta: 0.5, lta: 10 });
    // Once the burst has left the LTA window, the quiet noise gives a ratio near 1 (a residue of the
    // burst in the running sum would be 1e18 times the quiet sums and pull it to 0).
    let lo = Infinity;
    let hi = -Infinity;
    for (let i = 13_100; i < x.length; i++) {
      lo = Math.min(lo, got[i]);
      hi = Math.max(hi, got[i]);
    }
    expect(lo).toBeGreaterThan(0.2);
    expect(hi).toBeLessThan(5);
  });
});

describe('STA/LTA triggers', () => {
  for (const form of ['classic', 'recursive'] as const) {
    it(`${form}: no trigger in one hour of Gaussian white noise nor of 1-20 Hz band-limited noise at 100 Hz (defaults: 0.5 s / 60 s, on 4)`, () => {
      for (const name of ['hourWhite', 'hourBand'] as const) {
        const x = noise(name);
        expect(staLtaTriggers(id, x, 100, T0, { form })).toEqual([]);
      }
    });
  }

  it('single-sample spikes of 1000 times the noise RMS do not trigger; without the median of three they do', () => {
    const x = noise('spikes');
    let rms = 0;
    for (const v of x) rms += v * v;
    rms = Math.sqrt(rms / x.length);
    const spikes = [5_000, 20_000, 40_001, 77_777, 100_000];
    for (const s of spikes) x[s] = 1000 * rms * (s % 2 ? -1 : 1);
    expect(staLtaTriggers(id, x, 100, T0)).toEqual([]);
    expect(staLtaTriggers(id, x, 100, T0, { despike: false }).length).toBe(spikes.length);
  });

  it('an event cut starting 2 s before P triggers on P (LTA seeded from the leading noise; no trigger from the start)', () => {
    const fs = 100;
    for (const name of ['cut21', 'cut22', 'cut23', 'cut24', 'cut25'] as const) {
      const x = noise(name);
      addWavelet(x, 200, fs, 10);
      const trig = staLtaTriggers(id, x, fs, T0);
      expect(trig.length).toBe(1);
      expect(trig[0].on).toBeGreaterThanOrEqual(T0 + 2_000_000);
      expect(trig[0].on).toBeLessThanOrEqual(T0 + 2_500_000);
      expect(trig[0].peakRatio).toBeGreaterThan(10);
      expect(trig[0].start).toBe(trig[0].on - 10_000_000);
    }
  });

  it('no trigger is declared within the warm-up, even when the data start inside a loud signal', () => {
    const fs = 100;
    const x = noise('warm');
    addWavelet(x, 50, fs, 20); // signal 0.5 s after the start: inside the 1 s warm-up
    const trig = staLtaTriggers(id, x, fs, T0);
    for (const t of trig) expect(t.on).toBeGreaterThanOrEqual(T0 + 1_000_000);
  });

  it('a gap restarts the averages: a tenfold level change across a gap does not trigger, while the same samples taken as continuous do', () => {
    const fs = 100;
    const a = noise('gapA');
    const b = noise('gapB').map((v) => v * 10);
    const withGap = new StaLtaDetector(id, fs);
    const got = [...withGap.push(a, T0), ...withGap.push(b, T0 + 400_000_000), ...withGap.finish()];
    expect(got).toEqual([]);
    const joined = new StaLtaDetector(id, fs);
    const cont = [...joined.push(a, T0), ...joined.push(b, T0 + 300_000_000), ...joined.finish()];
    expect(cont.length).toBeGreaterThan(0);
  });

  it('a trigger open at a gap is closed at the last sample before it (endedBy gap)', () => {
    const fs = 100;
    const a = noise('openA');
    addWavelet(a, 2900, fs, 10);
    const d = new StaLtaDetector(id, fs);
    expect(d.push(a, T0)).toEqual([]);
    const closed = d.push(noise('openB'), T0 + 100_000_000);
    expect(closed.length).toBe(1);
    expect(closed[0].endedBy).toBe('gap');
    expect(closed[0].off).toBe(T0 + 29_990_000);
  });

  it('chunks of any size give exactly the one-pass ratio and triggers (state carried over), for both forms and all CFs', () => {
    const fs = 100;
    const x = noise('chunks');
    for (const at of [5_000, 18_000, 18_900, 33_000]) addWavelet(x, at, fs, 12);
    const sizes = [1, 2, 3, 7, 100, 4099, 65_536, 70_000];
    for (const form of ['classic', 'recursive'] as const) {
      for (const characteristic of ['energy', 'absolute', 'envelope'] as const) {
        const o = { form, characteristic, lta: 20 };
        const one = new StaLtaDetector(id, fs, o);
        const whole = [...one.push(x, T0), ...one.finish()];
        const wholeRatio = one.lastRatio.slice();
        expect(whole.length).toBeGreaterThanOrEqual(3);
        const d = new StaLtaDetector(id, fs, o);
        const got: StationTrigger[] = [];
        const ratio = new Float64Array(x.length);
        let pos = 0;
        let c = 0;
        while (pos < x.length) {
          const n = Math.min(sizes[c++ % sizes.length], x.length - pos);
          got.push(...d.push(x.subarray(pos, pos + n), T0 + pos * 10_000));
          ratio.set(d.lastRatio, pos);
          pos += n;
        }
        got.push(...d.finish());
        expect(got).toEqual(whole);
        expect(Array.from(ratio)).toEqual(Array.from(wholeRatio));
      }
    }
  });

  it('windows in seconds scale with the sample rate: the same signal at 100 and 200 Hz triggers at the same time (within 1 sample)', () => {
    const on: number[] = [];
    for (const fs of [100, 200]) {
      const n = 60 * fs;
      const x = new Float64Array(n);
      for (let i = 0; i < n; i++) x[i] = 0.01 * Math.sin(2 * Math.PI * 3.3 * (i / fs)) + 0.01 * Math.sin(2 * Math.PI * 7.1 * (i / fs));
      addWavelet(x, 30 * fs, fs, 1);
      const t = staLtaTriggers(id, x, fs, T0, { lta: 20 });
      expect(t.length).toBe(1);
      on.push(t[0].on);
    }
    expect(Math.abs(on[0] - on[1])).toBeLessThanOrEqual(10_000);
  });

  it('channelTriggers runs a channel\'s segments in order, a gap between them restarting the averages', () => {
    const a = noise('openA');
    addWavelet(a, 2900, 100, 10); // trigger open at the gap
    const b = noise('openB');
    addWavelet(b, 1500, 100, 10);
    const seg = (samples: Float64Array, start: number): Segment => ({
      id, sampleRate: 100, start, end: start + (samples.length - 1) * 10_000, samples,
      recordStarts: new Float64Array([start]), recordFirstSample: new Int32Array([0]), encoding: 5, recordLength: 512, quality: 'D',
      timing: { qualityMin: null, qualityMax: null, clockLockedRecords: 0, questionableTimeRecords: 0, leapSecondRecords: 0, steimMismatchRecords: 0, records: 1 },
    });
    const gapStart = T0 + 100_000_000;
    const ch: ChannelData = { id, segments: [seg(a, T0), seg(b, gapStart)], gaps: [{ start: T0 + 30_000_000, end: gapStart }], overlaps: [], duplicatesDropped: 0 };
    const got = channelTriggers(ch);
    expect(got.map((t) => t.endedBy)).toEqual(['gap', 'ratio']);
    expect(got[0].off).toBe(T0 + 29_990_000);
    expect(got[1].on).toBeGreaterThanOrEqual(gapStart + 15_000_000);
    expect(got[1].on).toBeLessThanOrEqual(gapStart + 15_500_000);
    expect(() => channelTriggers({ ...ch, segments: [seg(a, T0), { ...seg(b, gapStart), sampleRate: 50 }] })).toThrow(/share one sample rate, got 100 and 50 Hz/);
  });

  it('FLOAT32 and INT32 samples give the ratio of the same values as float64 (the fused float64 loop does the same arithmetic)', () => {
    const x64 = noise('cut21').map((v) => Math.round(v * 1000));
    for (const form of ['classic', 'recursive'] as const) {
      const want = staLtaRatio(x64, 100, { form, lta: 5 });
      expect(Array.from(staLtaRatio(Float32Array.from(x64), 100, { form, lta: 5 }))).toEqual(Array.from(want));
      expect(Array.from(staLtaRatio(Int32Array.from(x64), 100, { form, lta: 5 }))).toEqual(Array.from(want));
    }
  });

  it('a dead channel (all zeros) gives ratio 0 and no trigger', () => {
    const x = new Float64Array(10_000);
    expect(Math.max(...staLtaRatio(x, 100))).toBe(0);
    expect(staLtaTriggers(id, x, 100, T0)).toEqual([]);
  });

  it('rejects bad options with a RangeError that names the value and the allowed range', () => {
    expect(() => staLtaRatio(new Float64Array(10), 100, { sta: 0 })).toThrow(/sta \(s\) must be a finite number > 0, got 0/);
    expect(() => staLtaRatio(new Float64Array(10), 100, { sta: 5, lta: 2 })).toThrow(/lta \(s\) must be longer than sta \(5 s\), got 2/);
    expect(() => staLtaRatio(new Float64Array(10), 100, { triggerOn: 2, triggerOff: 3 })).toThrow(/triggerOff must be at most triggerOn \(2\), got 3/);
    expect(() => staLtaRatio(new Float64Array(10), -1)).toThrow(RangeError);
    expect(() => staLtaRatio(new Float64Array(10), 100, { characteristic: 'cube' as never })).toThrow(/characteristic must be one of energy, absolute, envelope/);
    expect(() => new StaLtaDetector(id, 100).push(new Float64Array(3), 0.5)).toThrow(/integer microseconds/);
  });
});
