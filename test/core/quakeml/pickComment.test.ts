import { describe, expect, it } from 'vitest';
import { pickComment, readPickComment } from '../../../core/quakeml';

// The comment is Daybreak's own text (QuakeML 1.2 has no pick field for SNR or a timing flag), so
// the values here are worked by hand from the words written.

describe('pick comments', () => {
  it('writes the SNR to one decimal, the timing flag and a note, and reads them back', () => {
    expect(pickComment(12.46, true, 'read again')).toBe('SNR 12.5; questionable timing (record flags); read again');
    expect(readPickComment('SNR 12.5; questionable timing (record flags); read again')).toEqual({ snr: 12.5, questionableTiming: true });
    expect(pickComment(7, false)).toBe('SNR 7.0');
    expect(readPickComment('SNR 7.0')).toEqual({ snr: 7, questionableTiming: false });
    expect(pickComment(null, false)).toBeUndefined();
    expect(pickComment(null, true)).toBe('questionable timing (record flags)');
    expect(pickComment(Infinity, false)).toBe('SNR inf');
    expect(readPickComment('SNR inf')).toEqual({ snr: Infinity, questionableTiming: false });
  });

  it('reads the words the desk\'s export wrote before, in any letter case, and nothing from other text', () => {
    expect(readPickComment('snr 3.4; record timing questionable')).toEqual({ snr: 3.4, questionableTiming: true });
    expect(readPickComment('record timing questionable')).toEqual({ snr: null, questionableTiming: true });
    expect(readPickComment('Snr 20')).toEqual({ snr: 20, questionableTiming: false });
    expect(readPickComment(undefined)).toEqual({ snr: null, questionableTiming: false });
    expect(readPickComment('picked by hand; onset unsure')).toEqual({ snr: null, questionableTiming: false });
    expect(readPickComment('transnr 5')).toEqual({ snr: null, questionableTiming: false });
  });
});
