/**
 * STA/LTA: the ratio of a short-term average (STA) to a long-term average (LTA) of a characteristic
 * function (characteristic.ts), and the per-channel triggers it sets.
 *
 * Forms (window lengths Ns = round(sta * fs), Nl = round(lta * fs) samples, at least 1):
 * - `classic`: moving windows ending at the current sample, both trailing:
 *     STA[i] = (1/Ns) sum_{j=i-Ns+1..i} CF[j],  LTA[i] = (1/Nl) sum_{j=i-Nl+1..i} CF[j],
 *   kept as running sums over a ring buffer of the last Nl CF values; the sums are recomputed exactly
 *   from the ring every Nl samples so rounding cannot build up (a loud event followed by quiet noise
 *   would otherwise leave a residue larger than the quiet sums).
 * - `recursive`: Withers et al. (1998, "A comparison of select trigger algorithms for automated global
 *   seismic phase and event detection", BSSA 88(1), 95-106), exponentially weighted averages
 *     STA[i] = STA[i-1] + (CF[i] - STA[i-1]) / Ns,  LTA[i] = LTA[i-1] + (CF[i] - LTA[i-1]) / Nl
 *   (the recursion as we remember it from that paper).
 * ratio[i] = STA[i] / LTA[i], or 0 where LTA[i] is 0 (a dead channel never triggers).
 *
 * Warm-up (Daybreak's design, so event cuts that start 2 s before the first P still work): after the
 * data's start and after every gap the LTA is seeded from the leading data: over the first S samples,
 * S = max(warmUp, STA window) seconds (at most the LTA window), both averages are plain means of all
 * CF values so far (a growing window); from then on the seed mean stands in for the LTA's missing
 * history - in the classic form the ring's unfilled slots hold it, in the recursive form the average
 * simply continues with coefficient 1/Nl. So the LTA neither starts from zero (which makes the ratio
 * huge) nor waits a whole LTA window (which blinds it), and an arrival 2 s into the record is not
 * swallowed by an LTA that would still be averaging over 2 s only. No trigger is declared before
 * max(S, warmUp) has passed. With the defaults (1 s warm-up, 0.5 s STA) a trigger can come from a P
 * 1 s or more after a record's start.
 *
 * Spikes (Daybreak's design): with `despike` the CF is replaced by the median of its last three values
 * before averaging (after a restart the first value stays, the second becomes the smaller of the first
 * two). A single-sample spike is never the median of three, so it never reaches the averages; a real
 * arrival lasts many samples, and loses at most one sample of delay.
 *
 * Defaults for local earthquakes (`LOCAL_EARTHQUAKE_STA_LTA`) follow Trnkoczy, "Understanding and
 * parameter setting of STA/LTA trigger algorithm", IASPEI New Manual of Seismological Observatory
 * Practice (NMSOP-2), Information Sheet IS 8.1. Numbers from memory of that sheet (we could not check
 * the text here): STA 0.3-0.5 s for local events (0.5 s taken); LTA 60 s as the common starting value;
 * trigger-on ratio 4 for an average quiet site; trigger-off ratio 2 (the sheet puts it well below the
 * on level, about 2-3 for local events). Pre- and post-event times of 10 s and 20 s are common practice
 * for local event cuts (orders of magnitude from memory, not from the sheet).
 *
 * Continuous data may be fed in chunks ({@link StaLtaDetector.push}); the state carries over, so the
 * ratio and the triggers are bit-for-bit those of one pass over the joined data.
 */
import type { ChannelData, ChannelId, SampleArray } from '../model';
import type { Micros } from '../time';
import { type CharacteristicFunction, CHARACTERISTIC_FUNCTIONS, characteristicInto, envelopeWeight } from './characteristic';
import type { StationTrigger, TriggerEnd } from './types';

export type StaLtaForm = 'classic' | 'recursive';

