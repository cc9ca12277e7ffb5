import { z } from "zod";

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

/** A number field that may be left empty (forms send ""). */
export const optionalNumber = (schema: z.ZodNumber) =>
  z.preprocess((v) => (v === "" || v == null ? undefined : Number(v)), schema.optional());

export const circuitSchema = z.object({
  name: z.string({ error: "Enter a name." }).trim().min(1, "Enter a name.").max(200, "Keep the name under 200 characters."),
  voltageKv: z.coerce.number({ error: "Enter the voltage in kV." }).positive("Voltage must be above 0 kV.").max(1200, "Voltage above 1,200 kV is not plausible."),
  phases: z.coerce.number({ error: "Enter the number of phases." }).int("Phases must be a whole number.").min(1, "At least 1 phase.").max(6, "At most 6 phases."),
  normalRatingA: optionalNumber(z.number().positive("Rating must be above 0 A.").max(20000, "Rating above 20,000 A is not plausible.")),
  notes: z.string().trim().max(5000).optional().transform((v) => v || undefined),
});
export type CircuitInput = z.infer<typeof circuitSchema>;

export const lengthSchema = z.object({
  value: z.coerce.number({ error: "Enter a length." }).positive("Length must be above 0.").max(100_000, "Length is not plausible."),
  unit: z.enum(["m", "ft"], { error: "Unit must be m or ft." }),
});

export const crossingSchema = z.object({
  name: z.string({ error: "Enter a name." }).trim().min(1, "Enter a name.").max(200),
  lat: z.coerce.number({ error: "Enter the latitude." }).min(-90, "Latitude is between −90 and 90.").max(90, "Latitude is between −90 and 90."),
  lon: z.coerce.number({ error: "Enter the longitude." }).min(-180, "Longitude is between −180 and 180.").max(180, "Longitude is between −180 and 180."),
  spanLength: lengthSchema,
  kind: z.enum(CROSSING_KINDS, { error: `Kind is one of: ${CROSSING_KINDS.join(", ")}.` }),
});
export type CrossingInput = z.infer<typeof crossingSchema>;

/** Flat form fields (spanLengthValue, spanLengthUnit) → the nested API shape. */
export function crossingFormToInput(form: Record<string, unknown>) {
  return { ...form, spanLength: { value: form.spanLengthValue, unit: form.spanLengthUnit } };
}
