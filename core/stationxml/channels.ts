/**
 * Matching waveform channels to their metadata: by SEED codes and by the epoch in force at a time,
 * and the report of data channels that have no metadata.
 */
import { channelKey, type ChannelId } from '../model';
import type { Micros } from '../time';
import type { ChannelMeta, Inventory } from './types';

/** Every channel epoch of the inventory, in document order. */
export function channelsOf(inv: Inventory): ChannelMeta[] {
  const out: ChannelMeta[] = [];
  for (const n of inv.networks) for (const s of n.stations) for (const c of s.channels) out.push(c);
  return out;
}

/** Channel epochs by "NET.STA.LOC.CHA", each list sorted by start (an open start first). */
const indexes = new WeakMap<Inventory, Map<string, ChannelMeta[]>>();

function indexOf(inv: Inventory): Map<string, ChannelMeta[]> {
  let index = indexes.get(inv);
  if (index) return index;
  index = new Map();
  for (const c of channelsOf(inv)) {
    const key = channelKey(c.id);
    const list = index.get(key);
    if (list) list.push(c);
    else index.set(key, [c]);
  }
  for (const list of index.values()) list.sort((a, b) => (a.start ?? -Infinity) - (b.start ?? -Infinity));
  indexes.set(inv, index);
  return index;
}

/** True when the epoch is in force at `t`: start <= t < end (an open start or end imposes nothing). */
export function epochCovers(c: ChannelMeta, t: Micros): boolean {
  return (c.start === null || c.start <= t) && (c.end === null || t < c.end);
}

/** True when the epoch overlaps the closed span [from, to]. */
function epochOverlaps(c: ChannelMeta, from: Micros, to: Micros): boolean {
  return (c.start === null || c.start <= to) && (c.end === null || from < c.end);
}

/**
 * The channel epoch in force for `id` at time `t` (µs): same network, station, location and channel
 * codes (compared exactly, as miniSEED and StationXML both write them without padding), with
 * start <= t < end. When epochs overlap (faulty metadata), the one that started last wins.
 */
export function findChannel(inv: Inventory, id: ChannelId, t: Micros): ChannelMeta | undefined {
  if (!Number.isFinite(t)) throw new RangeError(`time must be finite microseconds, got ${t}`);
  const list = indexOf(inv).get(channelKey(id));
  if (!list) return undefined;
  for (let i = list.length - 1; i >= 0; i--) if (epochCovers(list[i], t)) return list[i];
  return undefined;
}

/**
 * True for channels that carry logs or station state of health rather than ground motion, which
 * are reported quietly when they have no metadata. By the SEED Reference Manual v2.4 appendix A
 * (restated in the FDSN Source Identifiers specification, "Channel codes"): the reserved codes LOG
 * (console log) and SOH; band codes A (administrative, e.g. ACE clock errors) and O (opaque, e.g.
 * OCF configuration); instrument codes E (electronic test point), K (temperature), I (humidity) and
 * M (mass position). LCQ and LCE (clock quality and clock phase error) are added as common practice
 * (dataloggers write them although C is officially the calibration-input instrument code).
 */
export function isStateOfHealthChannel(channel: string): boolean {
  const c = channel.toUpperCase();
  if (c === 'LOG' || c === 'SOH' || c === 'LCQ' || c === 'LCE') return true;
  if (c.length !== 3) return false;
  const band = c[0];
  const instrument = c[1];
  return band === 'A' || band === 'O' || 'EKIM'.includes(instrument);
}

/** Data seen for a channel: its codes and, when known, the time span of its samples (µs). */
export interface DataChannel {
  readonly id: ChannelId;
  readonly start?: Micros;
  readonly end?: Micros;
}

/** A data channel that has no metadata. */
export interface MissingMetadata {
  readonly id: ChannelId;
  /** "NET.STA.LOC.CHA". */
  readonly key: string;
  /** 'no-channel': no epoch with these codes; 'no-epoch': epochs exist, none overlaps the data. */
  readonly reason: 'no-channel' | 'no-epoch';
}

/** Data channels without metadata, once per channel, waveforms apart from logs and state of health. */
export interface MissingMetadataReport {
  /** Ground-motion (and other waveform) channels: report these to the analyst. */
  readonly waveforms: MissingMetadata[];
  /** Log and state-of-health channels ({@link isStateOfHealthChannel}): list quietly. */
  readonly stateOfHealth: MissingMetadata[];
}

/**
 * Which data channels have no metadata. A channel has metadata when an epoch with its codes
 * overlaps its data span (or, without a span, when any epoch has its codes). Several entries for the
 * same channel (e.g. one per segment) give one report: the channel is missing only when none of its
 * spans is covered, and it is reported once, in the order first seen.
 */
export function missingMetadata(inv: Inventory, data: readonly DataChannel[]): MissingMetadataReport {
  if (!Array.isArray(data)) throw new TypeError('data must be an array of { id, start?, end? }');
  const index = indexOf(inv);
  const order: string[] = [];
  const verdict = new Map<string, MissingMetadata | null>();
  for (const d of data) {
    const key = channelKey(d.id);
    if (!verdict.has(key)) order.push(key);
    if (verdict.get(key) === null) continue;
    const list = index.get(key);
    let found: MissingMetadata | null;
    if (!list) found = { id: d.id, key, reason: 'no-channel' };
    else if (d.start === undefined) found = null;
    else {
      const to = d.end ?? d.start;
      found = list.some((c) => epochOverlaps(c, d.start as Micros, to)) ? null : { id: d.id, key, reason: 'no-epoch' };
    }
    verdict.set(key, found);
  }
  const waveforms: MissingMetadata[] = [];
  const stateOfHealth: MissingMetadata[] = [];
  for (const key of order) {
    const m = verdict.get(key);
    if (!m) continue;
    (isStateOfHealthChannel(m.id.channel) ? stateOfHealth : waveforms).push(m);
  }
  return { waveforms, stateOfHealth };
}
