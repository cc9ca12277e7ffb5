// Marker layout under FAA and ICAO rules: the public entry point of lib/markers.
export {
  layoutMarkers,
  minimumMarkerCount,
  parseMarkerLayoutRequest,
  markerLayoutRequestRulesSchema,
  MarkerLayoutValidationError,
  type ParsedMarkerLayoutRequest,
  type ValidationIssue,
} from "./layout";
export { litMarkerSuitability } from "./lit";
export { faaColourSequence, icaoColourSequence } from "./colours";
export { FAA_RULES, ICAO_RULES, faaMaxSpacing, icaoMaxSpacing, type RuleSpacing } from "./rules";
