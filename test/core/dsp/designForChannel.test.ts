import { describe, expect, it } from 'vitest';
import { butterworth } from '../../../core/dsp/butterworth';
import { designForChannel } from '../../../core/dsp/designForChannel';
import { scipyReference } from '../../ref/scipy/dspReference';
import { relDiff } from './signals';

// Reference for the designs: scipy.signal.butter(..., fs=..., output='sos') (scipy 1.17.1) with the
// corners the clamp is documented to use (0.9 of the Nyquist frequency by default).
const ref = scipyReference([
  { op: 'butter', order: 4, corners: [1, 18], kind: 'bandpass', fs: 40 },
  { op: 'butter', order: 4, corners: [1, 45], kind: 'bandpass', fs: 100 },
  { op: 'butter', order: 3, corners: 36, kind: 'lowpass', fs: 80 },
]) as number[][];

describe('designForChannel', () => {
  it('clamps a 1-45 Hz band-pass to 1-18 Hz on a 40 Hz channel and says so; leaves the 100 Hz channel alone', () => {
    const request = { kind: 'bandpass', order: 4, corners: [1, 45] } as const;
    const at40 = designForChannel(request, 40);
    expect(at40.clamped).toBe(true);
    expect(at40.corners).toEqual([1, 18]);
    expect(at40.note).toMatch(/45 Hz .*Nyquist frequency 20 Hz of a 40 Hz channel; used 1-18 Hz/);
    expect(relDiff(at40.sos, ref[0])).toBeLessThan(1e-12);
    const at100 = designForChannel(request, 100);
    expect(at100.clamped).toBe(false);
    expect(at100.note).toBeNull();
    expect(relDiff(at100.sos, ref[1])).toBeLessThan(1e-12);
    expect(Array.from(designForChannel(request, 200).sos)).toEqual(Array.from(butterworth(4, [1, 45], 'bandpass', 200)));
  });

  it('clamps a low-pass at or above Nyquist to the given fraction of it', () => {
    const d = designForChannel({ kind: 'lowpass', order: 3, corners: 40 }, 80);
    expect(d.corners).toBe(36);
    expect(d.clamped).toBe(true);
    expect(relDiff(d.sos, ref[2])).toBeLessThan(1e-12);
    expect(designForChannel({ kind: 'lowpass', order: 3, corners: 40 }, 80, 0.5).corners).toBe(20);
  });

  it('refuses what cannot be clamped: a high-pass at or above Nyquist, a band whose low corner is above the limit', () => {
    expect(() => designForChannel({ kind: 'highpass', order: 2, corners: 25 }, 40)).toThrow(/high-pass corner 25 Hz .*allowed 0 < f < 20 Hz/);
    expect(() => designForChannel({ kind: 'bandpass', order: 2, corners: [19, 30] }, 40)).toThrow(/low corner must be below 18 Hz/);
    expect(() => designForChannel({ kind: 'lowpass', order: 2, corners: 5 }, 40, 1)).toThrow(/above 0 and below 1, got 1/);
    expect(() => designForChannel({ kind: 'lowpass', order: 9, corners: 5 }, 40)).toThrow(/1 to 8, got 9/);
  });
});
