/**
 * The scenario's station metadata as a StationXML inventory (core/stationxml types): per channel
 * the coordinates, orientation, sample rate and a two-stage response, sensor (poles and zeros,
 * V per ground-motion unit) and digitizer (counts per V, a unity DIGITAL coefficients stage with
 * its decimation block), and the overall sensitivity. Counts convert to ground motion with it.
 *
 * The metadata describe the stations as they are meant to be: a channel with reversed polarity in
 * the scenario's faults is still described as normal, as happens when a sensor is wired the wrong
 * way round (the analyst finds out from the first motions).
 */
import type { ChannelMeta, Inventory, StationMeta } from '../stationxml/types';
import { microsFromIso, type Micros } from '../time';
import { normalizationFactor, sensitivity } from './response';
import type { Scenario } from './types';

/** Start of every station and channel epoch in the scenario's metadata. */
export const DEMO_EPOCH_START: Micros = microsFromIso('2024-06-01T00:00:00Z');

export function scenarioInventory(sc: Scenario, created: Micros = sc.start): Inventory {
  const stations: StationMeta[] = sc.stations.map((st) => {
    const channels: ChannelMeta[] = st.channels.map((c) => {
      const inst = c.instrument;
      const units = inst.inputUnits;
      return {
        id: { network: sc.network.code, station: st.code, location: c.location, channel: c.code },
        start: DEMO_EPOCH_START, end: null,
        latitude: st.latitude, longitude: st.longitude, elevation: st.elevationM, depth: 0,
        azimuth: c.azimuth, dip: c.dip, sampleRate: c.sampleRate, sensor: inst.description,
        sensitivity: { value: sensitivity(inst), frequency: inst.normalizationHz, inputUnits: units, outputUnits: 'count', sign: 1 },
        stages: [
          {
            number: 1, inputUnits: units, outputUnits: 'V', decimation: null,
            gain: { value: inst.sensorGain, frequency: inst.normalizationHz },
            filter: {
              kind: 'polesZeros', transferFunction: 'LAPLACE (RADIANS/SECOND)',
              normalizationFactor: normalizationFactor(inst.poles, inst.zeros, inst.normalizationHz),
              normalizationFrequency: inst.normalizationHz,
              zeros: inst.zeros.map((z) => ({ re: z.re, im: z.im })),
              poles: inst.poles.map((p) => ({ re: p.re, im: p.im })),
            },
          },
          {
            number: 2, inputUnits: 'V', outputUnits: 'count',
            gain: { value: inst.digitizerGain, frequency: inst.normalizationHz },
            filter: { kind: 'coefficients', transferFunction: 'DIGITAL', numerator: [1], denominator: [] },
            decimation: { inputSampleRate: c.sampleRate, factor: 1, offset: 0, delay: 0, correction: 0 },
          },
        ],
      };
    });
    return {
      code: st.code, start: DEMO_EPOCH_START, end: null, latitude: st.latitude, longitude: st.longitude,
      elevation: st.elevationM, site: st.site, channels,
    };
  });
  return {
    schemaVersion: '1.2', source: 'Daybreak synthetic scenario (invented)', created,
    networks: [{ code: sc.network.code, description: sc.network.description, start: DEMO_EPOCH_START, end: null, stations }],
  };
}
