import { describe, expect, it } from 'vitest';
import { maedaAic } from '../../../core/pick/aic';
import { stepBack } from '../../../core/pick/departure';
import { numpy, numpyVersions } from './numpy';

const versions = numpyVersions();

// Test records from numpy's default_rng at 100 Hz: two channels of unit noise and, from sample 600,
// an emergent 6 Hz onset whose amplitude grows tenfold every 0.15 s up to 300 times the noise (about
// 0.37 s of rise), then decays.
const [north, east] = numpy(`
rng = np.random.default_rng(11)
n = 1200; fs = 100.0
t = (np.arange(n) - 600) / fs
grow = np.where(t >= 0, np.minimum(10 ** (t / 0.15), 300.0) * np.exp(-np.maximum(t - 0.37, 0) / 0.4), 0.0)
north = rng.standard_normal(n) + grow * np.sin(2 * np.pi * 6 * t)
east = rng.standard_normal(n) + 0.7 * grow * np.cos(2 * np.pi * 6 * t)
outputs = [north, east]
`);

// The rule of core/pick/departure.ts written again in numpy: energy less each channel's noise mean,
// centred moving average by np.convolve, noise level the mean over the noise window, step back while
// the previous sample's envelope is above level times it.
function numpyStepBack(k: number, fs: number, o: { noise: number; maxBack: number; smooth: number; level: number }): number {
  const [j] = numpy(`
x = inputs[0]; y = inputs[1]
k, fs, noise, max_back, smooth, level = ${k}, ${fs}, ${o.noise}, ${o.maxBack}, ${o.smooth}, ${o.level}
r = lambda v: int(np.floor(v + 0.5))  # round half up, as Math.round
back = max(1, r(max_back * fs)); half = max(0, r((smooth * fs - 1) / 2))
ne = k - back - half; ns = ne - max(2, r(noise * fs))
e = (x - x[ns:ne].mean()) ** 2 + (y - y[ns:ne].mean()) ** 2
env = np.convolve(e, np.ones(2 * half + 1) / (2 * half + 1), mode='same')
thr = level * env[ns:ne].mean()
j = k
if env[k] > thr:
    while j > k - back and env[j - 1] > thr:
        j -= 1
outputs = [np.array([j], dtype=float)]
`, [north, east]);
  return j[0];
}

describe(`stepBack (reference: numpy ${versions})`, () => {
  const k = 450 + maedaAic(north, 450, 750).k;

  it('finds the AIC pick of the emergent onset late, inside the rise (the case the step is for)', () => {
    expect(k).toBeGreaterThan(605);
    expect(k).toBeLessThan(640);
  });

  it('steps back to where the centred envelope of both channels first exceeds level times the noise envelope, as numpy computes it, to the sample', () => {
    for (const o of [
      { noise: 1, maxBack: 0.2, smooth: 0.2, level: 3 },
      { noise: 2, maxBack: 0.3, smooth: 0.05, level: 10 },
      { noise: 0.5, maxBack: 0.1, smooth: 0.1, level: 1.5 },
    ]) {
      expect(stepBack([north, east], k, 100, o)).toBe(numpyStepBack(k, 100, o));
    }
  });

  it('moves that pick earlier, to within half a smoothing window of the onset at sample 600, and never by more than maxBack', () => {
    const o = { noise: 1, maxBack: 0.2, smooth: 0.2, level: 3 };
    const j = stepBack([north, east], k, 100, o);
    expect(j).toBeLessThan(k);
    expect(j).toBeGreaterThanOrEqual(600 - 10);
    expect(j).toBeLessThanOrEqual(605);
    expect(stepBack([north, east], k, 100, { ...o, maxBack: 0.05 })).toBe(k - 5);
  });

  it('keeps the pick where the envelope there is within the noise level, or where the noise window would begin before the data', () => {
    const o = { noise: 1, maxBack: 0.2, smooth: 0.1, level: 3 };
    expect(stepBack([north, east], 400, 100, o)).toBe(400);
    expect(stepBack([north, east], 620, 100, { ...o, noise: 6 })).toBe(620);
  });

  it('rejects no channels, a pick outside the data and options out of range, naming them', () => {
    const o = { noise: 1, maxBack: 0.2, smooth: 0.1, level: 3 };
    expect(() => stepBack([], 10, 100, o)).toThrow(/at least one channel/);
    expect(() => stepBack([north], 5000, 100, o)).toThrow(/pick index .* got 5000/);
    expect(() => stepBack([north], 600, 100, { ...o, level: 1 })).toThrow(/level .* got 1/);
    expect(() => stepBack([north], 600, 100, { ...o, smooth: 0 })).toThrow(/smooth .* got 0/);
    expect(() => stepBack([north], 600, 0, o)).toThrow(/sample rate .* got 0/);
  });
});
