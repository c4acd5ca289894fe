/**
 * Runs a reference script of test/ref in the machine's `python3` once for a batch of cases: the cases
 * go in as JSON on stdin (typed arrays as plain arrays), the answers come back as a JSON list, one per
 * case, in order. One python process per call: batch a test file's cases.
 */
import { execFileSync } from 'node:child_process';

export type ReferenceCase = { op: string } & Record<string, unknown>;

export function pythonCases(script: string, cases: readonly ReferenceCase[]): unknown[] {
  const input = JSON.stringify({ cases }, (_k, v) => (ArrayBuffer.isView(v) ? Array.from(v as Float64Array) : v));
  const out = execFileSync('python3', [script], { input, maxBuffer: 1 << 30 }).toString();
  return JSON.parse(out) as unknown[];
}
