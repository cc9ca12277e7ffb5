// A crossing's aviation record: the structure numbers at each end, the aviation authority's
// determination, and what the 14 CFR 77.9 notice check needs (site elevation, nearest airport or
// heliport). Lengths are in the crossing's span unit (ft or m). Form fields are flat.
import { z } from "zod";

const text = (what: string, max: number) => z.string().trim().max(max, `Keep ${what} under ${max} characters.`).optional();
const length = (what: string) => z.number({ error: `Enter ${what} as a number.` }).finite().nonnegative(`${what} must not be negative.`).max(100_000, `${what} is not plausible.`).optional();
const elevation = (what: string) => z.number({ error: `Enter ${what} as a number.` }).finite().min(-1_500, `${what} is not plausible.`).max(30_000, `${what} is not plausible.`).optional();

export const NEAREST_KINDS = ["airport", "heliport"] as const;

export const aviationRecordSchema = z
  .object({
    structureNumberA: text("the structure number", 60),
    structureNumberB: text("the structure number", 60),
    siteElevation: elevation("The site elevation"),
    nearestKind: z.enum(NEAREST_KINDS, { error: "Choose airport or heliport." }).optional(),
    nearestDistance: length("The distance"),
    nearestLongestRunway: length("The runway length"),
    nearestElevation: elevation("The elevation"),
    determinationNumber: text("the aeronautical study number", 60),
    determinationDate: z.string().regex(/^\d{4}-\d{2}-\d{2}$/, "Give the date as YYYY-MM-DD.").optional(),
    determinationRequires: text("what the determination requires", 2000),
  })
  .superRefine((r, ctx) => {
    if (r.nearestKind && (r.nearestDistance === undefined || r.nearestElevation === undefined)) {
      ctx.addIssue({ code: "custom", path: [r.nearestDistance === undefined ? "nearestDistance" : "nearestElevation"], message: "Give the distance and the elevation of the nearest airport or heliport." });
    }
    if (r.nearestKind === "airport" && r.nearestLongestRunway === undefined) {
      ctx.addIssue({ code: "custom", path: ["nearestLongestRunway"], message: "Give the airport's longest runway length." });
    }
  });
export type AviationRecord = z.infer<typeof aviationRecordSchema>;
