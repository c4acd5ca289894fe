/**
 * Runs test/ref/magnitude/magnitude_reference.py once for a batch of cases and returns its answers
 * (scipy.signal and numpy in the machine's `python3`). One python process per call: batch a test
 * file's cases.
 */
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { pythonCases, type ReferenceCase } from '../pythonCases';

const script = join(dirname(fileURLToPath(import.meta.url)), 'magnitude_reference.py');

export type { ReferenceCase };

/** Answers for `cases`, in order (see magnitude_reference.py for the ops and their results). */
export function magnitudeReference(cases: readonly ReferenceCase[]): unknown[] {
  return pythonCases(script, cases);
}

/** Poles or zeros as [re, im] pairs for the script. */
export function pairsOf(list: readonly { re: number; im: number }[]): [number, number][] {
  return list.map((c) => [c.re, c.im]);
}
