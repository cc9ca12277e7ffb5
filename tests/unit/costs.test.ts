import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  compareOptions,
  crf,
  DEMO_DEFAULTS_LABEL,
  DEMO_INSTALLATION_DEFAULTS,
  demoOption,
  installationCost,
  presentValueOfOption,
  presentWorthOfSeries,
  replacementYears,
} from "../../lib/costs";
import {
  INSTALLATION_METHODS,
  lightingOptionSchema,
  optionComparisonSchema,
  type FeasibilityStatus,
  type LightingOption,
} from "../../shared/cost-schemas";

function option(overrides: Partial<LightingOption> = {}): LightingOption {
  return {
    name: "Lit markers by helicopter",
    kind: "line-powered",
    units: 4,
    unitPrice: 1000,
    installation: { method: "helicopter", mobilisation: 500, ratePerHour: 600, minutesPerUnit: 30 },
    outage: { needed: true, cost: 1000 },
    annualMaintenance: 100,
    serviceLifeYears: 15,
    horizonYears: 40,
    discountRate: 0.08,
    feasibility: { status: "go", justification: "Availability 99.95 % over the study year." },
    ...overrides,
  };
}

describe("interest factors", () => {
  // [published: engineering-economics interest tables, 8 % table at n = 20] CRF = 0.10185.
  it("capital recovery factor at 8 %, 20 years is 0.10185", () => {
    expect(crf(0.08, 20)).toBeCloseTo(0.10185, 5);
  });

  // [published: engineering-economics interest tables, 8 % table at n = 20] P/A = 9.8181.
  it("present worth of a uniform series at 8 %, 20 years is 9.8181 per unit", () => {
    expect(presentWorthOfSeries(1, 0.08, 20)).toBeCloseTo(9.8181, 4);
    expect(presentWorthOfSeries(250, 0.08, 20)).toBeCloseTo(250 * 9.8181, 1);
  });

  it("handles a zero discount rate: CRF = 1/n, P = A·n", () => {
    expect(crf(0, 25)).toBe(1 / 25);
    expect(presentWorthOfSeries(100, 0, 25)).toBe(2500);
  });

  it("CRF and the series factor are reciprocals, and CRF tends to 1/n as i → 0", () => {
    fc.assert(
      fc.property(fc.double({ min: 1e-4, max: 0.5, noNaN: true }), fc.integer({ min: 1, max: 100 }), (i, n) => {
        expect(crf(i, n) * presentWorthOfSeries(1, i, n)).toBeCloseTo(1, 10);
      }),
    );
    expect(crf(1e-9, 30)).toBeCloseTo(1 / 30, 6);
  });

  it("refuses a negative rate or no periods", () => {
    expect(() => crf(-0.01, 10)).toThrow(RangeError);
    expect(() => presentWorthOfSeries(1, 0.05, 0)).toThrow(RangeError);
  });
});

describe("present value of an option", () => {
  it("replaces equipment at each multiple of life strictly inside the horizon", () => {
    expect(replacementYears(15, 40)).toEqual([15, 30]);
    expect(replacementYears(20, 40)).toEqual([20]);
    expect(replacementYears(25, 20)).toEqual([]);
  });

  it("adds up capital, installation, outage, maintenance and replacements as discounted cash flows", () => {
    const subject = option();
    const result = presentValueOfOption(subject);
    expect(result.capital).toBe(4000);
    expect(result.installation).toBe(500 + 600 * 2); // 4 units × 30 min = 2 h
    expect(result.outage).toBe(1000);
    expect(result.replacementYears).toEqual([15, 30]);

    // Independent check: list every year's cash flow and discount it.
    const initial = 4000 + 1700 + 1000;
    let expected = initial;
    for (let year = 1; year <= 40; year++) {
      const flow = 100 + (year === 15 || year === 30 ? initial : 0);
      expected += flow / 1.08 ** year;
    }
    expect(result.totalPV).toBeCloseTo(expected, 6);
    expect(result.replacementsPV).toBeCloseTo(initial / 1.08 ** 15 + initial / 1.08 ** 30, 6);
    expect(result.equivalentAnnualCost).toBeCloseTo(expected * crf(0.08, 40), 6);

    expect(result.cumulativeByYear).toHaveLength(41);
    expect(result.cumulativeByYear[0]).toEqual({ year: 0, nominal: initial, discounted: initial });
    expect(result.cumulativeByYear[40].nominal).toBeCloseTo(initial * 3 + 100 * 40, 6);
    expect(result.cumulativeByYear[40].discounted).toBeCloseTo(result.totalPV, 6);
    expect(result.cumulativeByYear[15].nominal - result.cumulativeByYear[14].nominal).toBeCloseTo(initial + 100, 9);
  });

  it("charges no outage when none is needed, and nothing is discounted at i = 0", () => {
    const result = presentValueOfOption(option({ outage: { needed: false, cost: 0 }, discountRate: 0, horizonYears: 10, serviceLifeYears: 20 }));
    expect(result.outage).toBe(0);
    expect(result.totalPV).toBe(4000 + 1700 + 100 * 10);
    expect(result.equivalentAnnualCost).toBeCloseTo(result.totalPV / 10, 9);
  });

  it("never falls as the horizon grows, and EAC × series factor returns the present value", () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 30 }), fc.integer({ min: 1, max: 60 }), fc.double({ min: 0, max: 0.2, noNaN: true }), (life, horizon, rate) => {
        const shorter = presentValueOfOption(option({ serviceLifeYears: life, horizonYears: horizon, discountRate: rate }));
        const longer = presentValueOfOption(option({ serviceLifeYears: life, horizonYears: horizon + 1, discountRate: rate }));
        expect(longer.totalPV).toBeGreaterThan(shorter.totalPV);
        expect(shorter.equivalentAnnualCost * presentWorthOfSeries(1, rate, horizon)).toBeCloseTo(shorter.totalPV, 6);
      }),
    );
  });
});

