import { z } from "zod";
import { RULE_SETS } from "./marker-schemas";
import { nameField, textField } from "./fields";
import { timeZoneSchema } from "./ingest-options";

export const CROSSING_KINDS = ["river", "canyon", "lake", "road", "rail", "airport-vicinity", "other"] as const;
export type CrossingKind = (typeof CROSSING_KINDS)[number];
export const CROSSING_KIND_LABELS: Record<CrossingKind, string> = {
  river: "River",
  canyon: "Canyon",
  lake: "Lake",
  road: "Road",
  rail: "Railway",
  "airport-vicinity": "Airport vicinity",
  other: "Other",
};

/** A number field that may be left out (or null); page forms read their text with `decodeForm` (shared/form-decode.ts) first. */
export const optionalNumber = (schema: z.ZodNumber) => z.preprocess((v) => (v === null ? undefined : v), schema.optional());

export const circuitSchema = z.object({
  name: nameField("Enter a name.", 200, "Keep the name under 200 characters."),
  voltageKv: z.number({ error: "Enter the voltage in kV." }).positive("Voltage must be above 0 kV.").max(1200, "Voltage above 1,200 kV is not plausible."),
  phases: z.number({ error: "Enter the number of phases." }).int("Phases must be a whole number.").min(1, "At least 1 phase.").max(6, "At most 6 phases."),
  normalRatingA: optionalNumber(z.number().positive("Rating must be above 0 A.").max(20000, "Rating above 20,000 A is not plausible.")),
  notes: textField(5000).optional().transform((v) => v || undefined),
  /** Absent or empty: the organisation's time zone. */
  timeZone: z.preprocess((v) => (v === null || (typeof v === "string" && v.trim() === "") ? undefined : v), timeZoneSchema.optional()),
});
/** The admin's form for the organisation's time zone. */
export const organisationTimeZoneSchema = z.object({ timeZone: timeZoneSchema });

export type CircuitInput = z.infer<typeof circuitSchema>;

export const lengthSchema = z.object({
  value: z.number({ error: "Enter a length." }).positive("Length must be above 0.").max(100_000, "Length is not plausible."),
  unit: z.enum(["m", "ft"], { error: "Unit must be m or ft." }),
});

export const crossingSchema = z.object({
  name: nameField("Enter a name.", 200, "Keep the name under 200 characters."),
  lat: z.number({ error: "Enter the latitude." }).min(-90, "Latitude is between −90 and 90.").max(90, "Latitude is between −90 and 90."),
  lon: z.number({ error: "Enter the longitude." }).min(-180, "Longitude is between −180 and 180.").max(180, "Longitude is between −180 and 180."),
  spanLength: lengthSchema,
  kind: z.enum(CROSSING_KINDS, { error: `Kind is one of: ${CROSSING_KINDS.join(", ")}.` }),
  /** On create only; omitted: from the location (FAA in the US and its territories, ICAO elsewhere). Changed later in the span details. */
  ruleSet: z.enum(RULE_SETS, { error: "Rule set is faa or icao." }).optional(),
});
export type CrossingInput = z.infer<typeof crossingSchema>;
