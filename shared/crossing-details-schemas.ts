// A crossing's span and marking details (the "Span and marking details" form and its stored
// shape). All lengths are in the crossing's span unit (ft or m); the sphere diameter in in/cm.
// Heights are measured from the support bases, taken as one level; `surfaceLevel` places the
// ground or water under the span on that same scale (negative = below the support bases).
import { z } from "zod";
import { ICAO_MARKER_COLOURS, RULE_SETS, type IcaoMarkerColour, type RuleSet } from "./marker-schemas";
import { DIAMETER_UNITS, type DiameterUnit } from "./units";

export const HIGHEST_WIRES = ["shield", "phase"] as const;
export type HighestWire = (typeof HIGHEST_WIRES)[number];
export const HIGHEST_WIRE_LABELS: Record<HighestWire, string> = {
  shield: "Shield (static) wire, not energized",
  phase: "A phase conductor (energized)",
};

export const SAG_KINDS = ["midspan-sag", "lowest-clearance"] as const;
export type SagKind = (typeof SAG_KINDS)[number];
export const SAG_KIND_LABELS: Record<SagKind, string> = {
  "midspan-sag": "Mid-span sag below the chord",
  "lowest-clearance": "Lowest conductor clearance above ground/water",
};

export const LIT_PHASES = ["A", "B", "C"] as const;
export type LitPhase = (typeof LIT_PHASES)[number];

export const RULE_SET_LABELS: Record<RuleSet, string> = {
  faa: "FAA AC 70/7460-1",
  icao: "ICAO Annex 14 Vol. I ch. 6",
};

/** The details as stored and sent to pages; null = not stated. */
export interface CrossingDetails {
  supportHeightA: number | null;
  supportHeightB: number | null;
  attachmentHeightA: number | null;
  attachmentHeightB: number | null;
  sagKind: SagKind | null;
  sagValue: number | null;
  surfaceLevel: number | null;
  highestWire: HighestWire | null;
  wireSeparation: number | null;
  /** Wires side by side at the highest point (null = one). */
  topWireCount: number | null;
  /** Their horizontal separation, in the span's unit (null = not stated). */
  topWireSeparation: number | null;
  runwayEndDistance: number | null;
  runwayEndCriticalArea: boolean;
  ruleSet: RuleSet;
  markerDiameter: { value: number; unit: DiameterUnit } | null;
  icaoColour: IcaoMarkerColour;
  litPhase: LitPhase | null;
  costCurrency: string;
}

const MAX_HEIGHT = 5_000;
const height = (what: string) =>
  z.number({ error: `Enter ${what} as a number.` }).finite().positive(`${what} must be above 0.`).max(MAX_HEIGHT, `${what} is not plausible.`);
const nonNegative = (what: string) =>
  z.number({ error: `Enter ${what} as a number.` }).finite().nonnegative(`${what} must not be negative.`).max(100_000, `${what} is not plausible.`);