export interface StaLtaOptions {
  readonly form: StaLtaForm;
  readonly characteristic: CharacteristicFunction;
  /** Short-term window, seconds. */
  readonly sta: number;
  /** Long-term window, seconds (longer than sta). */
  readonly lta: number;
  /** Ratio at or above which a trigger starts. */
  readonly triggerOn: number;
  /** Ratio below which a trigger ends (at most triggerOn). */
  readonly triggerOff: number;
  /** Seconds before the trigger-on time that an event cut starts. */
  readonly preEvent: number;
  /** Seconds after the trigger-off time that an event cut ends. */
  readonly postEvent: number;
  /** Seconds of leading data that seed the LTA after the start or a gap; no trigger before (see above). */
  readonly warmUp: number;
  /** Median of three on the CF, so single-sample spikes do not trigger. */
  readonly despike: boolean;
  /** Reference frequency for the envelope CF's weight, Hz. */
  readonly envelopeFrequency: number;
}

/** Settings for local earthquakes (see the module comment for the sources). */
export const LOCAL_EARTHQUAKE_STA_LTA: StaLtaOptions = Object.freeze({
  form: 'recursive',
  characteristic: 'energy',
  sta: 0.5,
  lta: 60,
  triggerOn: 4,
  triggerOff: 2,
  preEvent: 10,
  postEvent: 20,
  warmUp: 1,
  despike: true,
  envelopeFrequency: 5,
});

function checkPositive(name: string, v: number): void {
  if (typeof v !== 'number' || !Number.isFinite(v) || v <= 0) {
    throw new RangeError(`${name} must be a finite number > 0, got ${v}`);
  }
}
function checkNonNegative(name: string, v: number): void {
  if (typeof v !== 'number' || !Number.isFinite(v) || v < 0) {
    throw new RangeError(`${name} must be a finite number >= 0, got ${v}`);
  }
}

/** Fills in defaults and checks every option; throws RangeError naming the bad value. */
export function resolveStaLtaOptions(sampleRate: number, options: Partial<StaLtaOptions> = {}): StaLtaOptions {
  checkPositive('sampleRate (Hz)', sampleRate);
  const o: StaLtaOptions = { ...LOCAL_EARTHQUAKE_STA_LTA, ...options };
  if (o.form !== 'classic' && o.form !== 'recursive') {
    throw new RangeError(`form must be "classic" or "recursive", got "${String(o.form)}"`);
  }
  if (!CHARACTERISTIC_FUNCTIONS.includes(o.characteristic)) {
    throw new RangeError(`characteristic must be one of ${CHARACTERISTIC_FUNCTIONS.join(', ')}, got "${String(o.characteristic)}"`);
  }
  checkPositive('sta (s)', o.sta);
  checkPositive('lta (s)', o.lta);
  if (o.lta <= o.sta) throw new RangeError(`lta (s) must be longer than sta (${o.sta} s), got ${o.lta}`);
  checkPositive('triggerOn', o.triggerOn);
  checkPositive('triggerOff', o.triggerOff);
  if (o.triggerOff > o.triggerOn) {
    throw new RangeError(`triggerOff must be at most triggerOn (${o.triggerOn}), got ${o.triggerOff}`);
  }
  checkNonNegative('preEvent (s)', o.preEvent);
  checkNonNegative('postEvent (s)', o.postEvent);
  checkNonNegative('warmUp (s)', o.warmUp);
  if (typeof o.despike !== 'boolean') throw new TypeError(`despike must be a boolean, got ${String(o.despike)}`);
  checkPositive('envelopeFrequency (Hz)', o.envelopeFrequency);
  return o;
}

/** Window length in samples for a duration in seconds (at least 1). */
export function windowSamples(seconds: number, sampleRate: number): number {
  return Math.max(1, Math.round(seconds * sampleRate));
}

const BLOCK = 65536;

/*
 * The steady-state loops below take the median of three without Math.min/Math.max, which V8 compiles
 * to compare-and-branch sequences whose direction follows the data: on noise about every other one
 * is mispredicted, and those mispredictions, not the arithmetic, set the speed of the loop (measured
 * by test/bench/stalta.bench.ts: about half the time went away). Here the median of a, b (the two
 * previous CF values) and c is clamp(c, lo, hi) with lo = min(a, b) and hi = max(a, b); the
 * comparisons become 0/1 numbers (no branch) that index a 4-slot scratch holding c, lo, hi and b, so
 * every sample does the same work whatever the data. The values are picked, never computed, so the
 * result is bit for bit that of Math.max(Math.min(a, b), Math.min(Math.max(a, b), c)) for every
 * input the loops see: CF values are never -0 (x*x, |x| and x*x + w*d*d are +0 at least), a NaN c
 * gives NaN as Math does (both comparisons are false, so c itself is picked), and a NaN a or b
 * cannot occur here because a NaN CF value has already made the averages NaN and sends later blocks
 * to the general loop (its entry test `lta * ... > 1e-290` is false for NaN).
 */

