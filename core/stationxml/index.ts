/** FDSN StationXML: reading, writing and matching channels to their metadata. */
export * from './types';
export { parseStationXml, parseXsDateTime } from './parse';
export { writeStationXml } from './write';
export {
  channelsOf, epochCovers, findChannel, isStateOfHealthChannel, missingMetadata,
  type DataChannel, type MissingMetadata, type MissingMetadataReport,
} from './channels';
