// Lighting options' life-cycle cost and comparison: the entry point of lib/costs.
export {
  crf,
  presentWorthOfSeries,
  presentWorthOfAmount,
  installationCost,
  replacementYears,
  presentValueOfOption,
} from "./lifecycle";
export { compareOptions, type CompareOptionsSettings } from "./compare";
export {
  DEMO_DEFAULTS_LABEL,
  DEMO_INSTALLATION_DEFAULTS,
  DEMO_OPTION_DEFAULTS,
  DEMO_HORIZON_YEARS,
  DEMO_DISCOUNT_RATE,
  demoOption,
  type DemoOptionRequest,
  type InstallationDefaults,
  type OptionKindDefaults,
} from "./defaults";
