/**
 * Causal filtering by a cascade of second-order sections (transposed direct form II, as scipy's
 * `sosfilt`), and the steady-state initial conditions of the cascade (scipy's `sosfilt_zi`).
 *
 * The state is a Float64Array of 2 numbers per section, [z1, z2] (scipy's `zi[s, 0]`, `zi[s, 1]`).
 * Per sample v and section the recurrence is y = b0·v + z1; z1 ← (b1·v + z2) − a1·y;
 * z2 ← b2·v − a2·y. Substituting y, the loops compute z1 ← ((b1 − a1·b0)·v + z2) − a1·z1 and
 * z2 ← (b2 − a2·b0)·v − a2·z1 from the old z1: the same states and outputs (to rounding), but the
 * loop-carried chain from one z1 to the next is one multiply and one subtract instead of an add, a
 * multiply and a subtract, which made the loop about 1.6 times faster where we measured (x86-64,
 * Node 20). The folded coefficients are computed with a single rounding (see foldedCoefficient).
 * The inner loops run four sections per pass over a block of samples (then two, then one for the
 * rest) with every coefficient and state in local variables (independent recurrences keep the
 * floating-point units busy).
 *
 * Speed: a reused `out` array is worth having for long inputs — a fresh 69 MB Float64Array costs
 * about as much in first-touch page faults as filtering it through four sections, and V8 returns a
 * dropped array's memory only at its next garbage collection, so many short calls with fresh
 * outputs pay the same (test/bench/filter.bench.ts prints each way of calling beside scipy).
 */
import type { SampleArray } from '../model';
import { checkSamples, outputArray } from './checkSamples';

/** Checks the shape of a section array (6 numbers per section, a0 = 1) and returns the section count. */
export function sectionCount(sos: Float64Array): number {
  if (!(sos instanceof Float64Array)) throw new TypeError('second-order sections must be a Float64Array of 6 coefficients per section');
  if (sos.length === 0 || sos.length % 6 !== 0) {
    throw new RangeError(`second-order sections need 6 coefficients per section (a positive multiple of 6), got ${sos.length}`);
  }
  const n = sos.length / 6;
  for (let s = 0; s < n; s++) {
    if (sos[6 * s + 3] !== 1) throw new RangeError(`section ${s}: a0 must be 1 (normalised sections), got ${sos[6 * s + 3]}`);
  }
  return n;
}

/**
 * Initial state for which the cascade's response to a unit step is already steady (multiply by the
 * first sample to start a signal without a start-up transient), as scipy's `sosfilt_zi`.
 * Per section with b, a: zi solves zi = A·zi + B for the section's companion matrix, scaled by the
 * DC gain of the sections before it.
 */
export function sosfiltZi(sos: Float64Array): Float64Array {
  const n = sectionCount(sos);
  const zi = new Float64Array(2 * n);
  let scale = 1;
  for (let s = 0; s < n; s++) {
    const k = 6 * s;
    const b0 = sos[k], b1 = sos[k + 1], b2 = sos[k + 2], a1 = sos[k + 4], a2 = sos[k + 5];
    // (1 + a1)·z1 − z2 = b1 − a1·b0 and a2·z1 + z2 = b2 − a2·b0.
    const r1 = b1 - a1 * b0;
    const r2 = b2 - a2 * b0;
    const z1 = (r1 + r2) / (1 + a1 + a2);
    zi[2 * s] = scale * z1;
    zi[2 * s + 1] = scale * (r2 - a2 * z1);
    scale *= (b0 + b1 + b2) / (1 + a1 + a2);
  }
  return zi;
}

/** 2^27 + 1, Veltkamp's splitting constant for float64. */
const SPLIT = 134217729;

/**
 * b − a·c with a single rounding (Dekker's exact product a·c = p + err, then (b − p) − err): the
 * folded coefficient keeps the section's zeros where the design put them even when a·c nearly
 * cancels b (a high-pass with a low corner: b1 = −2·b0, a1 ≈ −2), so a large offset still meets a
 * zero gain at 0 Hz.
 */
