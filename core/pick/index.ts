// Detection and automatic picking: STA/LTA triggers, network coincidence, AIC onsets for P and S.
export type {
  CandidateEvent, EvaluationMode, EvaluationStatus, PhaseHint, Pick, PickOnset, PickPolarity,
  StationTrigger, Trace, TriggerEnd,
} from './types';
export { type CharacteristicFunction, CHARACTERISTIC_FUNCTIONS, envelopeWeight } from './characteristic';
export {
  LOCAL_EARTHQUAKE_STA_LTA, type StaLtaForm, type StaLtaOptions, StaLtaDetector, StaLtaRatio,
  channelTriggers, resolveStaLtaOptions, staLtaRatio, staLtaTriggers, windowSamples,
} from './staLta';
export { type AicResult, autocorrelationTime, jointAic, maedaAic } from './aic';
export {
  firstMotion, LOCAL_EARTHQUAKE_ONSET, LOCAL_EARTHQUAKE_S_WINDOW, type OnsetOptions, pickP, pickS, pickStation,
  type StationTraces,
  resolveOnsetOptions, sWindow, type SWindowOptions,
} from './onset';
export {
  coincidence, type CoincidenceOptions, DEFAULT_COINCIDENCE, idTime, type PredictedArrivals, siteDistanceKm, type SitePosition,
  unexplainedTriggers,
} from './coincidence';
export { afterFront, earliestFront } from './front';
export { chooseSiteStreams, type SiteStream } from './streams';
export { LOCAL_EARTHQUAKE, LOCAL_EARTHQUAKE_BUSY, NEAR_FIELD_MICROSEISMIC, type PickingPreset } from './presets';
export { type EventPickOptions, type EventSite, horizontalShare, type OriginPick, LOCAL_EVENT_PICKING, pickEventSites } from './eventSites';
