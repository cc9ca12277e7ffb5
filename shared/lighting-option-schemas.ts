// The form for one lighting option of a crossing. Flat, so error paths are the field names.
// Money in the crossing's cost currency; the discount rate is entered in per cent.
import { z } from "zod";
import { FEASIBILITY_STATUSES, INSTALLATION_METHODS, OPTION_KINDS, type InstallationMethod, type OptionKind } from "./cost-schemas";
import { nameField, textField } from "./fields";

export const OPTION_KIND_LABELS: Record<OptionKind, string> = {
  "line-powered": "Line-powered lit markers",
  solar: "Solar-powered lit markers",
  "structure-supply": "Lights on the supports with a power supply",
  unlit: "Unlit markers only",
};

export const INSTALLATION_METHOD_LABELS: Record<InstallationMethod, string> = {
  helicopter: "Helicopter",
  "bucket-truck": "Bucket truck",
  crane: "Crane",
  barge: "Barge",
  "ground-crew": "Ground crew",
};

const money = (what: string) => z.number({ error: `Enter ${what} as a number.` }).finite().nonnegative(`${what} must not be negative.`).max(1e9, `${what} is not plausible.`);
const years = (what: string) => z.number({ error: `Enter ${what} in whole years.` }).int(`${what} must be whole years.`).min(1, `${what} is at least 1 year.`).max(100, `${what} is at most 100 years.`);

export const lightingOptionFormSchema = z
  .object({
    name: nameField("Enter a name.", 120, "Keep the name under 120 characters."),
    kind: z.enum(OPTION_KINDS, { error: "Choose the kind of option." }),
    /** Empty: the count of the crossing's layout — markers, or for lights on the supports the support-light layout's lights. */
    units: z.number({ error: "Enter the number of units." }).int("Units are a whole number.").positive("At least one unit.").max(10_000, "Units are not plausible.").optional(),
    unitPrice: money("The unit price"),
    installationMethod: z.enum(INSTALLATION_METHODS, { error: "Choose an installation method." }),
    mobilisation: money("Mobilisation"),
    ratePerHour: money("The hourly rate"),
    minutesPerUnit: money("Minutes per unit"),
    outageNeeded: z.boolean().default(false),
    outageCost: money("The outage cost").default(0),
    annualMaintenance: money("Annual maintenance"),
    serviceLifeYears: years("Service life"),
    horizonYears: years("The horizon"),
    discountRatePercent: z.number({ error: "Enter the discount rate in %." }).finite().min(0, "The rate must not be negative.").max(100, "At most 100 %."),
    feasibilityStatus: z.enum(FEASIBILITY_STATUSES, { error: "Choose a feasibility status." }).optional(),
    feasibilityJustification: textField(2000, "Keep it under 2,000 characters.").optional(),
  })
  .superRefine((o, ctx) => {
    const issue = (path: string, message: string) => ctx.addIssue({ code: "custom", path: [path], message });
    if (o.kind !== "line-powered") {
      if (!o.feasibilityStatus) issue("feasibilityStatus", "State whether this option is feasible here.");
      if (!o.feasibilityJustification) issue("feasibilityJustification", "Say why (a sentence is enough).");
    }
    if (!o.outageNeeded && o.outageCost > 0) issue("outageCost", "An outage cost is given but no outage is needed.");
  });
export type LightingOptionFormInput = z.infer<typeof lightingOptionFormSchema>;

export const OPTION_NUMBER_FIELDS = [
  "units",
  "unitPrice",
  "mobilisation",
  "ratePerHour",
  "minutesPerUnit",
  "outageCost",
  "annualMaintenance",
  "serviceLifeYears",
  "horizonYears",
  "discountRatePercent",
] as const;

/** Submitted fields (strings; empty = not stated; a ticked checkbox sends "on") → schema input. */
export function lightingOptionFormToInput(form: Record<string, unknown>): Record<string, unknown> {
  const out: Record<string, unknown> = { ...form };
  for (const key of OPTION_NUMBER_FIELDS) {
    const v = form[key];
    if (v === "" || v == null) delete out[key];
    else if (typeof v === "string") out[key] = Number(v.trim().replace(/[\s,](?=\d{3}\b)/g, "").replace(",", "."));
  }
  for (const key of ["feasibilityStatus", "feasibilityJustification"]) if (form[key] === "" || form[key] == null) delete out[key];
  out.outageNeeded = form.outageNeeded === "on" || form.outageNeeded === "true";
  return out;
}

/** An option as the pages show and edit it. */
export interface LightingOptionValues {
  id?: number;
  name: string;
  kind: OptionKind;
  units: number | null;
  unitPrice: number;
  installationMethod: InstallationMethod;
  mobilisation: number;
  ratePerHour: number;
  minutesPerUnit: number;
  outageNeeded: boolean;
  outageCost: number;
  annualMaintenance: number;
  serviceLifeYears: number;
  horizonYears: number;
  discountRatePercent: number;
  feasibilityStatus: (typeof FEASIBILITY_STATUSES)[number] | null;
  feasibilityJustification: string | null;
}
