// Marker layout under FAA and ICAO rules: the public entry point of lib/markers.
export {
  layoutMarkers,
  minimumMarkerCount,
  parseMarkerLayoutRequest,
  markerLayoutRequestRulesSchema,
  markerLayoutRulesSchema,
  MarkerLayoutValidationError,
  type ParsedMarkerLayoutRequest,
  type ValidationIssue,
} from "./layout";
export { litMarkerSuitability } from "./lit";
export { faaColourSequence, icaoColourSequence } from "./colours";
export { DEFAULT_RULES, FAA_RULES, ICAO_RULES, faaMaxSpacing, icaoMaxSpacing, ruleTablesSchema, type RuleSpacing, type RuleTables } from "./rules";
export { supportLevelCount, supportStructureLighting, type SupportLight, type SupportLightCount, type SupportLighting } from "./support-lights";
