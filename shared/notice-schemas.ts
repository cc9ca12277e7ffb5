// Request and response of the 14 CFR 77.9 notice check (API body, OpenAPI, crossing page).
import { z } from "zod";

const unit = z.enum(["ft", "m"]);
/** Heights and distances up to 100 km: anything larger is a typing error, not a structure. */
const MAX = 100_000;
const nonNegative = z.strictObject({ value: z.number().finite().nonnegative("Must not be negative").max(MAX, `At most ${MAX}`), unit });
const elevation = z.strictObject({ value: z.number().finite().min(-MAX, `At least ${-MAX}`).max(MAX, `At most ${MAX}`), unit });

export const noticeCheckRequestSchema = z
  .strictObject({
    heightAgl: nonNegative.describe("Height of the structure's (or wire's) top above the ground at its site"),
    siteElevation: elevation.describe("Ground elevation of the site above mean sea level"),
    nearest: z
      .strictObject({
        kind: z.enum(["airport", "heliport"]),
        distance: nonNegative.describe("Distance to the nearest point of the nearest runway (heliport: landing and take-off area)"),
        longestRunway: nonNegative.optional().describe("Length of the airport's longest runway (required for an airport)"),
        elevation: elevation.describe("Elevation of that runway point or landing area above mean sea level"),
      })
      .refine((n) => n.kind === "heliport" || n.longestRunway !== undefined, { path: ["longestRunway"], message: "Give the airport's longest runway length" })
      .optional(),
  })
  .describe("14 CFR 77.9 notice check input");
export type NoticeCheckRequest = z.infer<typeof noticeCheckRequestSchema>;

const length = z.object({ value: z.number(), unit });
export const noticeCheckResponseSchema = z.object({
  noticeRequired: z.boolean(),
  reasons: z.array(
    z.object({
      rule: z.enum(["77.9(a)", "77.9(b)(1)", "77.9(b)(2)", "77.9(b)(3)"]),
      exceeded: z.boolean(),
      text: z.string(),
      surfaceHeight: length,
      exceedsBy: length,
    }),
  ),
  notEvaluated: z.array(z.string()),
});
