/**
 * One stream per site. Where a site records on several sensors or location codes, triggering and
 * picking use one of them, so the site counts once in the coincidence.
 *
 * Preference (Daybreak's rule), by the SEED channel codes (SEED manual v2.4, appendix A: band,
 * instrument, orientation):
 * 1. A stream must have a vertical (orientation Z).
 * 2. Instrument: H (high-gain seismometer) before P (geophone) before L (low-gain seismometer) before
 *    N (accelerometer): weak local events are best seen on the most sensitive sensor; an accelerometer
 *    is the fallback (it is kept for strong motion that clips the others).
 * 3. Three components (Z plus two horizontals, N/E or 1/2) before a vertical alone, so S can be read.
 * 4. Band: higher sample-rate bands first, broadband before short-period at the same rate
 *    (H, B, E, S, C, D, F, G, then the rest), for onset resolution.
 * 5. Location code in text order ("" before "00" before "10"): the site's main sensor usually carries
 *    the lowest.
 */
import type { ChannelId } from '../model';
import { stationKey } from '../model';

export interface SiteStream {
  /** "NET.STA". */
  readonly site: string;
  readonly vertical: ChannelId;
  /** The two horizontals (N then E, or 1 then 2), or null for a vertical-only stream. */
  readonly horizontals: readonly [ChannelId, ChannelId] | null;
  /** The streams not chosen at this site ("LOC.BI" band and instrument, e.g. "10.HN"). */
  readonly skipped: readonly string[];
}

const INSTRUMENT_RANK = ['H', 'P', 'L', 'N'];
const BAND_RANK = ['H', 'B', 'E', 'S', 'C', 'D', 'F', 'G'];

function rank(list: readonly string[], c: string): number {
  const i = list.indexOf(c);
  return i < 0 ? list.length : i;
}

interface Candidate {
  readonly key: string;
  readonly location: string;
  readonly band: string;
  readonly instrument: string;
  vertical?: ChannelId;
  n?: ChannelId;
  e?: ChannelId;
  one?: ChannelId;
  two?: ChannelId;
}

/** Chooses one stream per site from a list of channels (any order); sites without a vertical are left out. */
export function chooseSiteStreams(ids: readonly ChannelId[]): SiteStream[] {
  const bySite = new Map<string, Map<string, Candidate>>();
  for (const id of ids) {
    if (typeof id?.channel !== 'string' || id.channel.length !== 3) {
      throw new RangeError(`channel code must have 3 characters (band, instrument, orientation), got "${String(id?.channel)}"`);
    }
    const site = stationKey(id);
    const key = `${id.location}.${id.channel.slice(0, 2)}`;
    let m = bySite.get(site);
    if (!m) bySite.set(site, (m = new Map()));
    let c = m.get(key);
    if (!c) m.set(key, (c = { key, location: id.location, band: id.channel[0], instrument: id.channel[1] }));
    switch (id.channel[2]) {
      case 'Z': c.vertical = id; break;
      case 'N': c.n = id; break;
      case 'E': c.e = id; break;
      case '1': c.one = id; break;
      case '2': c.two = id; break;
      default: break;
    }
  }
  const out: SiteStream[] = [];
  for (const [site, m] of [...bySite].sort((a, b) => (a[0] < b[0] ? -1 : a[0] > b[0] ? 1 : 0))) {
    const horizontals = (c: Candidate): [ChannelId, ChannelId] | null =>
      c.n && c.e ? [c.n, c.e] : c.one && c.two ? [c.one, c.two] : null;
    const cands = [...m.values()].filter((c) => c.vertical);
    if (cands.length === 0) continue;
    cands.sort((a, b) =>
      rank(INSTRUMENT_RANK, a.instrument) - rank(INSTRUMENT_RANK, b.instrument)
      || (horizontals(a) ? 0 : 1) - (horizontals(b) ? 0 : 1)
      || rank(BAND_RANK, a.band) - rank(BAND_RANK, b.band)
      || (a.location < b.location ? -1 : a.location > b.location ? 1 : 0));
    const best = cands[0];
    out.push({
      site,
      vertical: best.vertical!,
      horizontals: horizontals(best),
      skipped: [...m.keys()].filter((k) => k !== best.key).sort(),
    });
  }
  return out;
}
