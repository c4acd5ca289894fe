// Public API of the location area: velocity model, travel times, projection, Geiger location, Wadati.
export {
  DEFAULT_MODEL, VelocityModelError, checkVelocityModel, parseVelocityModel, velocityModelJson,
  type VelocityLayer, type VelocityModel,
} from './velocityModel';
export { allArrivals, firstArrival, firstArrivalInto, type TravelTime, type Wave } from './travelTime';
export { START_TABLE_GRID, TravelTimeTable, startTable, type TravelTimeTableGrid } from './travelTimeTable';
export {
  MEAN_EARTH_RADIUS_KM, fromLocalKm, kmToDegrees, localProjection, toLocalKm, type LocalProjection,
} from './projection';
export {
  ELLIPSE_68_CONFIDENCE, ELLIPSE_68_SCALE, MIN_PHASES, QUESTIONABLE_FACTOR, azimuthDeg, azimuthalGapDeg, locate,
  type ArrivalResidual, type ErrorEllipse, type GeigerOptions, type Hypocentre, type LocateFailure, type LocateResult,
  type LocationPick, type LocationStation,
} from './geiger';
export { WADATI_MIN_STATIONS, spEpicentralKm, spHypocentralKm, wadati, type WadatiFit, type WadatiPoint, type WadatiResult } from './wadati';
export {
  locateReviewEvent, predictedArrivals, siteLocations, siteOfChannel, spCircles, spPairs, verticalAverageSpeeds, wadatiOfEvent,
  type OriginPoint, type PredictedArrival, type ReviewArrival, type ReviewLocateFailure, type ReviewLocateOptions,
  type ReviewLocateResult, type ReviewLocation, type SiteLocation, type SkippedPick, type SpCircle,
} from './fromReview';
export { FIXED_DEPTH_MAX_KM, FIXED_DEPTH_MIN_KM, parseDepthInput, setFixedDepth, type DepthInput } from './reviewDepth';