/** Flat, so each error path is the form field's name. */
export const crossingDetailsSchema = z
  .object({
    supportHeightA: height("Support A height").optional(),
    supportHeightB: height("Support B height").optional(),
    attachmentHeightA: height("Attachment height A").optional(),
    attachmentHeightB: height("Attachment height B").optional(),
    sagKind: z.enum(SAG_KINDS, { error: "Choose how the sag is given." }).optional(),
    sagValue: height("The sag or clearance").optional(),
    surfaceLevel: z.number({ error: "Enter the level as a number." }).finite().min(-MAX_HEIGHT, "Level is not plausible.").max(MAX_HEIGHT, "Level is not plausible.").optional(),
    highestWire: z.enum(HIGHEST_WIRES, { error: "Choose shield or phase." }).optional(),
    wireSeparation: nonNegative("The separation").optional(),
    topWireCount: z.number({ error: "Enter the number of wires at the highest point." }).int("A whole number of wires.").min(1, "At least one wire.").max(12, "At most 12 wires at the highest point.").optional(),
    topWireSeparation: nonNegative("The separation of the wires at the highest point").optional(),
    runwayEndDistance: nonNegative("The distance").optional(),
    runwayEndCriticalArea: z.boolean().default(false),
    ruleSet: z.enum(RULE_SETS, { error: "Rule set is faa or icao." }).default("faa"),
    markerDiameterValue: z.number({ error: "Enter the diameter as a number." }).finite().positive("Diameter must be above 0.").max(500, "Diameter is not plausible.").optional(),
    markerDiameterUnit: z.enum(DIAMETER_UNITS, { error: "Unit is in or cm." }).optional(),
    icaoColour: z.enum(ICAO_MARKER_COLOURS, { error: "Colour is red or orange." }).default("red"),
    litPhase: z.enum(LIT_PHASES, { error: "Phase is A, B or C." }).optional(),
    costCurrency: z
      .string()
      .trim()
      .toUpperCase()
      .regex(/^[A-Z]{3}$/, "Use a three-letter ISO 4217 code such as USD or EUR.")
      .default("USD"),
  })
  .superRefine((d, ctx) => {
    const issue = (path: string, message: string) => ctx.addIssue({ code: "custom", path: [path], message });
    for (const end of ["A", "B"] as const) {
      const support = d[`supportHeight${end}`];
      const attachment = d[`attachmentHeight${end}`];
      if (support !== undefined && attachment !== undefined && attachment > support) {
        issue(`attachmentHeight${end}`, `The attachment at support ${end} cannot be above the support's top (${support}).`);
      }
    }
    if ((d.sagKind === undefined) !== (d.sagValue === undefined)) {
      issue(d.sagValue === undefined ? "sagValue" : "sagKind", "Give both how the sag is stated and its value, or neither.");
    }
    if ((d.markerDiameterValue === undefined) !== (d.markerDiameterUnit === undefined)) {
      issue("markerDiameterValue", "Give the diameter with its unit, or leave it empty for the rule's standard sphere.");
    }
    // A count out of range has its own error; only a stated single wire (or none) conflicts with a separation.
    if (d.topWireSeparation !== undefined && (d.topWireCount === undefined || d.topWireCount === 1)) {
      issue("topWireSeparation", "A separation of the wires at the highest point needs at least 2 wires there.");
    }
    const surface = d.surfaceLevel ?? 0;
    const attachments = [d.attachmentHeightA, d.attachmentHeightB].filter((h): h is number => h !== undefined);
    if (attachments.length && surface >= Math.min(...attachments)) {
      issue("surfaceLevel", "The ground or water level must be below the conductor attachments.");
    }
    if (d.sagKind === "lowest-clearance" && d.sagValue !== undefined && attachments.length === 2) {
      const lowestAttachmentAboveSurface = Math.min(...attachments) - surface;
      if (d.sagValue >= lowestAttachmentAboveSurface) {
        issue("sagValue", `The lowest clearance must be below the lower attachment, which is ${lowestAttachmentAboveSurface} above the ground or water.`);
      }
    }
    if (d.sagKind === "midspan-sag" && d.sagValue !== undefined && attachments.length === 2) {
      const midChordAboveSurface = (attachments[0] + attachments[1]) / 2 - surface;
      if (d.sagValue >= midChordAboveSurface) issue("sagValue", "With this sag the conductor would reach the ground or water at mid-span.");
    }
  });
export type CrossingDetailsInput = z.infer<typeof crossingDetailsSchema>;

export const DETAILS_NUMBER_FIELDS = [
  "supportHeightA",
  "supportHeightB",
  "attachmentHeightA",
  "attachmentHeightB",
  "sagValue",
  "surfaceLevel",
  "wireSeparation",
  "topWireCount",
  "topWireSeparation",
  "runwayEndDistance",
  "markerDiameterValue",
] as const;
const DETAILS_CHOICE_FIELDS = ["sagKind", "highestWire", "markerDiameterUnit", "litPhase"] as const;

/** Submitted form fields (strings; empty = not stated; a ticked checkbox sends "on") → schema input. */
export function crossingDetailsFormToInput(form: Record<string, unknown>): Record<string, unknown> {
  const out: Record<string, unknown> = { ...form };
  for (const key of DETAILS_NUMBER_FIELDS) {
    const v = form[key];
    if (v === "" || v == null) delete out[key];
    else if (typeof v === "string") out[key] = Number(v.trim().replace(",", "."));
  }
  for (const key of DETAILS_CHOICE_FIELDS) if (form[key] === "" || form[key] == null) delete out[key];
  // Without a value the unit select alone does not state a diameter.
  if (out.markerDiameterValue === undefined) delete out.markerDiameterUnit;
  out.runwayEndCriticalArea = form.runwayEndCriticalArea === "on" || form.runwayEndCriticalArea === "true";
  if (form.costCurrency === "" || form.costCurrency == null) delete out.costCurrency;
  return out;
}

export function emptyCrossingDetails(): CrossingDetails {
  return {
    supportHeightA: null,
    supportHeightB: null,
    attachmentHeightA: null,
    attachmentHeightB: null,
    sagKind: null,
    sagValue: null,
    surfaceLevel: null,
    highestWire: null,
    wireSeparation: null,
    topWireCount: null,
    topWireSeparation: null,
    runwayEndDistance: null,
    runwayEndCriticalArea: false,
    ruleSet: "faa",
    markerDiameter: null,
    icaoColour: "red",
    litPhase: null,
    costCurrency: "USD",
  };
}
