// Lighting options for a crossing and their life-cycle cost (form, API body, OpenAPI).
// Money is a plain number in the organisation's currency; no salvage value is credited.
import { z } from "zod";

export const OPTION_KINDS = ["line-powered", "solar", "structure-supply", "unlit"] as const;
export type OptionKind = (typeof OPTION_KINDS)[number];

export const INSTALLATION_METHODS = ["helicopter", "bucket-truck", "crane", "barge", "ground-crew"] as const;
export type InstallationMethod = (typeof INSTALLATION_METHODS)[number];

export const FEASIBILITY_STATUSES = ["go", "marginal", "no-go", "insufficient-data", "unknown"] as const;
export type FeasibilityStatus = (typeof FEASIBILITY_STATUSES)[number];

const money = z.number().finite().nonnegative("Must not be negative");

export const installationSchema = z.object({
  method: z.enum(INSTALLATION_METHODS),
  /** Once per visit: getting the crew and equipment to the crossing. */
  mobilisation: money,
  ratePerHour: money,
  /** Working time per unit installed. */
  minutesPerUnit: z.number().finite().nonnegative("Must not be negative"),
});
export type Installation = z.infer<typeof installationSchema>;

export const outageSchema = z
  .object({
    needed: z.boolean(),
    /** Cost of taking the line out of service for the work, per visit. */
    cost: money.default(0),
  })
  .refine((outage) => outage.needed || outage.cost === 0, {
    path: ["cost"],
    message: "An outage cost is given but no outage is needed",
  });
export type Outage = z.infer<typeof outageSchema>;

export const feasibilitySchema = z.object({
  status: z.enum(FEASIBILITY_STATUSES),
  justification: z.string().trim().min(1, "Say why"),
});
export type Feasibility = z.infer<typeof feasibilitySchema>;

export const lightingOptionSchema = z.object({
  id: z.string().optional(),
  name: z.string().trim().min(1).max(120),
  kind: z.enum(OPTION_KINDS),
  /** Devices (lit markers, lights, spheres) bought and installed. */
  units: z.number().int().positive(),
  unitPrice: money,
  installation: installationSchema,
  outage: outageSchema,
  annualMaintenance: money,
  serviceLifeYears: z.number().int().min(1).max(100),
  horizonYears: z.number().int().min(1).max(100),
  /** Real discount rate per year as a fraction (0.08 = 8 %). */
  discountRate: z.number().finite().min(0).max(1),
  feasibility: feasibilitySchema,
});
export type LightingOption = z.infer<typeof lightingOptionSchema>;
export type LightingOptionInput = z.input<typeof lightingOptionSchema>;

export const compareOptionsRequestSchema = z.object({
  options: z.array(lightingOptionSchema).min(1).max(20),
  /** ISO 4217 code used only to print amounts in the reasons (default USD). */
  currency: z.string().length(3).optional(),
});
export type CompareOptionsRequest = z.infer<typeof compareOptionsRequestSchema>;

export const cumulativeCostSchema = z.object({
  year: z.number().int().nonnegative(),
  nominal: z.number(),
  discounted: z.number(),
});

export const optionCostSchema = z.object({
  /** Equipment bought at year 0. */
  capital: z.number(),
  /** Mobilisation plus working hours at year 0. */
  installation: z.number(),
  /** Outage cost at year 0 (0 when none is needed). */
  outage: z.number(),
  maintenancePV: z.number(),
  replacementsPV: z.number(),
  replacementYears: z.array(z.number().int()),
  totalPV: z.number(),
  equivalentAnnualCost: z.number(),
  cumulativeByYear: z.array(cumulativeCostSchema),
});
export type OptionCost = z.infer<typeof optionCostSchema>;

export const optionComparisonRowSchema = optionCostSchema.omit({ cumulativeByYear: true }).extend({
  index: z.number().int().nonnegative(),
  id: z.string().optional(),
  name: z.string(),
  kind: z.enum(OPTION_KINDS),
  method: z.enum(INSTALLATION_METHODS),
  feasibility: feasibilitySchema,
  horizonYears: z.number().int(),
  discountRate: z.number(),
  /** 1 = cheapest by equivalent annual cost, over all options whatever their feasibility. */
  costRank: z.number().int().positive(),
  recommended: z.boolean(),
});
export type OptionComparisonRow = z.infer<typeof optionComparisonRowSchema>;

export const optionComparisonSchema = z.object({
  rows: z.array(optionComparisonRowSchema),
  basis: z.enum(["present-value", "equivalent-annual-cost"]),
  recommendation: z
    .object({ index: z.number().int().nonnegative(), id: z.string().optional(), name: z.string(), reasons: z.array(z.string()) })
    .nullable(),
  warnings: z.array(z.string()),
});
export type OptionComparison = z.infer<typeof optionComparisonSchema>;