function foldedCoefficient(b: number, a: number, c: number): number {
  const p = a * c;
  let t = SPLIT * a;
  const ah = t - (t - a), al = a - ah;
  t = SPLIT * c;
  const ch = t - (t - c), cl = c - ch;
  const err = ((ah * ch - p) + ah * cl + al * ch) + al * cl;
  return (b - p) - err;
}

/**
 * Four sections, k to k + 18, in one pass over `count` samples of src into dst (which may be src), at
 * indices first, first + step, ... (step 1 forward, −1 backward). State of section s at state[2s],
 * state[2s + 1], read and written back. One pass for four sections instead of two passes of two:
 * V8 re-checks both arrays and the loop on every pass, so this runs about a quarter fewer
 * instructions per sample (its optimised loop: 92 instructions per sample against 118 for two passes
 * of {@link twoSections}, counted in the code V8 11.3 (node 20) makes, with --print-opt-code), though 28
 * live numbers do not fit the 16 registers and some coefficients are read from the stack.
 */
function fourSections(sos: Float64Array, k: number, state: Float64Array, src: Float64Array, dst: Float64Array, first: number, count: number, step: number): void {
  const b0 = sos[k], a1 = sos[k + 4], a2 = sos[k + 5];
  const c0 = sos[k + 6], c1 = sos[k + 10], c2 = sos[k + 11];
  const g0 = sos[k + 12], g1 = sos[k + 16], g2 = sos[k + 17];
  const p0 = sos[k + 18], p1 = sos[k + 22], p2 = sos[k + 23];
  const e1 = foldedCoefficient(sos[k + 1], a1, b0), e2 = foldedCoefficient(sos[k + 2], a2, b0);
  const f1 = foldedCoefficient(sos[k + 7], c1, c0), f2 = foldedCoefficient(sos[k + 8], c2, c0);
  const h1 = foldedCoefficient(sos[k + 13], g1, g0), h2 = foldedCoefficient(sos[k + 14], g2, g0);
  const q1 = foldedCoefficient(sos[k + 19], p1, p0), q2 = foldedCoefficient(sos[k + 20], p2, p0);
  const j = 2 * (k / 6);
  let z1 = state[j], z2 = state[j + 1], w1 = state[j + 2], w2 = state[j + 3];
  let u1 = state[j + 4], u2 = state[j + 5], r1 = state[j + 6], r2 = state[j + 7];
  for (let m = 0; m < count; m++) {
    const i = first + step * m;
    const v = src[i];
    const y1 = b0 * v + z1;
    let old = z1;
    z1 = (e1 * v + z2) - a1 * old;
    z2 = e2 * v - a2 * old;
    const y2 = c0 * y1 + w1;
    old = w1;
    w1 = (f1 * y1 + w2) - c1 * old;
    w2 = f2 * y1 - c2 * old;
    const y3 = g0 * y2 + u1;
    old = u1;
    u1 = (h1 * y2 + u2) - g1 * old;
    u2 = h2 * y2 - g2 * old;
    dst[i] = p0 * y3 + r1;
    old = r1;
    r1 = (q1 * y3 + r2) - p1 * old;
    r2 = q2 * y3 - p2 * old;
  }
  state[j] = z1; state[j + 1] = z2; state[j + 2] = w1; state[j + 3] = w2;
  state[j + 4] = u1; state[j + 5] = u2; state[j + 6] = r1; state[j + 7] = r2;
}

/**
 * Two sections, k and k + 6, over `count` samples of src into dst (which may be src), at indices
 * first, first + step, ... (step 1 forward, −1 backward). State of section s at state[2s],
 * state[2s + 1], read and written back.
 */
function twoSections(sos: Float64Array, k: number, state: Float64Array, src: Float64Array, dst: Float64Array, first: number, count: number, step: number): void {
  const b0 = sos[k], a1 = sos[k + 4], a2 = sos[k + 5];
  const c0 = sos[k + 6], d1 = sos[k + 10], d2 = sos[k + 11];
  // b1 − a1·b0 and b2 − a2·b0: the state update written from the old z1 instead of y (see above).
  const e1 = foldedCoefficient(sos[k + 1], a1, b0), e2 = foldedCoefficient(sos[k + 2], a2, b0);
  const f1 = foldedCoefficient(sos[k + 7], d1, c0), f2 = foldedCoefficient(sos[k + 8], d2, c0);
  const j = 2 * (k / 6);
  let z1 = state[j], z2 = state[j + 1], w1 = state[j + 2], w2 = state[j + 3];
  for (let m = 0; m < count; m++) {
    const i = first + step * m;
    const v = src[i];
    const y = b0 * v + z1;
    const zOld = z1;
    z1 = (e1 * v + z2) - a1 * zOld;
    z2 = e2 * v - a2 * zOld;
    const u = c0 * y + w1;
    const wOld = w1;
    w1 = (f1 * y + w2) - d1 * wOld;
    w2 = f2 * y - d2 * wOld;
    dst[i] = u;
  }
  state[j] = z1; state[j + 1] = z2; state[j + 2] = w1; state[j + 3] = w2;
}