/**
 * The recursion's steady state without the median of three, CF = x^2 computed on the fly from a
 * Float64Array (the common case: filtered data), which saves the separate CF pass.
 */
function steadyEnergy(
  x: Float64Array, from: number, to: number, out: Float64Array, o: number,
  sta: number, lta: number, cs: number, cl: number, st: Float64Array,
): void {
  for (let i = from; i < to; i++) {
    const v = x[i];
    const c = v * v;
    sta += (c - sta) * cs;
    lta += (c - lta) * cl;
    out[o + i] = sta / lta;
  }
  st[0] = sta;
  st[1] = lta;
}

/**
 * The recursion's steady state with the median of three (taken as described above), over
 * src[from..to) into out[o + i]: the CF values themselves, or with `square` the samples, whose CF
 * x^2 is computed on the fly (the common case: filtered float64 data, without a separate CF pass).
 * The state comes in as arguments and goes out through `st` (sta, lta, CF two back, CF one back).
 * A small free function: V8 optimises it best that way (measured by test/bench/stalta.bench.ts).
 */
function steadyMedian(
  src: Float64Array, square: boolean, from: number, to: number, out: Float64Array, o: number,
  sta: number, lta: number, a: number, b: number, cs: number, cl: number, st: Float64Array, pick: Float64Array,
): void {
  let lo = Math.min(a, b);
  let hi = Math.max(a, b);
  for (let i = from; i < to; i++) {
    const v = src[i];
    const c = square ? v * v : v;
    pick[0] = c;
    pick[1] = lo;
    pick[2] = hi;
    pick[3] = b;
    const m = pick[+(c < lo) + 2 * +(c > hi)];
    // The next lo and hi, of b and c: pick[0] and pick[3] in the order of c < b.
    const q = +(c < b);
    lo = pick[3 - 3 * q];
    hi = pick[3 * q];
    a = b;
    b = c;
    sta += (m - sta) * cs;
    lta += (m - lta) * cl;
    out[o + i] = sta / lta;
  }
  st[0] = sta;
  st[1] = lta;
  st[2] = a;
  st[3] = b;
}

/**
 * The STA/LTA ratio of one channel, computed chunk by chunk with its state carried over. Knows
 * nothing of time: {@link StaLtaDetector} adds times, gaps and triggers.
 */
export class StaLtaRatio {
  readonly options: StaLtaOptions;
  readonly sampleRate: number;
  readonly ns: number;
  readonly nl: number;
  /** Samples that seed the averages after a restart: max(warmUp, STA window), at most the LTA window. */
  readonly seed: number;
  private readonly weight: number;
  private readonly cf = new Float64Array(BLOCK);
  private readonly state = new Float64Array(4);
  /** Scratch of the branch-free median of three (see steadyMedian). */
  private readonly pick = new Float64Array(4);
  /** Recursive form with CF x^2: the settings with a fused loop. */
  private readonly fastPath: boolean;
  // State carried across chunks.
  /** Samples seen since the start or the last restart. */
  count = 0;
  private prevSample = 0;
  private cf1 = -Infinity; // CF one sample back (raw, before the median)
  private cf2 = Infinity; // CF two samples back
  private sta = 0;
  private lta = 0;
  // Classic form: ring of the last nl (despiked) CF values and the running sums.
  private readonly ring: Float64Array;
  private ringPos = 0;
  /** Values the LTA's ring holds (real or seeded), at most nl. */
  private held = 0;
  private sumS = 0;
  private sumL = 0;

  constructor(sampleRate: number, options: Partial<StaLtaOptions> = {}) {
    this.options = resolveStaLtaOptions(sampleRate, options);
    this.sampleRate = sampleRate;
    this.ns = windowSamples(this.options.sta, sampleRate);
    this.nl = Math.max(this.ns + 1, windowSamples(this.options.lta, sampleRate));
    this.seed = Math.min(this.nl, Math.max(this.ns, Math.round(this.options.warmUp * sampleRate)));
    this.weight = envelopeWeight(sampleRate, this.options.envelopeFrequency);
    this.ring = new Float64Array(this.options.form === 'classic' ? this.nl : 0);
    this.fastPath = this.options.form === 'recursive' && this.options.characteristic === 'energy';
  }

