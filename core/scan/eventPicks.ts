/**
 * Picks of one candidate event: the traces of each site are cut from the data read around the event,
 * prepared (vertical polarity corrected, horizontals rotated to north and east from their azimuths,
 * causal filter started from its steady state), and picked with core/pick's pickEventSites: P by AIC
 * on the vertical around the site's trigger, a particle-motion check that the onset taken is not S
 * (P then sought before it), a lower re-trigger at the network's sites that did not trigger, and S by
 * the joint AIC of the horizontals in the window a plausible Vp/Vs allows after that P.
 *
 * The S window at site i: the origin time is not known yet, but it precedes the earliest P of the
 * event, tP_first, by at most `firstTravelMax` seconds, so the P travel time at i lies in
 * [tP_i - tP_first, tP_i - tP_first + firstTravelMax]. Events farther out than that (a regional event,
 * Sn 25 s after Pn) get a longer window: the caller may pass the earliest origin time the P picks
 * allow (eventOrigin.ts earliestOriginFromP: a P-only location), up to `maxPTravelTime` before
 * tP_first, and the P travel time's upper bound grows to tP_i minus that time. For such an event the
 * P and S picks are read again on the traces filtered with `settings.distantFilter` (a high-pass
 * only; made only when asked for), as pickEventSites' step 4 describes.
 *
 * Only the data given is used, and every trace starts where the data read for the event starts, so an
 * event's picks depend on the event and the files, never on how the night was cut into chunks.
 */
import type { ChannelId, Segment } from '../model';
import { channelKey } from '../model';
import type { Micros } from '../time';
import { designForChannel } from '../dsp/designForChannel';
import { filterSegments } from '../dsp/filterSegments';
import { rotateToNorthEast } from '../dsp/rotate';
import { pickEventSites, type CandidateEvent, type EventSite, type OriginPick, type Pick, type SitePosition, type Trace } from '../pick';
import type { SiteLocation } from '../location';
import type { RereadSite } from './reread';
import type { ScanSettings } from './settings';

/** What is known of one channel of a site's stream for picking. */
export interface PickChannel {
  readonly id: ChannelId;
  /** The channel's segments in the span read for the event. */
  readonly segments: readonly Segment[];
  /** Azimuth of the positive axis, degrees from north (horizontals), or null when unknown. */
  readonly azimuth: number | null;
}

/** A site's stream as read for an event. */
export interface PickSite {
  readonly vertical: PickChannel;
  /** +1, or -1 when the vertical's counts run against upward ground motion (dsp verticalPolarity). */
  readonly polarity: 1 | -1;
  /** First and second horizontal (N/E or 1/2), or null for a vertical-only site. */
  readonly horizontals: readonly [PickChannel, PickChannel] | null;
  /** Where the site is (for the re-trigger window and the phase check's anchors). */
  readonly position: SitePosition;
}

function segmentAt(segments: readonly Segment[], t: Micros): Segment | null {
  for (const s of segments) if (s.start <= t && t <= s.end) return s;
  return null;
}

/** The vertical trace around t: the segment holding t, polarity applied, filtered causally. */
export function verticalTrace(site: PickSite, sos: Float64Array, t: Micros): Trace | null {
  const seg = segmentAt(site.vertical.segments, t);
  if (!seg) return null;
  const [y] = filterSegments(sos, [seg.samples]);
  if (site.polarity === -1) for (let i = 0; i < y.length; i++) y[i] = -y[i];
  return {
    id: site.vertical.id, samples: y, sampleRate: seg.sampleRate, start: seg.start,
    questionableTiming: seg.timing.questionableTimeRecords > 0,
  };
}

/**
 * North and east traces around t: the common span of the two horizontals' segments holding t, rotated
 * (1/2 by their azimuths; N/E with unknown azimuths taken as 0 and 90), filtered causally. The
 * returned traces carry the channel ids of the recorded horizontals (first, second).
 */
export function horizontalTraces(site: PickSite, sos: Float64Array, t: Micros): [Trace, Trace] | null {
  if (!site.horizontals) return null;
  const [c1, c2] = site.horizontals;
  const s1 = segmentAt(c1.segments, t);
  const s2 = segmentAt(c2.segments, t);
  if (!s1 || !s2 || s1.sampleRate !== s2.sampleRate) return null;
  const fs = s1.sampleRate;
  const start = Math.max(s1.start, s2.start);
  const i1 = Math.round(((start - s1.start) * fs) / 1e6);
  const i2 = Math.round(((start - s2.start) * fs) / 1e6);
  const n = Math.min(s1.samples.length - i1, s2.samples.length - i2);
  if (n < 16) return null;
  const isNE = c1.id.channel.endsWith('N') && c2.id.channel.endsWith('E');
  const az1 = c1.azimuth ?? (isNE ? 0 : null);
  const az2 = c2.azimuth ?? (isNE ? 90 : null);
  if (az1 === null || az2 === null) return null;
  const { north, east } = rotateToNorthEast(s1.samples.subarray(i1, i1 + n), s2.samples.subarray(i2, i2 + n), az1, az2);
  const [yn, ye] = filterSegments(sos, [north, east]);
  const q = s1.timing.questionableTimeRecords > 0 || s2.timing.questionableTimeRecords > 0;
  const t0 = s1.start + Math.round((i1 * 1e6) / fs);
  return [
    { id: c1.id, samples: yn, sampleRate: fs, start: t0, questionableTiming: q },
    { id: c2.id, samples: ye, sampleRate: fs, start: t0, questionableTiming: q },
  ];
}

