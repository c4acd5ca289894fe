import { describe, expect, it } from 'vitest';
import { butterworth } from '../../../core/dsp';
import { staLtaTriggers, type StationTrigger } from '../../../core/pick';
import { TriggerStream } from '../../../core/scan/triggerStream';
import { Rng } from '../../../core/synth/random';
import { python } from '../synth/python';

// Reference for the filtering: scipy.signal.sosfilt with zi = sosfilt_zi(sos) * x[0] (the machine's
// python3; scipy's documented way to start a filter in steady state), then core/pick's one-pass
// staLtaTriggers (itself checked against numpy in test/core/pick/staLta.test.ts).

const id = { network: 'XX', station: 'TST', location: '00', channel: 'HHZ' };
const T0 = 1_772_409_600_000_000; // 2026-03-02T00:00:00Z
const FS = 100;
const SOS = butterworth(4, [2, 15], 'bandpass', FS);

/** Noise with a DC offset and three wave packets (onsets at 70 s, 150.3 s, 230.77 s). */
function night(n: number, seed: number): Float64Array {
  const rng = new Rng(seed);
  const x = new Float64Array(n);
  for (let i = 0; i < n; i++) x[i] = 5000 + 20 * rng.normal();
  for (const [t, a] of [[70, 400], [150.3, 150], [230.77, 900]]) {
    const i0 = Math.round(t * FS);
    for (let i = i0; i < Math.min(n, i0 + 6 * FS); i++) {
      const s = (i - i0) / FS;
      x[i] += a * Math.exp(-s / 1.2) * Math.sin(2 * Math.PI * 6 * s);
    }
  }
  return x;
}

function scipyFiltered(x: Float64Array): Float64Array {
  const y = python<number[]>('x = np.array(inp["x"]); sos = np.array(inp["sos"]).reshape(-1, 6)\n'
    + 'zi = scipy.signal.sosfilt_zi(sos) * x[0]\nprint(json.dumps(scipy.signal.sosfilt(sos, x, zi=zi)[0].tolist()))', { x, sos: SOS });
  return Float64Array.from(y);
}

function pushInPieces(x: Float64Array, cuts: number[]): StationTrigger[] {
  const ts = new TriggerStream(id, FS, SOS, {});
  const out: StationTrigger[] = [];
  let a = 0;
  for (const b of [...cuts, x.length]) {
    out.push(...ts.push(x.subarray(a, b), T0 + Math.round((a * 1e6) / FS)));
    a = b;
  }
  return [...out, ...ts.finish()];
}

describe('TriggerStream', () => {
  const x = night(300 * FS, 7);

  it('gives the triggers of scipy sosfilt (steady-state start) followed by one STA/LTA pass', () => {
    const ref = staLtaTriggers(id, scipyFiltered(x), FS, T0, {});
    // One trigger per packet, within 0.2 s after its onset.
    expect(ref).toHaveLength(3);
    [70, 150.3, 230.77].forEach((onset, i) => {
      const late = (ref[i].on - T0) / 1e6 - onset;
      expect(late).toBeGreaterThanOrEqual(0);
      expect(late).toBeLessThan(0.2);
    });
    const got = pushInPieces(x, []);
    expect(got.map((t) => [t.on, t.off, t.endedBy])).toEqual(ref.map((t) => [t.on, t.off, t.endedBy]));
    got.forEach((t, i) => expect(Math.abs(t.peakRatio - ref[i].peakRatio)).toBeLessThan(1e-9 * ref[i].peakRatio));
  });

  it('gives bit for bit the same triggers whatever the cut into pieces (one sample, odd lengths, inside a trigger)', () => {
    const whole = pushInPieces(x, []);
    const rng = new Rng(3);
    const cuts: number[] = [1, 2, 7001, 7030];
    for (let c = 8000; c < x.length - 10; c += 1 + Math.floor(rng.uniform(0, 3000))) cuts.push(c);
    expect(pushInPieces(x, cuts)).toEqual(whole);
  });

  it('restarts the filter and the averages after a gap: a step in the offset across the gap does not trigger', () => {
    const rng = new Rng(5);
    const a = new Float64Array(100 * FS);
    for (let i = 0; i < a.length; i++) a[i] = 20 * rng.normal();
    const b = new Float64Array(100 * FS);
    for (let i = 0; i < b.length; i++) b[i] = 80_000 + 20 * rng.normal(); // after a 30 s gap, a new offset
    const ts = new TriggerStream(id, FS, SOS, {});
    const trig = [...ts.push(a, T0), ...ts.push(b, T0 + 130_000_000), ...ts.finish()];
    expect(trig).toEqual([]);
    // Without the restart (the same samples given as continuous) the step rings through the band-pass and triggers.
    const joined = new Float64Array(a.length + b.length);
    joined.set(a);
    joined.set(b, a.length);
    expect(pushInPieces(joined, [a.length]).length).toBeGreaterThan(0);
  });

  it('refuses a non-integer start time and a sample rate that is not positive, naming the value', () => {
    const ts = new TriggerStream(id, FS, SOS, {});
    expect(() => ts.push(new Float64Array(10), 1.5)).toThrow(/start must be integer microseconds, got 1.5/);
    expect(() => new TriggerStream(id, 0, SOS, {})).toThrow(/sampleRate \(Hz\) must be > 0, got 0/);
  });
});