  /** Forgets all history (the next sample is treated as the start of data). */
  restart(): void {
    this.count = 0;
    this.prevSample = 0;
    this.cf1 = -Infinity;
    this.cf2 = Infinity;
    this.sta = 0;
    this.lta = 0;
    this.ringPos = 0;
    this.held = 0;
    this.sumS = 0;
    this.sumL = 0;
    this.ring.fill(0);
  }

  /** Writes the ratio for x[from..to) into out[outFrom..], carrying the state on. */
  process(x: SampleArray, from: number, to: number, out: Float64Array, outFrom: number): void {
    for (let b = from; b < to; b += BLOCK) {
      const e = Math.min(to, b + BLOCK);
      const n = e - b;
      const cf = this.cf;
      if (this.fastPath && x instanceof Float64Array && this.count >= this.seed
        && this.lta * Math.pow(1 - 1 / this.nl, n) > 1e-290) {
        // Steady state of the default setting on float64 data: one fused pass (same arithmetic).
        const st = this.state;
        if (this.options.despike) {
          steadyMedian(x, true, b, e, out, outFrom - from, this.sta, this.lta, this.cf2, this.cf1, 1 / this.ns, 1 / this.nl, st, this.pick);
          this.cf2 = st[2];
          this.cf1 = st[3];
        } else {
          steadyEnergy(x, b, e, out, outFrom - from, this.sta, this.lta, 1 / this.ns, 1 / this.nl, st);
        }
        this.sta = st[0];
        this.lta = st[1];
        this.count += n;
        this.prevSample = x[e - 1];
        continue;
      }
      const previous = this.count === 0 ? x[b] : this.prevSample;
      characteristicInto(this.options.characteristic, x, b, e, cf, previous, this.weight);
      this.prevSample = x[e - 1];
      if (this.options.form === 'recursive') {
        this.recursive(cf, n, out, outFrom + (b - from));
      } else {
        if (this.options.despike) this.median3(cf, n);
        this.classic(cf, n, out, outFrom + (b - from));
      }
    }
  }

  /**
   * In place: cf[i] = median(cf[i-2], cf[i-1], cf[i]), the two values before the block coming from the
   * state. After a restart the state holds +Infinity and -Infinity, which makes the first output the
   * first value and the second the smaller of the first two.
   */
  private median3(cf: Float64Array, n: number): void {
    let a = this.cf2;
    let b = this.cf1;
    for (let i = 0; i < n; i++) {
      const c = cf[i];
      cf[i] = Math.max(Math.min(a, b), Math.min(Math.max(a, b), c));
      a = b;
      b = c;
    }
    this.cf2 = a;
    this.cf1 = b;
  }

  /**
   * The recursion over a block of CF values, the median of three folded in. The steady-state loops
   * skip the per-sample "LTA > 0" test when the LTA provably stays positive through the block: each
   * step keeps at least (1 - 1/Nl) of it, so LTA * (1 - 1/Nl)^n above 1e-290 rules out reaching 0.
   */
  private recursive(cf: Float64Array, n: number, out: Float64Array, o: number): void {
    let sta = this.sta;
    let lta = this.lta;
    let a = this.cf2;
    let b = this.cf1;
    const despike = this.options.despike;
    const ns = this.ns;
    const nl = this.nl;
    const seed = this.seed;
    let count = this.count;
    let i = 0;
    // Seeding: plain means of everything so far (the STA's window stops growing at ns).
    for (; i < n && count < seed; i++, count++) {
      let c = cf[i];
      if (despike) {
        const m = Math.max(Math.min(a, b), Math.min(Math.max(a, b), c));
        a = b;
        b = c;
        c = m;
      }
      const k = count + 1;
      sta += (c - sta) / (k < ns ? k : ns);
      lta += (c - lta) / k;
      out[o + i] = lta > 0 ? sta / lta : 0;
    }
    const cs = 1 / ns;
    const cl = 1 / nl;
    const safe = lta * Math.pow(1 - cl, n - i) > 1e-290;
    if (safe && despike) {
      const st = this.state;
      steadyMedian(cf, false, i, n, out, o, sta, lta, a, b, cs, cl, st, this.pick);
      sta = st[0];
      lta = st[1];
      a = st[2];
      b = st[3];
      i = n;
    } else if (safe) {
      for (; i < n; i++) {
        const c = cf[i];
        sta += (c - sta) * cs;
        lta += (c - lta) * cl;
        out[o + i] = sta / lta;
      }
    } else {
      for (; i < n; i++) {
        let c = cf[i];
        if (despike) {
          const m = Math.max(Math.min(a, b), Math.min(Math.max(a, b), c));
          a = b;
          b = c;
          c = m;
        }
        sta += (c - sta) * cs;
        lta += (c - lta) * cl;
        out[o + i] = lta > 0 ? sta / lta : 0;
      }
    }
    this.sta = sta;
    this.lta = lta;
    this.cf2 = a;
    this.cf1 = b;
    this.count += n;
  }

