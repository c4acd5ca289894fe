/**
 * miniSEED 2.4 reading (FDSN SEED Reference Manual v2.4): record headers, every common encoding,
 * and the assembly of records into channels with their gaps, overlaps and duplicates.
 */
import { collectBuffer, type MiniSeedReadResult } from './collect';

export { MiniSeedError, MSEED3_REASON } from './errors';
export {
  parseRecordHeader, looksLikeRecordStart, isMiniSeed3, nominalRate, MIN_RECORD_LENGTH, MAX_RECORD_LENGTH,
  type RecordHeader,
} from './header';
export { decodeSamples, decodeAscii, sampleKindOf, SampleKind } from './decode';
export { decodeSteim1, decodeSteim2, STEIM_OK, STEIM_MISMATCH } from './steim';
export {
  MiniSeedCollector, SCAN_LOOKAHEAD, type RecordError, type FileReport, type MiniSeedReadResult,
} from './collect';

/**
 * Reads every record of one in-memory file. Never throws for bad records: they go to
 * `files[0].errors` with their byte offset and the reason. `path` names the file in reports.
 */
export function readMiniSeedBuffer(bytes: Uint8Array, path: string): MiniSeedReadResult {
  if (!(bytes instanceof Uint8Array)) throw new TypeError(`readMiniSeedBuffer: bytes must be a Uint8Array, got ${typeof bytes}`);
  if (typeof path !== 'string') throw new TypeError(`readMiniSeedBuffer: path must be a string, got ${typeof path}`);
  return collectBuffer(bytes, path);
}
export * from './write';
