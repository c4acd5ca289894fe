// Public API of core/dsp: filter design and filtering, trace preparation, rotation, spectrum.
export { type FilterKind, type Corners, MIN_ORDER, MAX_ORDER, butterworth, butterworthZpk, checkFilterSpec } from './butterworth';
export { type FilterRequest, type ChannelFilter, DEFAULT_NYQUIST_FRACTION, designForChannel } from './designForChannel';
export { type Zpk, butterworthPrototype, prewarp, lowpassToLowpass, lowpassToHighpass, lowpassToBandpass, bilinear } from './zpk';
export { zpkToSos } from './zpkToSos';
export { sosMagnitude } from './sosMagnitude';
export { type Complex } from './complex';
export { type SosfiltOptions, sosfilt, sosfiltZi, sectionCount } from './sosfilt';
export { type SosfiltfiltOptions, sosfiltfilt, defaultPadLength } from './sosfiltfilt';
export { type SegmentFilterOptions, filterSegments } from './filterSegments';
export { demean, detrend } from './detrend';
export { cosineTaper, cosineTaperWeights } from './taper';
export { type DespikeOptions, type DespikeResult, despike } from './despike';
export { MIN_SIN_BETWEEN_AXES, rotateToNorthEast, rotateToRadialTransverse } from './rotate';
export { MIN_VERTICAL_DIP, verticalPolarity, applyPolarity } from './polarity';
export { type WindowName, type SpectrumOptions, type AmplitudeSpectrum, amplitudeSpectrum, windowWeights } from './spectrum';
