/**
 * The one typed error of the miniSEED reader: malformed input, carrying the file and the byte offset
 * where the trouble is, and the reason in words.
 */
export class MiniSeedError extends Error {
  /** File path (or the name the caller gave an in-memory buffer). */
  readonly file: string;
  /** Byte offset in the file where the bad record (or the bad stretch) starts. */
  readonly offset: number;
  /** What is wrong, in words, without the file and offset. */
  readonly reason: string;

  constructor(file: string, offset: number, reason: string) {
    super(`${file}: byte ${offset}: ${reason}`);
    this.name = 'MiniSeedError';
    this.file = file;
    this.offset = offset;
    this.reason = reason;
  }
}

/** The exact reason given for miniSEED 3 records (FDSN 2023), which this reader refuses. */
export const MSEED3_REASON = 'miniSEED 3 is not supported yet';
