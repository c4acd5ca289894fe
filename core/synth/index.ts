/** Synthetic seismograms and the invented demo scenario: the public API of core/synth. */
export type { ChannelSpec, EventSpec, EventType, FaultSpec, Scenario, StationNoise, StationSpec } from './types';
export { demoScenario, DEMO_CENTRE, DEMO_END, DEMO_MODEL, DEMO_NETWORK, DEMO_SEED, DEMO_START } from './demo';
export { renderStation, stationEvents, type RenderedChannel, type RenderedStation, type RenderOptions } from './render';
export { eventAtStation, type EventAtStation, type WaveArrival } from './arrivals';
export { channelFiles, RECORD_LENGTH, type MiniSeedFile } from './files';
export { scenarioInventory } from './inventory';
export { measureSnr, scenarioTruth, stationTruth, type Truth, type TruthArrival, type TruthEvent } from './truth';
export { localMagnitude, woodAndersonAmplitudeNm, woodAndersonResponse, WOOD_ANDERSON_GAIN } from './mlLaw';
export { IASPEI_LAW_TEXT } from './lawText';
export { doubleCoupleRadiation, type Mechanism, type Radiation } from './radiation';
export { bruneCornerFrequency, bruneSpectrum, momentFromMagnitude } from './source';
export { componentOf, distanceAzimuth, rayMotion, type Motion } from './geometry';
export { instrumentResponse, type Instrument } from './response';
export { synthesizePulse, type PulseOutput, type PulseSpec } from './pulse';
export { Rng } from './random';
