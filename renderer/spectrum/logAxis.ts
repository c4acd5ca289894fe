/** Ticks and labels of the spectrum panel's log axes (pure; uPlot calls them). */

/** Ticks of a log axis in [lo, hi]: m·10^n for each mantissa m given. */
export function logTicks(lo: number, hi: number, mantissas: readonly number[]): number[] {
  const out: number[] = [];
  if (!(lo > 0) || !(hi >= lo)) return out;
  for (let n = Math.floor(Math.log10(lo)); n <= Math.ceil(Math.log10(hi)); n++) {
    for (const m of mantissas) {
      // Written from the exponent's string form so 0.1, 0.2 and 0.5 come out exact.
      const v = Number(`${m}e${n}`);
      if (v >= lo * (1 - 1e-9) && v <= hi * (1 + 1e-9)) out.push(v);
    }
  }
  return out;
}

/** A tick's label: plain decimals from 0.001 to 99 999, else 1e-4, 1e5 ... */
export function tickLabel(v: number | null): string {
  if (v === null || !(v > 0)) return '';
  return v >= 1e-3 && v < 1e5 ? String(v) : v.toExponential().replace('e+', 'e');
}
