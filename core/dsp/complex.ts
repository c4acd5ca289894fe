/**
 * The little complex arithmetic that filter design needs (poles and zeros). Not for hot loops: each
 * operation returns a new object.
 */

/** A complex number re + i·im. */
export interface Complex {
  readonly re: number;
  readonly im: number;
}

export function complex(re: number, im = 0): Complex {
  return { re, im };
}

export function cadd(a: Complex, b: Complex): Complex {
  return { re: a.re + b.re, im: a.im + b.im };
}

export function csub(a: Complex, b: Complex): Complex {
  return { re: a.re - b.re, im: a.im - b.im };
}

export function cmul(a: Complex, b: Complex): Complex {
  return { re: a.re * b.re - a.im * b.im, im: a.re * b.im + a.im * b.re };
}

/** a / b, by Smith's method (avoids overflow in |b|²). */
export function cdiv(a: Complex, b: Complex): Complex {
  if (Math.abs(b.re) >= Math.abs(b.im)) {
    const r = b.im / b.re;
    const d = b.re + b.im * r;
    return { re: (a.re + a.im * r) / d, im: (a.im - a.re * r) / d };
  }
  const r = b.re / b.im;
  const d = b.re * r + b.im;
  return { re: (a.re * r + a.im) / d, im: (a.im * r - a.re) / d };
}

export function cscale(a: Complex, s: number): Complex {
  return { re: a.re * s, im: a.im * s };
}

export function cconj(a: Complex): Complex {
  return { re: a.re, im: -a.im };
}

export function cabs(a: Complex): number {
  return Math.hypot(a.re, a.im);
}

/** Principal square root (branch cut on the negative real axis; the sign of a zero imaginary part picks the side, as C99 csqrt). */
export function csqrt(a: Complex): Complex {
  const { re: x, im: y } = a;
  if (x === 0 && y === 0) return { re: 0, im: y };
  const t = Math.sqrt((Math.abs(x) + Math.hypot(x, y)) / 2);
  if (x >= 0) return { re: t, im: y / (2 * t) };
  const negative = y < 0 || Object.is(y, -0);
  return { re: Math.abs(y) / (2 * t), im: negative ? -t : t };
}

/** Product of all the numbers, left to right (1 for none). */
export function cprod(list: readonly Complex[]): Complex {
  let p: Complex = { re: 1, im: 0 };
  for (const z of list) p = cmul(p, z);
  return p;
}

/** True when the imaginary part is exactly zero (numpy's `isreal`). */
export function isReal(a: Complex): boolean {
  return a.im === 0;
}
