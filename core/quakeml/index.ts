/** QuakeML 1.2: the events, picks and origins Daybreak writes and reads. */
export * from './types';
export { writeQuakeMl, xmlEscape, QUAKEML_BED_NS, QUAKEML_NS, type QuakeMlWriteOptions } from './write';
export { readQuakeMl, QuakeMlError } from './read';
export { originFromHypocentre, type OriginLabels } from './fromHypocentre';
export { pickComment, readPickComment } from './pickComment';
export { preferredOrigin } from './preferred';