describe("comparing options", () => {
  const withStatus = (name: string, status: FeasibilityStatus, unitPrice: number) =>
    option({ name, unitPrice, feasibility: { status, justification: `${name} assessed as ${status}.` } });

  it("recommends the cheapest option rated go and says why the cheaper ones lost", () => {
    const comparison = compareOptions([
      withStatus("Solar markers", "no-go", 500),
      withStatus("Lit markers", "go", 2000),
      withStatus("Structure lights", "go", 4000),
      withStatus("Plain spheres", "marginal", 300),
    ]);
    expect(comparison.recommendation?.name).toBe("Lit markers");
    expect(comparison.recommendation?.index).toBe(1);
    expect(comparison.rows.find((row) => row.recommended)?.name).toBe("Lit markers");
    const reasons = comparison.recommendation?.reasons.join(" ") ?? "";
    expect(reasons).toMatch(/cheapest option rated go/);
    expect(reasons).toMatch(/Structure lights, the next option rated go/);
    expect(reasons).toMatch(/Solar markers is cheaper .* rated no-go/);
    expect(reasons).toMatch(/Plain spheres is cheaper .* rated marginal/);
    expect(comparison.rows.map((row) => row.costRank)).toEqual([2, 3, 4, 1]);
    expect(comparison.basis).toBe("present-value");
    expect(comparison.warnings).toEqual([]);
    expect(optionComparisonSchema.safeParse(comparison).success).toBe(true);
  });

  it("warns and recommends nothing when no option is rated go", () => {
    const comparison = compareOptions([withStatus("Lit markers", "marginal", 2000), withStatus("Solar markers", "insufficient-data", 1500)]);
    expect(comparison.recommendation).toBeNull();
    expect(comparison.warnings.join(" ")).toMatch(/No option is rated go/);
    expect(comparison.rows.every((row) => !row.recommended)).toBe(true);
  });

  it("compares by equivalent annual cost when horizons differ, and says so", () => {
    const shortCheap = option({ name: "Short", horizonYears: 10, feasibility: { status: "go", justification: "ok" } });
    const longDear = option({ name: "Long", horizonYears: 40, unitPrice: 1500, feasibility: { status: "go", justification: "ok" } });
    const comparison = compareOptions([longDear, shortCheap]);
    expect(comparison.basis).toBe("equivalent-annual-cost");
    expect(comparison.warnings.join(" ")).toMatch(/different horizons/);
    const cheapest = [...comparison.rows].sort((a, b) => a.equivalentAnnualCost - b.equivalentAnnualCost)[0];
    expect(comparison.recommendation?.name).toBe(cheapest.name);
  });

  it("always recommends a go option no dearer than any other go option", () => {
    const statuses: FeasibilityStatus[] = ["go", "marginal", "no-go", "insufficient-data", "unknown"];
    fc.assert(
      fc.property(
        fc.array(fc.record({ status: fc.constantFrom(...statuses), price: fc.integer({ min: 0, max: 20_000 }) }), { minLength: 1, maxLength: 8 }),
        (specs) => {
          const comparison = compareOptions(specs.map((spec, i) => withStatus(`Option ${i}`, spec.status, spec.price)));
          const goRows = comparison.rows.filter((row) => row.feasibility.status === "go");
          if (goRows.length === 0) {
            expect(comparison.recommendation).toBeNull();
            return;
          }
          const chosen = comparison.rows[comparison.recommendation!.index];
          expect(chosen.feasibility.status).toBe("go");
          for (const row of goRows) expect(chosen.equivalentAnnualCost).toBeLessThanOrEqual(row.equivalentAnnualCost);
        },
      ),
    );
  });
});

describe("demo defaults and schema", () => {
  it("cover every installation method, are labelled invented, and build valid options", () => {
    expect(DEMO_DEFAULTS_LABEL).toMatch(/invented/i);
    for (const method of INSTALLATION_METHODS) {
      expect(DEMO_INSTALLATION_DEFAULTS[method].note).toMatch(/invented/i);
      const built = demoOption({ kind: "line-powered", method, units: 6 });
      expect(lightingOptionSchema.safeParse(built).success).toBe(true);
      expect(installationCost(built)).toBeGreaterThan(0);
    }
  });

  it("rejects an outage cost without an outage, and bad figures", () => {
    expect(lightingOptionSchema.safeParse(option({ outage: { needed: false, cost: 500 } })).success).toBe(false);
    expect(lightingOptionSchema.safeParse(option({ units: 0 })).success).toBe(false);
    expect(lightingOptionSchema.safeParse(option({ discountRate: -0.02 })).success).toBe(false);
    expect(lightingOptionSchema.safeParse(option({ feasibility: { status: "go", justification: " " } })).success).toBe(false);
    expect(lightingOptionSchema.safeParse(option()).success).toBe(true);
  });
});
