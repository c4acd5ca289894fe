/**
 * Runs test/ref/scipy/dsp_reference.py once for a batch of cases and returns its answers (scipy.signal
 * and numpy, in the machine's `python3`). One python process per call: batch a test file's cases.
 */
import { execFileSync } from 'node:child_process';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const script = join(dirname(fileURLToPath(import.meta.url)), 'dsp_reference.py');

export type ReferenceCase = { op: string } & Record<string, unknown>;

/** Answers of scipy for `cases`, in order (see dsp_reference.py for the ops and their results). */
export function scipyReference(cases: readonly ReferenceCase[]): unknown[] {
  const input = JSON.stringify({ cases }, (_k, v) => (ArrayBuffer.isView(v) ? Array.from(v as Float64Array) : v));
  const out = execFileSync('python3', [script], { input, maxBuffer: 1 << 30 }).toString();
  return JSON.parse(out) as unknown[];
}
