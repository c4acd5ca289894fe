/** The caution shown in the app (footer, about box) and carried by every export (QuakeML, CSV, reports). */
export const CAUTION =
  'Automatic and reviewed results are preliminary: they are not a substitute for the bulletin of the ' +
  'responsible agency nor a basis for any life-safety decision. Follow local regulations and licensed practice.';