/** One section k, as {@link twoSections}. */
function oneSection(sos: Float64Array, k: number, state: Float64Array, src: Float64Array, dst: Float64Array, first: number, count: number, step: number): void {
  const b0 = sos[k], a1 = sos[k + 4], a2 = sos[k + 5];
  const e1 = foldedCoefficient(sos[k + 1], a1, b0), e2 = foldedCoefficient(sos[k + 2], a2, b0);
  const j = 2 * (k / 6);
  let z1 = state[j], z2 = state[j + 1];
  for (let m = 0; m < count; m++) {
    const i = first + step * m;
    const v = src[i];
    const zOld = z1;
    dst[i] = b0 * v + zOld;
    z1 = (e1 * v + z2) - a1 * zOld;
    z2 = e2 * v - a2 * zOld;
  }
  state[j] = z1; state[j + 1] = z2;
}

/** Samples per block: each block goes through every section while it is in the L1 cache. */
const BLOCK = 1024;

/**
 * Runs the whole cascade over `src` into `dst` (same length; dst may be src), forward or from the
 * last sample to the first, continuing from `state` and leaving the final state there. Block by
 * block, so a block meets all the sections while it is in cache (one trip through memory instead of
 * one per section pair), and so the kernels finish a short call, with every line run, before the
 * engine optimises them. No argument checks: for this module and sosfiltfilt.
 */
export function runCascade(sos: Float64Array, state: Float64Array, src: Float64Array, dst: Float64Array, reverse: boolean): void {
  const n = src.length;
  const sections = sos.length / 6;
  const step = reverse ? -1 : 1;
  for (let done = 0; done < n; done += BLOCK) {
    const count = Math.min(BLOCK, n - done);
    const first = reverse ? n - 1 - done : done;
    let from = src;
    let s = 0;
    for (; s + 3 < sections; s += 4) {
      fourSections(sos, 6 * s, state, from, dst, first, count, step);
      from = dst;
    }
    if (s + 1 < sections) {
      twoSections(sos, 6 * s, state, from, dst, first, count, step);
      from = dst;
      s += 2;
    }
    if (s < sections) oneSection(sos, 6 * s, state, from, dst, first, count, step);
  }
}

export interface SosfiltOptions {
  /**
   * Filter state, 2 numbers per section: read as the initial conditions (zeros when absent) and
   * overwritten with the final conditions, so the next chunk of the same stream continues seamlessly
   * when given the same array.
   */
  state?: Float64Array;
  /** Where to write the output (length of x); may be x itself when x is a Float64Array. */
  out?: Float64Array;
}

/**
 * Causal filtering of `x` by second-order sections `sos` (6 per section, see `butterworth`), as
 * scipy's `sosfilt(sos, x, zi=state)`. Returns the filtered samples (float64, same units as x).
 */
export function sosfilt(sos: Float64Array, x: SampleArray, options: SosfiltOptions = {}): Float64Array {
  const sections = sectionCount(sos);
  checkSamples(x);
  const { state = new Float64Array(2 * sections) } = options;
  if (!(state instanceof Float64Array) || state.length !== 2 * sections) {
    throw new RangeError(`filter state must be a Float64Array of 2 per section (${2 * sections}), got length ${(state as { length?: number }).length}`);
  }
  const out = outputArray(x.length, options.out);
  if (x instanceof Float64Array) {
    runCascade(sos, state, x, out, false);
  } else {
    out.set(x);
    runCascade(sos, state, out, out, false);
  }
  return out;
}
