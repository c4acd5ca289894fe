import { describe, expect, it } from 'vitest';
import { butterworth } from '../../../core/dsp/butterworth';
import { filterSegments } from '../../../core/dsp/filterSegments';
import { sosfilt, sosfiltZi } from '../../../core/dsp/sosfilt';
import { scipyReference } from '../../ref/scipy/dspReference';
import { relDiff, testSignal } from './signals';

// Reference: scipy.signal.sosfilt(sos, seg, zi=sosfilt_zi(sos)·seg[0]) and sosfiltfilt(sos, seg,
// padlen=min(default, len − 1)) per segment (scipy 1.17.1) in python3.

const RATE = 100;
const sos = butterworth(4, [1, 20], 'bandpass', RATE);
// A channel with a large offset (counts), cut by two gaps into three segments; the last one is short.
const whole = testSignal(6000, 21, 80_000);
const segments = [whole.subarray(0, 2500), whole.subarray(3100, 5980), whole.subarray(5985, 6000)];
const zi = sosfiltZi(sos);

const ref = scipyReference([
  ...segments.map((seg) => ({ op: 'sosfilt', sos, x: seg, zi: zi.map((v) => v * seg[0]) })),
  ...segments.map((seg) => ({ op: 'sosfiltfilt', sos, x: seg, padlen: Math.min(27, seg.length - 1) })),
]);
const refCausal = ref.slice(0, 3) as { y: number[] }[];
const refZero = ref.slice(3) as number[][];

describe('filterSegments', () => {
  it('filters each segment causally from its own steady state, as scipy sosfilt with zi = sosfilt_zi·x[0], to 1e-10', () => {
    const out = filterSegments(sos, segments);
    expect(out.length).toBe(3);
    out.forEach((y, i) => expect(relDiff(y, refCausal[i].y), `segment ${i}`).toBeLessThan(1e-10));
  });

  it('zero phase: scipy sosfiltfilt per segment, the padding shortened for a segment shorter than it', () => {
    const out = filterSegments(sos, segments, { zeroPhase: true });
    out.forEach((y, i) => expect(relDiff(y, refZero[i]), `segment ${i}`).toBeLessThan(1e-10));
  });

  it('does not ring at a gap: output stays within the signal\'s own filtered level, where a zero-filled gap rings far above it', () => {
    const out = filterSegments(sos, segments);
    const peak = (a: ArrayLike<number>, from = 0, to = a.length) => {
      let m = 0;
      for (let i = from; i < to; i++) m = Math.max(m, Math.abs(a[i]));
      return m;
    };
    // The level the band-passed signal reaches well inside the first segment, away from its start.
    const level = peak(out[0], 500, 2500);
    expect(peak(out[1])).toBeLessThan(2 * level);
    const zeroFilled = Float64Array.from(whole);
    zeroFilled.fill(0, 2500, 3100);
    zeroFilled.fill(0, 5980, 5985);
    const rung = sosfilt(sos, zeroFilled, { state: zi.map((v) => v * whole[0]) });
    expect(peak(rung, 3100, 3400)).toBeGreaterThan(20 * level);
  });

  it('with a taper, removes each segment\'s mean and tapers its ends before filtering', () => {
    const [y] = filterSegments(sos, [segments[0]], { taperFraction: 0.05 });
    expect(Math.abs(y[0])).toBeLessThan(1e-9);
    expect(() => filterSegments(sos, segments, { taperFraction: 0.7 })).toThrow(/from 0 to 0.5, got 0.7/);
  });

  it('returns an empty array for an empty segment and refuses segments that are not sample arrays', () => {
    expect(filterSegments(sos, [new Float64Array(0)])[0].length).toBe(0);
    expect(() => filterSegments(sos, [[1, 2] as unknown as Float64Array])).toThrow(/segment 0 must be a Float64Array/);
  });
});
