// Public API of core/magnitude: instrument response, its removal, Wood-Anderson simulation, local magnitude.
export {
  type GroundMotion, type ResponseOptions, type ChannelResponse, MOTION_ORDER,
  groundMotionOf, parseGroundUnits, channelResponse, responseAt, sensitivityCheck, oscillatorPoles, normalizationFactorOf,
} from './response';
export { type FrequencyResponse, type RemovalOptions, cosinePreFilter, checkPreFilter, removeResponse } from './removeResponse';
export {
  type WoodAndersonStandard, type WoodAndersonOptions, WOOD_ANDERSON_2080, WOOD_ANDERSON_2800,
  woodAndersonPolesZeros, woodAndersonResponse, defaultWoodAndersonPreFilter, simulateWoodAnderson,
} from './woodAnderson';
export {
  type MagnitudeScale, type LocalCalibration, IASPEI_2013, HUTTON_BOORE_1987, RICHTER_1935, RICHTER_TABLE,
  distanceCorrection, amplitudeInScaleUnits, localMagnitudeOf, richterMinusLogA0, calibratedScale,
} from './scales';
export {
  type AmplitudeMeasure, type TimeWindow, type PeakAmplitude, type WindowFromPicks, type WindowFromOrigin,
  windowFromPicks, windowFromOrigin, windowIndices, measurePeak, reachesFullScale,
} from './amplitude';
export {
  type HorizontalTrace, type AmplitudeOptions, type WoodAndersonAmplitude, type StationDistance, type MagnitudeOptions,
  type ChannelMagnitude, type StationMagnitude, type NetworkMagnitude,
  measureWoodAndersonAmplitude, localMagnitude, median,
} from './localMagnitude';
export {
  type DurationCoefficients, type CodaOptions, type CodaDuration, LEE_BENNETT_MEAGHER_1972, durationMagnitude, codaDuration,
} from './durationMagnitude';
export { type EventPosition, type StationPosition, stationDistance } from './distance';
export {
  type MagnitudeOrigin, type MagnitudeStation, type EventMagnitudeOptions, type EventMagnitude, type StationWindows,
  eventMagnitude, magnitudeOrigin, stationWindows,
} from './eventMagnitude';
