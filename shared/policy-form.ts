// The admin policy form: shares are typed as percentages, as on every other page (98 means 98 %),
// and stored as the fractions the engine and the API use (0.98). parseForm decodes the text.
import { z } from "zod";
import type { Policy } from "./study-schemas";

/** Policy fields entered as percentages. */
export const POLICY_PERCENT_FIELDS = ["minCoverage", "goAvailability", "marginalAvailability"] as const;

const number = (what: string) => z.number({ error: `Enter ${what}.` }).finite(`Enter ${what} as a number.`);
const percent = (what: string) => number(`the ${what} in per cent`).pipe(z.number().min(0, `${what} must be between 0 and 100 %.`).max(100, `${what} must be between 0 and 100 %.`));

/** Per cent → fraction without binary noise (99.9 / 100 is 0.9990000000000001). */
const fraction = (pct: number) => Number((pct / 100).toPrecision(12));
/** Fraction → per cent for the form's default values. */
export const toPercent = (share: number) => Number((share * 100).toPrecision(12));

export const policyFormSchema = z
  .object({
    minKnownHours: number("the minimum known hours").pipe(z.number().min(0, "Minimum known hours cannot be negative.")),
    minCoverage: percent("Minimum coverage"),
    goAvailability: percent("Go availability"),
    maxDarkStretchHours: number("the longest dark stretch in hours").pipe(z.number().min(0, "Longest allowed dark stretch cannot be negative.")),
    marginalAvailability: percent("Marginal availability"),
  })
  .refine((p) => p.marginalAvailability <= p.goAvailability, { path: ["marginalAvailability"], message: "Marginal availability cannot be above the go availability." })
  .transform(
    (p): Policy => ({ ...p, minCoverage: fraction(p.minCoverage), goAvailability: fraction(p.goAvailability), marginalAvailability: fraction(p.marginalAvailability) }),
  );
