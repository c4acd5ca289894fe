/**
 * One channel's triggering over a night given in time chunks: causal filtering with the filter state
 * carried from chunk to chunk, then the STA/LTA detector of core/pick (which carries its own state).
 * Fed the same samples in any cut, it gives bit for bit the triggers of one pass over the whole night,
 * so the chunk length only bounds memory.
 *
 * A piece that does not continue the previous one within half a sample period (a gap, or a jump back)
 * restarts the filter from its steady state for the piece's first sample (no ringing from a step), and
 * the detector restarts its averages with a fresh warm-up (it sees the same discontinuity).
 */
import type { ChannelId, SampleArray } from '../model';
import type { Micros } from '../time';
import { sectionCount, sosfilt, sosfiltZi } from '../dsp/sosfilt';
import { StaLtaDetector, type StaLtaOptions, type StationTrigger } from '../pick';

export class TriggerStream {
  readonly id: ChannelId;
  readonly sampleRate: number;
  private readonly sos: Float64Array;
  private readonly zi: Float64Array;
  private readonly state: Float64Array;
  private readonly detector: StaLtaDetector;
  private readonly halfPeriod: number;
  private expectedNext: Micros | null = null;
  private scratch = new Float64Array(0);
  /** Samples taken in so far. */
  samples = 0;

  /** `sos`: second-order sections designed for `sampleRate` (Hz); STA/LTA options as core/pick's. */
  constructor(id: ChannelId, sampleRate: number, sos: Float64Array, staLta: Partial<StaLtaOptions>) {
    if (!(sampleRate > 0 && Number.isFinite(sampleRate))) throw new RangeError(`sampleRate (Hz) must be > 0, got ${sampleRate}`);
    const n = sectionCount(sos);
    this.id = id;
    this.sampleRate = sampleRate;
    this.sos = sos;
    this.zi = sosfiltZi(sos);
    this.state = new Float64Array(2 * n);
    this.detector = new StaLtaDetector(id, sampleRate, staLta);
    this.halfPeriod = 5e5 / sampleRate;
  }

  /** Feeds contiguous samples whose first is at `start` (µs); returns the triggers that closed. */
  push(samples: SampleArray, start: Micros): StationTrigger[] {
    if (!Number.isSafeInteger(start)) throw new RangeError(`start must be integer microseconds, got ${start}`);
    const n = samples.length;
    if (n === 0) return [];
    if (this.expectedNext === null || Math.abs(start - this.expectedNext) > this.halfPeriod) {
      const x0 = samples[0];
      for (let i = 0; i < this.state.length; i++) this.state[i] = this.zi[i] * x0;
    }
    if (this.scratch.length < n) this.scratch = new Float64Array(Math.max(n, this.scratch.length * 2));
    const y = sosfilt(this.sos, samples, { state: this.state, out: this.scratch.subarray(0, n) });
    const done = this.detector.push(y, start);
    this.expectedNext = start + Math.round((n * 1e6) / this.sampleRate);
    this.samples += n;
    return done;
  }

  /** Ends the data: a trigger still open closes at the last sample. */
  finish(): StationTrigger[] {
    return this.detector.finish();
  }
}
