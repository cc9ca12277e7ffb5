// The admin policy form takes percentages (shared/policy-form.ts) and stores fractions; the page
// decodes its text first (safeParseForm, as parseForm does).
import { describe, expect, it } from "vitest";
import { safeParseForm } from "../../shared/form-decode";
import { policyFormSchema, toPercent } from "../../shared/policy-form";
import { DEFAULT_POLICY, policySchema } from "../../shared/study-schemas";

const form = { minKnownHours: "8000", minCoverage: "90", goAvailability: "99.9", maxDarkStretchHours: "0.5", marginalAvailability: "98" };

describe("policy form in per cent", () => {
  it("98 means 98 % and is stored as 0.98; 99.9 as 0.999 exactly", () => {
    const p = safeParseForm(policyFormSchema, form).data;
    expect(p).toEqual({ minKnownHours: 8000, minCoverage: 0.9, goAvailability: 0.999, maxDarkStretchHours: 0.5, marginalAvailability: 0.98 });
    expect(policySchema.safeParse(p).success).toBe(true);
  });

  it("accepts a decimal comma and round-trips the defaults", () => {
    expect(safeParseForm(policyFormSchema, { ...form, goAvailability: "99,95" }).data!.goAvailability).toBe(0.9995);
    const shown = { ...DEFAULT_POLICY, minCoverage: toPercent(DEFAULT_POLICY.minCoverage), goAvailability: toPercent(DEFAULT_POLICY.goAvailability), marginalAvailability: toPercent(DEFAULT_POLICY.marginalAvailability) };
    expect(shown.goAvailability).toBe(99.9);
    expect(safeParseForm(policyFormSchema, shown).data).toEqual(DEFAULT_POLICY);
  });

  it("names the field and the per-cent range when out of range or empty", () => {
    const over = safeParseForm(policyFormSchema, { ...form, goAvailability: "998" });
    expect(over.success).toBe(false);
    expect(over.error!.issues[0]).toMatchObject({ path: ["goAvailability"], message: "Go availability must be between 0 and 100 %." });
    const empty = safeParseForm(policyFormSchema, { ...form, minCoverage: "" });
    expect(empty.error!.issues[0].path).toEqual(["minCoverage"]);
    const order = safeParseForm(policyFormSchema, { ...form, marginalAvailability: "99.95" });
    expect(order.error!.issues[0].path).toEqual(["marginalAvailability"]);
  });
});
