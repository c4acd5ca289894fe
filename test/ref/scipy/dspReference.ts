/**
 * Runs test/ref/scipy/dsp_reference.py once for a batch of cases and returns its answers (scipy.signal
 * and numpy, in the machine's `python3`). One python process per call: batch a test file's cases.
 */
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { pythonCases, type ReferenceCase } from '../pythonCases';

const script = join(dirname(fileURLToPath(import.meta.url)), 'dsp_reference.py');

export type { ReferenceCase };

/** Answers of scipy for `cases`, in order (see dsp_reference.py for the ops and their results). */
export function scipyReference(cases: readonly ReferenceCase[]): unknown[] {
  return pythonCases(script, cases);
}
