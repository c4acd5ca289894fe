/**
 * Runs test/ref/scipy/spectrum_panel_reference.py once for a batch of spans (numpy and scipy in the
 * machine's `python3`): the spectrum the panel should draw for each span of the pieces given.
 */
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { pythonCases } from '../pythonCases';

const script = join(dirname(fileURLToPath(import.meta.url)), 'spectrum_panel_reference.py');

/** A continuous piece: sample i at start + round(i·1e6/sampleRate) µs. */
export interface ReferencePiece { start: number; sampleRate: number; samples: ArrayLike<number> }

/** numpy's answer for one span (see the script), or null when no piece has 2 samples in it. */
export interface SpanSpectrum { n: number; N: number; start: number; amplitudes: number[]; frequencies: number[]; peak: number }

export function numpySpanSpectra(cases: { pieces: readonly ReferencePiece[]; span: readonly [number, number] }[]): (SpanSpectrum | null)[] {
  return pythonCases(script, cases.map((c) => ({
    op: 'span_spectrum', span: c.span,
    pieces: c.pieces.map((p) => ({ start: p.start, rate: p.sampleRate, samples: Array.from(p.samples) })),
  }))) as (SpanSpectrum | null)[];
}
