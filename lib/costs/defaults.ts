// Starting figures for the demo and for new options. INVENTED demo defaults: plausible
// orders of magnitude made up for this project, not published prices or rates. Every
// consumer should show DEMO_DEFAULTS_LABEL next to them and let the user replace them.
import type {
  Feasibility,
  InstallationMethod,
  LightingOption,
  OptionKind,
} from "../../shared/cost-schemas";

export const DEMO_DEFAULTS_LABEL = "Invented demo defaults, not published figures: replace them with quotes.";

export interface InstallationDefaults {
  mobilisation: number;
  ratePerHour: number;
  minutesPerUnit: number;
  /** Whether this method usually needs the line out of service (invented). */
  outageTypicallyNeeded: boolean;
  /** Invented cost of the outage per visit when one is needed. */
  outageCost: number;
  note: string;
}

/** Invented demo defaults per installation method. */
export const DEMO_INSTALLATION_DEFAULTS: Readonly<Record<InstallationMethod, InstallationDefaults>> = {
  helicopter: {
    mobilisation: 12_000,
    ratePerHour: 4_500,
    minutesPerUnit: 20,
    outageTypicallyNeeded: false,
    outageCost: 0,
    note: "Aerial crew; fast per marker and reaches long crossings (invented figures).",
  },
  "bucket-truck": {
    mobilisation: 2_500,
    ratePerHour: 450,
    minutesPerUnit: 60,
    outageTypicallyNeeded: true,
    outageCost: 8_000,
    note: "Only where the span is reachable from the ground (invented figures).",
  },
  crane: {
    mobilisation: 6_000,
    ratePerHour: 900,
    minutesPerUnit: 75,
    outageTypicallyNeeded: true,
    outageCost: 8_000,
    note: "Heavy lift from a road or pad beside the span (invented figures).",
  },
  barge: {
    mobilisation: 15_000,
    ratePerHour: 1_800,
    minutesPerUnit: 90,
    outageTypicallyNeeded: true,
    outageCost: 12_000,
    note: "River crossings; slow positioning under each marker (invented figures).",
  },
  "ground-crew": {
    mobilisation: 1_500,
    ratePerHour: 600,
    minutesPerUnit: 120,
    outageTypicallyNeeded: true,
    outageCost: 8_000,
    note: "Line crew working from the structures (invented figures).",
  },
};

export interface OptionKindDefaults {
  unitPrice: number;
  annualMaintenancePerUnit: number;
  serviceLifeYears: number;
  method: InstallationMethod;
  note: string;
}

/** Invented demo defaults per option kind (service lives follow the common-practice ranges noted). */
export const DEMO_OPTION_DEFAULTS: Readonly<Record<OptionKind, OptionKindDefaults>> = {
  "line-powered": {
    unitPrice: 6_500,
    annualMaintenancePerUnit: 40,
    serviceLifeYears: 20,
    method: "helicopter",
    note: "Lit marker fed by the conductor's current; life 20 years, inside the 15–25 years of common practice.",
  },
  solar: {
    unitPrice: 4_200,
    annualMaintenancePerUnit: 150,
    serviceLifeYears: 10,
    method: "helicopter",
    note: "Solar-charged lit marker; battery and panel upkeep (invented figures).",
  },
  "structure-supply": {
    unitPrice: 9_000,
    annualMaintenancePerUnit: 350,
    serviceLifeYears: 25,
    method: "ground-crew",
    note: "Lights on the structures fed from a local supply; unit = one light (invented figures).",
  },
  unlit: {
    unitPrice: 900,
    annualMaintenancePerUnit: 10,
    serviceLifeYears: 25,
    method: "helicopter",
    note: "Plain marker spheres; no light at night (invented figures).",
  },
};

export const DEMO_HORIZON_YEARS = 40;
export const DEMO_DISCOUNT_RATE = 0.08;

export interface DemoOptionRequest {
  kind: OptionKind;
  units: number;
  method?: InstallationMethod;
  name?: string;
  id?: string;
  feasibility?: Feasibility;
  horizonYears?: number;
  discountRate?: number;
}

/** A complete option filled with the invented demo defaults for its kind and method. */
export function demoOption(request: DemoOptionRequest): LightingOption {
  const kindDefaults = DEMO_OPTION_DEFAULTS[request.kind];
  const method = request.method ?? kindDefaults.method;
  const install = DEMO_INSTALLATION_DEFAULTS[method];
  return {
    id: request.id,
    name: request.name ?? `${request.kind} by ${method}`,
    kind: request.kind,
    units: request.units,
    unitPrice: kindDefaults.unitPrice,
    installation: {
      method,
      mobilisation: install.mobilisation,
      ratePerHour: install.ratePerHour,
      minutesPerUnit: install.minutesPerUnit,
    },
    outage: { needed: install.outageTypicallyNeeded, cost: install.outageCost },
    annualMaintenance: kindDefaults.annualMaintenancePerUnit * request.units,
    serviceLifeYears: kindDefaults.serviceLifeYears,
    horizonYears: request.horizonYears ?? DEMO_HORIZON_YEARS,
    discountRate: request.discountRate ?? DEMO_DISCOUNT_RATE,
    feasibility: request.feasibility ?? { status: "unknown", justification: "Not yet assessed." },
  };
}