  private classic(cf: Float64Array, n: number, out: Float64Array, o: number): void {
    const ring = this.ring;
    const ns = this.ns;
    const nl = this.nl;
    let pos = this.ringPos;
    let sumS = this.sumS;
    let sumL = this.sumL;
    let count = this.count;
    let held = this.held;
    for (let i = 0; i < n; i++, count++) {
      const c = cf[i];
      if (held === nl) sumL -= ring[pos];
      else held++;
      if (count >= ns) {
        let q = pos - ns;
        if (q < 0) q += nl;
        sumS -= ring[q];
      }
      ring[pos] = c;
      sumS += c;
      sumL += c;
      if (count + 1 === this.seed && this.seed < nl) {
        // Seed complete: its mean fills the history the LTA has not seen yet.
        const mean = sumL / this.seed;
        for (let j = pos + 1; j < nl; j++) ring[j] = mean;
        sumL = mean * nl;
        held = nl;
      }
      pos++;
      if (pos === nl) {
        pos = 0;
        // Every nl samples: exact sums from the ring (full by now).
        let s = 0;
        for (let j = 0; j < nl; j++) s += ring[j];
        sumL = s;
        s = 0;
        for (let j = nl - ns; j < nl; j++) s += ring[j];
        sumS = s;
      }
      const lta = sumL / held;
      const k = count + 1;
      out[o + i] = lta > 0 ? (sumS / (k < ns ? k : ns)) / lta : 0;
    }
    this.held = held;
    this.ringPos = pos;
    this.sumS = sumS;
    this.sumL = sumL;
    this.count = count;
  }
}

/**
 * STA/LTA ratio of a whole array (one pass, from the start of data): for display and checks.
 * `sampleRate` in Hz; options as {@link StaLtaOptions} (windows in seconds).
 */
export function staLtaRatio(samples: SampleArray, sampleRate: number, options: Partial<StaLtaOptions> = {}): Float64Array {
  const r = new StaLtaRatio(sampleRate, options);
  const out = new Float64Array(samples.length);
  r.process(samples, 0, samples.length, out, 0);
  return out;
}

/**
 * Per-channel triggering over continuous data given in chunks. Each chunk carries its start time; a
 * chunk that does not continue the previous one within half a sample period is a gap (or an overlap):
 * an open trigger is closed at the last sample before it (endedBy 'gap') and the averages restart with
 * a fresh warm-up, so the data after a gap cannot trigger on the jump. Triggers are returned when they
 * close; {@link finish} closes one still open at the end of the data.
 */
export class StaLtaDetector {
  readonly id: ChannelId;
  readonly sampleRate: number;
  readonly options: StaLtaOptions;
  private readonly ratio: StaLtaRatio;
  private readonly periodMicros: number;
  /** Samples after a restart before a trigger may start: the seed, or warmUp if longer. */
  private readonly quiet: number;
  private buf = new Float64Array(0);
  private started = false;
  private expectedNext: Micros = 0;
  private lastTime: Micros = 0;
  // Open trigger.
  private open = false;
  private onTime: Micros = 0;
  private peak = 0;
  private peakTime: Micros = 0;

  constructor(id: ChannelId, sampleRate: number, options: Partial<StaLtaOptions> = {}) {
    this.ratio = new StaLtaRatio(sampleRate, options);
    this.options = this.ratio.options;
    this.id = id;
    this.sampleRate = sampleRate;
    this.periodMicros = 1e6 / sampleRate;
    this.quiet = Math.max(this.ratio.seed, Math.round(this.options.warmUp * sampleRate));
  }

