/**
 * The trace filters the desk offers (keys 1-7), and the one a dataset opens with.
 */
import type { FilterRequest } from '../core/dsp/designForChannel';
import { choosePreset } from '../core/scan/presetChoice';
import { NEAR_SCAN_SETTINGS } from '../core/scan/settings';

export interface FilterPreset { label: string; filter: FilterRequest | null }

export const FILTER_PRESETS: FilterPreset[] = [
  { label: 'as recorded', filter: null },
  { label: '1\u201320 Hz', filter: { kind: 'bandpass', order: 4, corners: [1, 20] } },
  { label: '2\u201315 Hz', filter: { kind: 'bandpass', order: 4, corners: [2, 15] } },
  { label: '5\u201340 Hz', filter: { kind: 'bandpass', order: 4, corners: [5, 40] } },
  { label: '0.5\u20135 Hz', filter: { kind: 'bandpass', order: 4, corners: [0.5, 5] } },
  { label: 'above 1 Hz', filter: { kind: 'highpass', order: 4, corners: 1 } },
  // The band of the scan's near-source settings (core/scan/settings.ts).
  { label: '5\u2013150 Hz', filter: NEAR_SCAN_SETTINGS.filter },
];

/** The preset a dataset opens with: 1-20 Hz, or 5-150 Hz for a near-source network. */
export const LOCAL_FILTER_INDEX = 1;
export const NEAR_FILTER_INDEX = 6;

/**
 * The filter preset a dataset opens with, from its sites' positions: the band of the scan's `near`
 * settings (5-150 Hz) when core/scan/presetChoice judges the network near-source (sites within 3 km
 * of each other in the median: mines, dams, injection sites, whose onsets a 20 Hz corner would smear
 * over most of their P travel time), else 1-20 Hz for local earthquakes. Fewer than two sites with
 * coordinates: 1-20 Hz.
 */
export function defaultFilterIndex(sites: readonly { latitude: number; longitude: number }[]): number {
  if (sites.length < 2) return LOCAL_FILTER_INDEX;
  try {
    return choosePreset(sites).preset === 'near' ? NEAR_FILTER_INDEX : LOCAL_FILTER_INDEX;
  } catch {
    return LOCAL_FILTER_INDEX; // coordinates out of range: the metadata reader has reported them
  }
}
