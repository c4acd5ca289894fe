/**
 * Sites and their preferred stream. A site (NET.STA) may have several sensors (location codes) and
 * instruments; the app shows one stream per site, chosen by this documented preference:
 *   band/instrument: HH, BH, EH, SH, HN, then anything else (broadband velocity over short period,
 *   and both over strong motion, whose noise floor is higher — common practice);
 *   location: the lowest code among those with the preferred instrument.
 * Components are ordered vertical first (Z), then N or 1, then E or 2.
 */
/** Orders "2" before "10" (station codes are often numbers). */
const NATURAL = new Intl.Collator('en', { numeric: true });

const INSTRUMENT_PREFERENCE = ['HH', 'BH', 'EH', 'SH', 'HN', 'EN', 'DP'];

export interface SiteStreams {
  site: string;
  /** "NET.STA.LOC.CH?" prefix chosen, e.g. "ZZ.QRS.00.HH". */
  stream: string;
  /** Channel keys of the chosen stream, vertical first. */
  channels: string[];
  /** Other streams at the site, for the row's menu. */
  others: string[];
}

function componentRank(cha: string): number {
  const c = cha[2] ?? '';
  return ({ Z: 0, N: 1, '1': 1, E: 2, '2': 2 } as Record<string, number>)[c] ?? 3;
}

export function siteStreams(channelKeys: Iterable<string>): SiteStreams[] {
  const bySite = new Map<string, Map<string, string[]>>();
  for (const key of channelKeys) {
    const [net, sta, loc, cha] = key.split('.');
    if (!cha || cha.length !== 3) continue;
    const site = `${net}.${sta}`;
    const stream = `${net}.${sta}.${loc}.${cha.slice(0, 2)}`;
    let streams = bySite.get(site);
    if (!streams) bySite.set(site, (streams = new Map()));
    const list = streams.get(stream) ?? [];
    list.push(key);
    streams.set(stream, list);
  }
  const out: SiteStreams[] = [];
  for (const [site, streams] of bySite) {
    const names = [...streams.keys()].sort((a, b) => {
      const ia = INSTRUMENT_PREFERENCE.indexOf(a.slice(-2));
      const ib = INSTRUMENT_PREFERENCE.indexOf(b.slice(-2));
      const ra = ia < 0 ? 99 : ia;
      const rb = ib < 0 ? 99 : ib;
      return ra - rb || (a < b ? -1 : a > b ? 1 : 0);
    });
    const stream = names[0];
    const channels = [...streams.get(stream)!].sort((a, b) => componentRank(a.split('.')[3]) - componentRank(b.split('.')[3]));
    out.push({ site, stream, channels, others: names.slice(1) });
  }
  return out.sort((a, b) => NATURAL.compare(a.site, b.site));
}
