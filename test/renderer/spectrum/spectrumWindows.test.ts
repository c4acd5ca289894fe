import { describe, expect, it } from 'vitest';
import {
  NOISE_GAP_MICROS, SPECTRUM_WINDOW, amplitudeUnits, channelSpectra, passBand, peakFrequency, runInSpan, spectrumSpans, type SamplePiece,
} from '../../../renderer/spectrum/spectrumWindows';
import { relDiff, testSignal } from '../../core/dsp/signals';
import { numpySpanSpectra } from '../../ref/scipy/spectrumPanelReference';

// Reference: numpy 2.4 and scipy 1.17.1 in python3 (test/ref/scipy/spectrum_panel_reference.py): numpy
// picks the samples of a span by their times (start + round(i·1e6/rate) µs, kept where start <= t < end,
// the piece with most samples there), and gives the spectrum the panel draws as
//   c·|numpy.fft.rfft((x − mean(x))·w, n=N)| / Σw,  w = scipy.signal.get_window('hann', len(x)) (periodic),
// N the next power of two >= len(x), c = 2 except 1 at 0 Hz and N/2; and the frequency of its largest
// amplitude above 0 Hz (numpy.argmax). Only the inputs below are made up here.

const T0 = 1_772_409_600_000_000; // 2026-03-02T00:00:00Z, µs
/** A 100 Hz channel in two pieces with a 3.2 s gap: 0-60 s and 63.2-120 s after T0 (float32 as the data workers send them). */
const pieces: SamplePiece[] = [
  { start: T0, sampleRate: 100, samples: Float32Array.from(testSignal(6000, 7, 1200)) },
  { start: T0 + 63_200_000, sampleRate: 100, samples: Float32Array.from(testSignal(5680, 9, -300)) },
];
/** A 40 Hz channel, one piece starting 13 µs after a whole second. */
const piece40: SamplePiece[] = [{ start: T0 + 13, sampleRate: 40, samples: Float32Array.from(testSignal(3000, 3, 50)) }];

const signalSpan: [number, number] = [T0 + 70_000_000, T0 + 100_000_000];
const spans = spectrumSpans(signalSpan, T0 + 75_250_000);
const across: [number, number] = [T0 + 50_000_000, T0 + 70_000_000];
const cases = [
  { pieces, span: spans.signal },
  { pieces, span: spans.noise },
  { pieces, span: across },
  { pieces: piece40, span: [T0 + 10_000_000, T0 + 33_330_000] as [number, number] },
  { pieces, span: [T0 + 60_500_000, T0 + 63_000_000] as [number, number] },
];
const ref = numpySpanSpectra(cases);

