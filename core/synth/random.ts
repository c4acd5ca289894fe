/**
 * A small seeded pseudo-random generator, so that the same seed always gives the same scenario on
 * every machine. The generator is sfc32 (Chris Doty-Humphrey's "small fast counting" generator, from
 * the PractRand suite): 128 bits of state, 32-bit integer arithmetic only, so it gives identical
 * sequences in every JavaScript engine.
 */
export class Rng {
  private a: number;
  private b: number;
  private c: number;
  private d: number;

  /** `seed`: any integer (taken modulo 2^32); `stream` picks an independent sequence for the same seed. */
  constructor(seed: number, stream = 0) {
    if (!Number.isFinite(seed)) throw new RangeError(`seed must be a finite number, got ${seed}`);
    this.a = 0x9e3779b9;
    this.b = 0x243f6a88;
    this.c = 0xb7e15162;
    this.d = (seed >>> 0) ^ Math.imul(stream >>> 0, 0x85ebca6b);
    for (let i = 0; i < 15; i++) this.nextUint32();
  }

  /** Uniform integer in [0, 2^32). */
  nextUint32(): number {
    const t = (((this.a + this.b) | 0) + this.d) | 0;
    this.d = (this.d + 1) | 0;
    this.a = this.b ^ (this.b >>> 9);
    this.b = (this.c + (this.c << 3)) | 0;
    this.c = (this.c << 21) | (this.c >>> 11);
    this.c = (this.c + t) | 0;
    return t >>> 0;
  }

  /** Uniform in [0, 1). */
  next(): number {
    return this.nextUint32() / 4294967296;
  }

  /** Uniform in [lo, hi). */
  uniform(lo: number, hi: number): number {
    return lo + (hi - lo) * this.next();
  }

  /** Integer uniform in [lo, hi] (both inclusive). */
  int(lo: number, hi: number): number {
    return lo + Math.floor(this.next() * (hi - lo + 1));
  }

  /** Standard normal deviate (Box-Muller; one of the pair is discarded for simplicity). */
  normal(): number {
    let u = this.next();
    if (u < 1e-300) u = 1e-300;
    return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * this.next());
  }

  /** A 32-bit seed for a child generator (so that parts of a scenario do not shift each other). */
  fork(): number {
    return this.nextUint32();
  }
}
