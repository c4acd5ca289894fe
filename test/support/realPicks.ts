/**
 * The analyst's manual picks of one event of the real records (../shared/data/real-microseismic,
 * `picks.csv`: event file, ..., network, station, location, channel, phase, time, uncertainty,
 * evaluation mode), as a review event for tests that open the desk on them.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { microsFromIso } from '../../core/time';
import type { ReviewEvent, ReviewPick } from '../../core/review/types';

/** picks.csv times as ISO with six fraction digits. */
const iso = (t: string): string => t.replace(/(\.\d{6})\d*Z$/, '$1Z').replace(/:(\d\d)Z$/, ':$1.000000Z');

/**
 * The manual picks of event `file` (uncertainty from the file both ways) in an event "real" from 2 s
 * before its first pick to `afterUs` µs after it.
 */
export function realEvent(realDir: string, file: string, afterUs: number): ReviewEvent {
  const rows = readFileSync(join(realDir, 'picks.csv'), 'utf8').trim().split('\n').slice(1).map((l) => l.split(','));
  const picks: ReviewPick[] = rows.filter((r) => r[0] === file && r[10] === 'manual').map((r, i) => ({
    id: `r${i}`, phase: r[7] as 'P' | 'S', channel: `${r[3]}.${r[4]}.${r[5]}.${r[6]}`, time: microsFromIso(iso(r[8])),
    lower: Number(r[9]), upper: Number(r[9]), onset: 'impulsive', polarity: null, mode: 'manual', status: 'confirmed', snr: null, questionableTiming: false,
  }));
  const t = Math.min(...picks.map((p) => p.time));
  return { id: 'real', source: 'analyst', start: t - 2_000_000, end: t + afterUs, state: 'started', type: null, typeCertainty: null, note: '', picks };
}
