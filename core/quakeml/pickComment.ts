/**
 * The free text Daybreak writes in a pick's comment, and reads back from it: the picker's SNR and
 * whether the record flags questionable timing. QuakeML 1.2 has no field for either on a pick. The
 * scan and the desk's export write the same words ("SNR 12.5; questionable timing (record flags)"),
 * and the reader also takes the words the desk's export wrote before ("snr 12.5; record timing
 * questionable"), in any letter case, so files written then still carry their flags.
 */

/** The comment for a pick: SNR (null: none), the timing flag, then any further note. */
export function pickComment(snr: number | null, questionableTiming: boolean, note = ''): string | undefined {
  const parts: string[] = [];
  if (snr !== null) parts.push(`SNR ${Number.isFinite(snr) ? snr.toFixed(1) : 'inf'}`);
  if (questionableTiming) parts.push('questionable timing (record flags)');
  if (note) parts.push(note);
  return parts.length ? parts.join('; ') : undefined;
}

/** What a pick comment says of the SNR (null when it gives none) and of the record's timing. */
export function readPickComment(comment: string | undefined): { snr: number | null; questionableTiming: boolean } {
  const text = comment ?? '';
  const m = /\bsnr ([0-9]+(?:\.[0-9]*)?|inf)\b/i.exec(text);
  const snr = m ? (m[1].toLowerCase() === 'inf' ? Infinity : Number(m[1])) : null;
  return { snr, questionableTiming: /questionable timing|timing questionable/i.test(text) };
}
