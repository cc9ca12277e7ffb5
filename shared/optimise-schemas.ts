// POST /api/v1/optimise and the optimiser panel (issue 13; docs/optimiser.md): candidates, storage
// sizes (a list, or a range with a step), costs, horizon, discount rate and the load-growth what-if.
// The candidate × size limits are checked by the service (a 422 naming the limit), after a range is
// counted and before anything runs.
import { z } from "zod";
import { deviceSchema, oneLoadSource, statelessStudyFields, VERDICT_STATUSES } from "./study-schemas";

const finite = (what: string) => z.number({ error: `${what} must be a number.` }).finite(`${what} must be a finite number.`);
const money = (what: string) => finite(what).min(0, `${what} cannot be negative.`).max(1e9, `${what} cannot exceed 1,000,000,000.`);
const years = (what: string) => finite(what).positive(`${what} must be above zero years.`).max(200, `${what} cannot exceed 200 years.`);

/** Most candidate devices, storage sizes and candidate × size pairs in one run (docs/input-limits.md). */
export const OPTIMISE_LIMITS = { candidates: 50, sizes: 200, pairs: 2000 } as const;

export const optimiseCandidateSchema = z.object({
  name: z.string({ error: "Name each candidate." }).trim().min(1, "Name each candidate.").max(200, "A candidate name has at most 200 characters."),
  device: deviceSchema,
  unitCost: money("Unit cost"),
  installCost: money("Installation cost").default(0),
  lifeYears: years("Device life"),
  annualMaintenance: money("Annual maintenance").optional(),
});

export const storageRangeSchema = z
  .object({
    fromWh: finite("Smallest storage").min(0, "Smallest storage cannot be negative."),
    toWh: finite("Largest storage").min(0, "Largest storage cannot be negative."),
    stepWh: finite("Storage step").positive("Storage step must be above zero."),
  })
  .refine((r) => r.toWh >= r.fromWh, { path: ["toWh"], message: "Largest storage cannot be below the smallest." });

export const storageChoiceSchema = z
  .object({
    sizesWh: z.array(finite("Storage size").min(0, "Storage sizes cannot be negative.")).min(1, "Offer at least one storage size.").max(10_000, "Offer at most 10,000 storage sizes.").optional(),
    range: storageRangeSchema.optional(),
    costPerWh: money("Storage cost per Wh"),
    lifeYears: years("Storage life"),
  })
  .superRefine((s, ctx) => {
    if ((s.sizesWh === undefined) === (s.range === undefined)) ctx.addIssue({ code: "custom", path: ["sizesWh"], message: "Give either sizesWh (a list) or range (from, to, step), not both." });
  });
export type StorageChoiceInput = z.output<typeof storageChoiceSchema>;

/** The sizes a storage choice offers, or how many a range would give when that is over `limit`. */
export function storageSizes(choice: StorageChoiceInput, limit: number): { sizes: number[] } | { tooMany: number } {
  if (choice.sizesWh) return choice.sizesWh.length > limit ? { tooMany: choice.sizesWh.length } : { sizes: choice.sizesWh };
  const { fromWh, toWh, stepWh } = choice.range!;
  const count = Math.floor((toWh - fromWh) / stepWh + 1e-9) + 1;
  if (count > limit) return { tooMany: count };
  // Each size from the start and the step (no running sum, so no drift); rounded to a micro-Wh.
  return { sizes: Array.from({ length: count }, (_, k) => Math.round((fromWh + k * stepWh) * 1e6) / 1e6) };
}

export const optimiseSettingsFields = {
  candidates: z.array(optimiseCandidateSchema).min(1, "Give at least one candidate device.").max(1000, "Give at most 1000 candidates."),
  storage: storageChoiceSchema,
  horizonYears: years("Horizon").default(20),
  discountRatePercent: finite("Discount rate").min(0, "Discount rate cannot be negative.").max(100, "Discount rate cannot exceed 100 %.").default(5),
  loadGrowthPercentPerYear: finite("Load growth").gt(-100, "Load growth must be above −100 % per year.").max(100, "Load growth cannot exceed 100 % per year.").default(0),
  requireGoInLastYear: z.boolean({ error: "requireGoInLastYear must be true or false." }).default(false).describe("judge each candidate on the load of the last year of its life (the history grown by loadGrowthPercentPerYear)"),
};

function uniqueNames(body: { candidates: { name: string }[] }, ctx: z.RefinementCtx): void {
  const seen = new Set<string>();
  body.candidates.forEach((c, i) => {
    if (seen.has(c.name)) ctx.addIssue({ code: "custom", path: ["candidates", i, "name"], message: `Candidate names must differ ("${c.name}" is given twice).` });
    seen.add(c.name);
  });
}

export const optimiseRequestSchema = z
  .object({ ...statelessStudyFields, ...optimiseSettingsFields })
  .superRefine(oneLoadSource)
  .superRefine(uniqueNames);
export type OptimiseRequest = z.output<typeof optimiseRequestSchema>;

const verdict = z.enum(VERDICT_STATUSES).nullable();

export const optimiseResponseSchema = z.object({
  candidates: z.array(
    z.object({
      name: z.string(),
      storageWh: z.number(),
      verdict: verdict.describe("null when only 'not go' is known (inferred from a larger size that is not go)"),
      evaluation: z.enum(["simulated", "inferred-go", "inferred-not-go", "inferred-insufficient-data"]),
      availability: z.number().nullable().describe("share of required known time lit; null when not simulated"),
      longestDarkStretchHours: z.number().nullable(),
      presentValue: z.number(),
      equivalentAnnualCost: z.number(),
    }),
  ),
  recommended: z.object({ name: z.string(), storageWh: z.number(), equivalentAnnualCost: z.number() }).nullable().describe("the cheapest candidate (by equivalent annual cost) whose verdict is go"),
  closest: z
    .object({ name: z.string(), storageWh: z.number(), availability: z.number().nullable(), verdict, wouldTake: z.string() })
    .nullable()
    .describe("when nothing reaches go: the simulated candidate with the best availability, and what it would take"),
  simulations: z.number().int(),
  quality: z.record(z.string(), z.unknown()).describe("the ingest quality report of the samples or CSV"),
});
export type OptimiseResponse = z.output<typeof optimiseResponseSchema>;