describe('spectrumWindows', () => {
  it('spectrumSpans gives a noise span as long as the signal span, ending 0.5 s before the first pick', () => {
    expect(spans.signal).toEqual(signalSpan);
    expect(spans.noise).toEqual([T0 + 44_750_000, T0 + 74_750_000]);
    expect(NOISE_GAP_MICROS).toBe(500_000);
    expect(spans.noiseBefore).toBe('first pick');
  });

  it('spectrumSpans puts the noise span just before the signal span when there is no pick', () => {
    expect(spectrumSpans([T0 + 10_000_000, T0 + 25_000_000], null)).toEqual({ signal: [T0 + 10_000_000, T0 + 25_000_000], noise: [T0 - 5_000_000, T0 + 10_000_000], noiseBefore: 'span' });
  });

  it('spectrumSpans refuses an empty or reversed span and a non-finite pick, naming them', () => {
    expect(() => spectrumSpans([T0, T0], null)).toThrow(RangeError);
    expect(() => spectrumSpans([T0 + 5, T0], null)).toThrow(/\[1772409600000005, 1772409600000000\]/);
    expect(() => spectrumSpans([T0, T0 + 1e6], Number.NaN)).toThrow(/firstPick .* got NaN/);
  });

  it('runInSpan takes the samples numpy selects by time (start <= t < end) from the piece with most of them', () => {
    cases.forEach((c, i) => {
      const run = runInSpan(c.pieces, c.span);
      const r = ref[i];
      if (!r) { expect(run, `case ${i}`).toBeNull(); return; }
      expect(run, `case ${i}`).not.toBeNull();
      expect(run!.samples.length, `case ${i}`).toBe(r.n);
      expect(run!.start, `case ${i}`).toBe(r.start);
    });
    // The span across the gap: 10 s before it against 6.8 s after it, so the first piece's 1000 samples.
    expect(ref[2]!.n).toBe(1000);
    // A span inside the gap has no run (numpy finds none either).
    expect(ref[4]).toBeNull();
    expect(runInSpan(pieces, cases[4].span)).toBeNull();
  });

  it('channelSpectra draws numpy.fft.rfft of the demeaned, Hann-windowed, zero-padded samples (scaled 2/Σw) to 1e-12 of the peak', () => {
    expect(SPECTRUM_WINDOW).toBe('hann');
    const cs = channelSpectra('XX.T00.00.HHZ', pieces, spans);
    for (const [got, r] of [[cs.signal, ref[0]], [cs.noise, ref[1]]] as const) {
      expect(got).not.toBeNull();
      expect(got!.count).toBe(r!.n);
      expect(got!.fftLength).toBe(r!.N);
      expect(relDiff(got!.frequencies, r!.frequencies)).toBeLessThan(1e-15);
      expect(relDiff(got!.amplitudes, r!.amplitudes)).toBeLessThan(1e-12);
    }
    expect(cs.signalSeconds).toBe(30);
    // The noise span (44.75-74.75 s) crosses the gap (60-63.2 s): its longest run is 44.75-60 s.
    expect(cs.noiseSeconds).toBe(15.25);
    expect(ref[1]!.n).toBe(1525);
    expect(cs.sampleRate).toBe(100);
    const c40 = channelSpectra('XX.T02.00.HHZ', piece40, { signal: cases[3].span, noise: cases[3].span, noiseBefore: 'span' });
    expect(c40.signal!.fftLength).toBe(ref[3]!.N);
    expect(relDiff(c40.signal!.amplitudes, ref[3]!.amplitudes)).toBeLessThan(1e-12);
  });

  it('channelSpectra reports a noise run cut short by a gap, and none where the span holds no data', () => {
    const cs = channelSpectra('XX.T00.00.HHZ', pieces, { signal: spans.signal, noise: cases[2].span, noiseBefore: 'first pick' });
    expect(cs.noiseSeconds).toBe(10);
    expect(relDiff(cs.noise!.amplitudes, ref[2]!.amplitudes)).toBeLessThan(1e-12);
    const none = channelSpectra('XX.T00.00.HHZ', pieces, { signal: cases[4].span, noise: cases[4].span, noiseBefore: 'span' });
    expect(none.signal).toBeNull();
    expect(none.noise).toBeNull();
    expect(none.signalSeconds).toBe(0);
  });

  it('peakFrequency is the frequency of the largest amplitude above 0 Hz, as numpy.argmax finds it', () => {
    const cs = channelSpectra('XX.T00.00.HHZ', pieces, spans);
    expect(peakFrequency(cs.signal!)).toBe(ref[0]!.peak);
    expect(peakFrequency(cs.noise!)).toBe(ref[1]!.peak);
    // testSignal's sinusoid of amplitude 100 at 0.37 rad/sample, 0.37·100/(2π) = 5.889 Hz at 100 Hz, reads
    // 100 on a bin and at worst 1.42 dB less between bins (the Hann window's scalloping loss: Harris 1978,
    // Proc. IEEE 66, 51, table 1), i.e. 84.9.
    const s = cs.signal!;
    let near = 0;
    for (let k = 0; k < s.frequencies.length; k++) if (Math.abs(s.frequencies[k] - 5.889) < 0.1) near = Math.max(near, s.amplitudes[k]);
    expect(near).toBeGreaterThan(84.9 * 0.98);
    expect(near).toBeLessThan(100 * 1.05);
    expect(peakFrequency({ frequencies: Float64Array.of(0, 1, 2, 3), amplitudes: Float64Array.of(9, 1, 5, 7) }, 2.5)).toBe(3);
    expect(peakFrequency({ frequencies: Float64Array.of(0, 1), amplitudes: Float64Array.of(9, 1) }, 2)).toBeNaN();
  });

  it('passBand gives the band a filter lets through, up to the Nyquist frequency', () => {
    expect(passBand(null, 100)).toBeNull();
    expect(passBand({ kind: 'bandpass', order: 4, corners: [1, 20] }, 100)).toEqual([1, 20]);
    expect(passBand({ kind: 'bandpass', order: 4, corners: [5, 40] }, 40)).toEqual([5, 20]);
    expect(passBand({ kind: 'highpass', order: 4, corners: 1 }, 100)).toEqual([1, 50]);
    expect(passBand({ kind: 'lowpass', order: 2, corners: 8 }, 100)).toEqual([0, 8]);
  });

  it('amplitudeUnits names counts from StationXML\u2019s count or COUNTS, and says when the units are not given or differ', () => {
    expect(amplitudeUnits(['count', 'COUNTS', 'counts'])).toEqual({ long: 'counts', short: 'counts' });
    expect(amplitudeUnits(['m/s', 'm/s'])).toEqual({ long: 'm/s', short: 'm/s' });
    expect(amplitudeUnits([null, null])).toEqual({ long: 'the units recorded (the StationXML gives none)', short: 'recorded units' });
    expect(amplitudeUnits(['count', null])).toEqual({ long: 'the units recorded (counts)', short: 'recorded units' });
    expect(amplitudeUnits(['count', 'm/s'])).toEqual({ long: 'the units recorded (counts, m/s)', short: 'recorded units' });
  });
});