/**
 * P and S picks of an event. `sites` maps "NET.STA" to the site's data: the event's member sites and
 * any other site of the network whose data covers the event (those are searched with the lower
 * re-trigger level). `sosFor` gives the filter sections for a sample rate (Hz); `earliestOrigin`, when
 * given, may widen the S window for distant events (see the module comment). Picks come per site, P
 * before S, member sites in trigger order first, then the others in the map's order.
 */
export function eventPicks(
  event: CandidateEvent, sites: ReadonlyMap<string, PickSite>, sosFor: (sampleRate: number) => Float64Array,
  settings: ScanSettings, earliestOrigin?: (pPicks: readonly OriginPick[]) => number | null,
): Pick[] {
  const on = new Map<string, number>();
  for (const t of event.triggers) {
    const key = `${t.id.network}.${t.id.station}`;
    if (!on.has(key)) on.set(key, t.on);
  }
  const keys = [...on.keys(), ...[...sites.keys()].filter((k) => !on.has(k))];
  const list: EventSite[] = [];
  const wide = settings.distantFilter;
  const wideSos = new Map<number, Float64Array>();
  const wideFor = (rate: number): Float64Array => {
    let sos = wideSos.get(rate);
    if (!sos) {
      sos = designForChannel(wide!, rate).sos;
      wideSos.set(rate, sos);
    }
    return sos;
  };
  for (const key of keys) {
    const site = sites.get(key);
    if (!site) continue;
    const trigger = on.get(key) ?? null;
    const t = trigger ?? event.time;
    const seg = segmentAt(site.vertical.segments, t);
    if (!seg) continue;
    const z = verticalTrace(site, sosFor(seg.sampleRate), t);
    if (!z) continue;
    let h: [Trace, Trace] | null = null;
    if (site.horizontals) {
      const hs = segmentAt(site.horizontals[0].segments, t);
      if (hs) h = horizontalTraces(site, sosFor(hs.sampleRate), t);
    }
    const hRate = h ? h[0].sampleRate : 0;
    list.push({
      vertical: z, horizontals: h, position: site.position, trigger,
      ...(wide ? {
        distantVertical: () => verticalTrace(site, wideFor(seg.sampleRate), t),
        distantHorizontals: h ? () => horizontalTraces(site, wideFor(hRate), t) : undefined,
      } : {}),
    });
  }
  if (!list.some((s) => s.trigger !== null)) return [];
  return pickEventSites(list, {
    ...settings.eventPicking,
    onset: settings.onset,
    sWindow: settings.sWindow,
    staLta: settings.staLta,
    firstTravelMax: settings.firstTravelMax,
    vMin: settings.vMin,
    slack: settings.slack,
    earliestOrigin,
  });
}

/** A pick's identifier within its event: "EVENT.NET.STA.LOC.CHA.P". */
export function pickId(eventId: string, p: Pick): string {
  return `${eventId}.${channelKey(p.waveformId)}.${p.phaseHint}`;
}

/**
 * The sites' traces for reading misfits again (reread.ts), prepared as for picking: `locations` gives
 * where each site is, `sosFor` the filter for a sample rate. Sites without a location are left out.
 */
export function rereadSites(
  sites: ReadonlyMap<string, PickSite>, locations: ReadonlyMap<string, SiteLocation>, sosFor: (sampleRate: number) => Float64Array,
): Map<string, RereadSite> {
  const out = new Map<string, RereadSite>();
  const rateAt = (segments: readonly Segment[], t: Micros) => segmentAt(segments, t)?.sampleRate ?? null;
  for (const [key, site] of sites) {
    const location = locations.get(key);
    if (!location) continue;
    out.set(key, {
      location,
      vertical: (t) => {
        const rate = rateAt(site.vertical.segments, t);
        return rate === null ? null : verticalTrace(site, sosFor(rate), t);
      },
      horizontals: site.horizontals
        ? (t) => {
          const rate = rateAt(site.horizontals![0].segments, t);
          return rate === null ? null : horizontalTraces(site, sosFor(rate), t);
        }
        : null,
    });
  }
  return out;
}