  /** The ratio computed for the last chunk pushed (a view, overwritten by the next push). */
  get lastRatio(): Float64Array {
    return this.buf.subarray(0, this.lastLength);
  }
  private lastLength = 0;

  /**
   * Feeds a chunk of samples whose first sample is at `start` (µs). Returns the triggers that ended
   * within it (or at a gap before it).
   */
  push(samples: SampleArray, start: Micros): StationTrigger[] {
    if (!Number.isSafeInteger(start)) throw new RangeError(`start must be integer microseconds, got ${start}`);
    const done: StationTrigger[] = [];
    const n = samples.length;
    if (n === 0) return done;
    if (this.started && Math.abs(start - this.expectedNext) > this.periodMicros / 2) {
      if (this.open) done.push(this.close(this.lastTime, 'gap'));
      this.ratio.restart();
    }
    if (this.buf.length < n) this.buf = new Float64Array(n);
    const r = this.buf;
    const countBefore = this.ratio.count;
    this.ratio.process(samples, 0, n, r, 0);
    this.lastLength = n;
    const on = this.options.triggerOn;
    const off = this.options.triggerOff;
    const per = 1e6 / this.sampleRate;
    // First index in this chunk at which triggers are allowed.
    let i = Math.max(0, this.quiet - countBefore);
    while (i < n) {
      if (!this.open) {
        while (i < n && !(r[i] >= on)) i++;
        if (i === n) break;
        this.open = true;
        this.onTime = start + Math.round(i * per);
        this.peak = r[i];
        this.peakTime = this.onTime;
        i++;
      } else {
        let peak = this.peak;
        let peakAt = -1;
        while (i < n && r[i] >= off) {
          if (r[i] > peak) {
            peak = r[i];
            peakAt = i;
          }
          i++;
        }
        if (peakAt >= 0) {
          this.peak = peak;
          this.peakTime = start + Math.round(peakAt * per);
        }
        if (i === n) break;
        done.push(this.close(start + Math.round(i * per), 'ratio'));
        i++;
      }
    }
    this.started = true;
    this.lastTime = start + Math.round((n - 1) * per);
    this.expectedNext = start + Math.round(n * per);
    return done;
  }

  /** Ends the data: closes a trigger still open at the last sample (endedBy 'end'). */
  finish(): StationTrigger[] {
    return this.open ? [this.close(this.lastTime, 'end')] : [];
  }

  private close(offTime: Micros, endedBy: TriggerEnd): StationTrigger {
    this.open = false;
    const o = this.options;
    return {
      id: this.id,
      on: this.onTime,
      off: offTime,
      peakRatio: this.peak,
      peakTime: this.peakTime,
      start: this.onTime - Math.round(o.preEvent * 1e6),
      end: offTime + Math.round(o.postEvent * 1e6),
      endedBy,
    };
  }
}

/** Triggers of one contiguous run of samples (one pass; the data's end closes an open trigger). */
export function staLtaTriggers(
  id: ChannelId, samples: SampleArray, sampleRate: number, start: Micros, options: Partial<StaLtaOptions> = {},
): StationTrigger[] {
  const d = new StaLtaDetector(id, sampleRate, options);
  return [...d.push(samples, start), ...d.finish()];
}

/**
 * Triggers of one channel as read (core/model ChannelData): its segments in time order, each gap
 * restarting the averages. Sample times within a segment are counted from the segment's start.
 * Throws RangeError when the segments do not share one sample rate.
 */
export function channelTriggers(channel: ChannelData, options: Partial<StaLtaOptions> = {}): StationTrigger[] {
  const segs = channel.segments;
  if (segs.length === 0) return [];
  const rate = segs[0].sampleRate;
  for (const s of segs) {
    if (s.sampleRate !== rate) throw new RangeError(`segments of ${channel.id.station}.${channel.id.channel} must share one sample rate, got ${rate} and ${s.sampleRate} Hz`);
  }
  const d = new StaLtaDetector(channel.id, rate, options);
  const out: StationTrigger[] = [];
  for (const s of segs) out.push(...d.push(s.samples, s.start));
  out.push(...d.finish());
  return out;
}
