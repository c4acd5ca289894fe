/**
 * Runs test/ref/magnitude/magnitude_reference.py once for a batch of cases and returns its answers
 * (scipy.signal and numpy in the machine's `python3`). One python process per call: batch a test
 * file's cases.
 */
import { execFileSync } from 'node:child_process';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const script = join(dirname(fileURLToPath(import.meta.url)), 'magnitude_reference.py');

export type ReferenceCase = { op: string } & Record<string, unknown>;

/** Answers for `cases`, in order (see magnitude_reference.py for the ops and their results). */
export function magnitudeReference(cases: readonly ReferenceCase[]): unknown[] {
  const input = JSON.stringify({ cases }, (_k, v) => (ArrayBuffer.isView(v) ? Array.from(v as Float64Array) : v));
  const out = execFileSync('python3', [script], { input, maxBuffer: 1 << 30 }).toString();
  return JSON.parse(out) as unknown[];
}

/** Poles or zeros as [re, im] pairs for the script. */
export function pairsOf(list: readonly { re: number; im: number }[]): [number, number][] {
  return list.map((c) => [c.re, c.im]);
}
