// Known hours of a profile inside a study period, from monthly coverage (lib/ingest/known-hours.ts).
// Expected values are worked by hand beside each check.
import { describe, expect, it } from "vitest";
import { insufficientDataWarning, knownHoursInPeriod } from "../../lib/ingest/known-hours";

const jan = Date.UTC(2025, 0, 1);
const feb = Date.UTC(2025, 1, 1);
const mar = Date.UTC(2025, 2, 1);
const months = [
  { month: "2025-01", coverage: 1 },
  { month: "2025-02", coverage: 0.5 },
];

describe("knownHoursInPeriod", () => {
  it("sums whole months: January 744 h at 100 % + February 672 h at 50 % = 1080 h", () => {
    expect(knownHoursInPeriod(months, jan, mar)).toEqual({ spanHours: 1416, knownHours: 1080, coverage: 1080 / 1416 });
  });

  it("takes a part of a month pro rata: 1–15 February is 336 h at 50 % = 168 h", () => {
    const r = knownHoursInPeriod(months, jan, mar, feb, Date.UTC(2025, 1, 15));
    expect(r.spanHours).toBe(336);
    expect(r.knownHours).toBeCloseTo(168, 9);
  });

  it("counts known hours only inside the profile, over the whole period, and reports no overlap", () => {
    // 1 December 2024 – 1 February 2025: 1488 h, of which January's 744 h are known (50 %).
    expect(knownHoursInPeriod(months, jan, mar, Date.UTC(2024, 11, 1), feb)).toEqual({ spanHours: 1488, knownHours: 744, coverage: 0.5 });
    expect(knownHoursInPeriod(months, jan, mar, Date.UTC(2026, 0, 1))).toEqual({ spanHours: 0, knownHours: 0, coverage: null });
  });
});

describe("insufficientDataWarning", () => {
  const policy = { minKnownHours: 720, minCoverage: 0.6 };
  it("warns when the known hours fall short and names both figures", () => {
    const w = insufficientDataWarning({ spanHours: 336, knownHours: 168, coverage: 0.5 }, policy);
    expect(w).toContain("about 168 known hours of current, below the policy's minimum of 720");
    expect(w).toContain("coverage of about 50.0 %, below the policy's minimum of 60 %");
  });
  it("says nothing when the period can meet the policy", () => {
    expect(insufficientDataWarning({ spanHours: 1416, knownHours: 1080, coverage: 0.76 }, policy)).toBeNull();
  });
});
