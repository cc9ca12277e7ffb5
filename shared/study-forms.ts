import { z } from "zod";
import { policyOverridesSchema, scheduleSchema, studyParamsSchema, switchedOutSchema } from "./study-schemas";
import { idField } from "./fields";
import { startOfLocalDay } from "./zoned-time";

const id = (what: string) => idField(`Choose ${what}.`);

/** A study of one crossing: which history, which device, and how to run it. API body and page form alike. */
export const studyRequestSchema = z.object({
  crossingId: id("a crossing"),
  profileId: id("a load profile"),
  deviceProfileId: id("a device profile"),
  schedule: scheduleSchema.default({ kind: "night", sunAltitudeDeg: -0.833 }),
  params: studyParamsSchema.default({ phase: "A", interpolation: "linear", loadScale: 1 }),
  policy: policyOverridesSchema.default({}),
  /** API: run as a job (202 + Location of the job) even when it would be quick. */
  async: z.boolean().optional(),
});
export type StudyRequest = z.infer<typeof studyRequestSchema>;

/** A batch: every crossing of a circuit studied with one load profile and one device profile, as one job. */
export const circuitStudiesRequestSchema = studyRequestSchema.omit({ crossingId: true, async: true });
export type CircuitStudiesRequest = z.infer<typeof circuitStudiesRequestSchema>;

/** What-if changes to a saved study, recomputed without saving. */
export const whatIfSchema = z.object({
  deviceProfileId: z
    .number({ error: "Choose a device profile by its id." })
    .int("Choose a device profile by its id.")
    .positive("Choose a device profile by its id.")
    .optional()
    .describe("another device profile of the organisation to run the same study with (the figures below apply on top of its own)"),
  minCurrentA: z.number({ error: "Minimum current must be a number of amperes." }).min(0, "Minimum current cannot be negative.").optional(),
  storageWh: z.number({ error: "Storage must be a number of watt-hours." }).min(0, "Storage cannot be negative.").optional(),
  loadScale: z.number({ error: "Load scale must be a number." }).positive("Load scale must be above zero.").max(1000, "Load scale must be at most 1000.").optional(),
  switchedOut: switchedOutSchema.optional().describe("named periods with the line switched out (samples inside read 0 A), on top of any the study had"),
});
export type WhatIf = z.infer<typeof whatIfSchema>;

/**
 * The study form's phase before the user picks one: on a three-phase profile the lowest of the
 * phases at each moment (the safe assumption while the device's phase is not settled), otherwise
 * the profile's one phase.
 */
export function defaultStudyPhase(phases: string): string {
  return phases.length >= 3 ? "min" : phases.charAt(0) || "A";
}

/** The phase choices a profile with these phases ("A", "ABC") offers: its own phases, and the lowest of them when it has more than one. */
export function studyPhaseChoices(phases: string): string[] {
  const own = phases.split("").filter((p) => p === "A" || p === "B" || p === "C");
  return own.length > 1 ? [...own, "min"] : own;
}

/** Why a phase choice does not fit a profile with these phases, or null when it does. */
export function phaseChoiceProblem(choice: string, phases: string): string | null {
  if (studyPhaseChoices(phases).includes(choice) || (choice === "min" && phases.length > 0)) return null;
  return `Phase ${choice} is not in this load profile; it has ${phases.split("").join(", ") || "no phase"}.`;
}

const blank = (v: unknown) => (v === "" || v == null ? undefined : v);
/** A date field (YYYY-MM-DD, a day of the circuit's calendar) as the instant its local day begins; anything else is left for the schema to refuse. */
const day = (v: unknown, zone: string) => (blank(v) === undefined ? undefined : isCalendarDate(v) ? new Date(startOfLocalDay(v, zone)).toISOString() : v);
const isCalendarDate = (v: unknown): v is string => typeof v === "string" && /^\d{4}-\d{2}-\d{2}$/.test(v) && new Date(`${v}T00:00:00Z`).toISOString().startsWith(v);

/**
 * Flat form fields → the nested request, still text (parseForm decodes it); errors come back with
 * nested paths (params.loadScale → paramsLoadScale). Period dates are days of `timeZone` (the circuit's).
 */
export function studyFormToRequest(form: Record<string, unknown>, timeZone = "UTC") {
  return {
    crossingId: form.crossingId,
    profileId: form.profileId,
    deviceProfileId: form.deviceProfileId,
    schedule: form.scheduleKind === "always" ? { kind: "always" } : { kind: "night", sunAltitudeDeg: form.sunAltitudeDeg },
    params: {
      phase: blank(form.phase),
      interpolation: blank(form.interpolation),
      maxGapMinutes: form.maxGapMinutes,
      loadScale: form.loadScale,
      periodStart: day(form.periodStart, timeZone),
      periodEnd: day(form.periodEnd, timeZone),
      monthlyTemperatureC: form.monthlyTemperatureC,
    },
    policy: {},
  };
}
