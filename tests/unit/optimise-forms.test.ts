// The optimiser's request schema and form conversion (shared/optimise-schemas.ts,
// shared/optimise-forms.ts) and the device form's cold curve (shared/device-forms.ts).
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { optimiseRequestSchema, storageSizes } from "../../shared/optimise-schemas";
import { optimiseFormToRequest, candidateErrorLabel, switchedOutFromText } from "../../shared/optimise-forms";
import { coldDeratingFromText, coldDeratingText } from "../../shared/device-forms";
import { deviceSchema, switchedOutSchema } from "../../shared/study-schemas";

const spec = deviceSchema.parse({ minCurrentA: 40, maxCurrentA: 2000, harvestW: "min(0.004*I^2, 15)", loadW: 4 });

describe("storage sizes", () => {
  it("a range gives each size from the start and the step: 0.1 Wh steps do not drift", () => {
    const r = storageSizes({ range: { fromWh: 0, toWh: 1, stepWh: 0.1 }, costPerWh: 1, lifeYears: 10 }, 200);
    // Eleven sizes 0, 0.1, …, 1 (by hand); adding 0.1 ten times would give 0.9999999999999999.
    expect(r).toEqual({ sizes: [0, 0.1, 0.2, 0.3, 0.4, 0.5, 0.6, 0.7, 0.8, 0.9, 1] });
  });

  it("a range past the limit is counted, not expanded", () => {
    expect(storageSizes({ range: { fromWh: 0, toWh: 1e12, stepWh: 1 }, costPerWh: 1, lifeYears: 10 }, 200)).toEqual({ tooMany: 1e12 + 1 });
  });

  it("property: every size of a range lies within it, and the count is ⌊(to − from)/step⌋ + 1", () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 500 }), fc.integer({ min: 0, max: 500 }), fc.integer({ min: 1, max: 50 }), (from, width, step) => {
        const r = storageSizes({ range: { fromWh: from, toWh: from + width, stepWh: step }, costPerWh: 1, lifeYears: 10 }, 10_000);
        if (!("sizes" in r)) throw new Error("expected sizes");
        expect(r.sizes).toHaveLength(Math.floor(width / step) + 1);
        for (const s of r.sizes) expect(s >= from && s <= from + width).toBe(true);
      }),
    );
  });
});

describe("request schema", () => {
  const body = { samples: [["2025-01-01T00:00:00Z", 1], ["2025-01-01T00:05:00Z", 2]], location: { lat: 0, lon: 0 }, candidates: [{ name: "A", device: spec, unitCost: 1, lifeYears: 10 }], storage: { sizesWh: [0], costPerWh: 1, lifeYears: 5 } };

  it("takes defaults for the horizon, discount rate and growth", () => {
    const parsed = optimiseRequestSchema.parse(body);
    expect(parsed).toMatchObject({ horizonYears: 20, discountRatePercent: 5, loadGrowthPercentPerYear: 0, requireGoInLastYear: false });
  });

  it("refuses a list and a range together, naming sizesWh", () => {
    const r = optimiseRequestSchema.safeParse({ ...body, storage: { ...body.storage, range: { fromWh: 0, toWh: 1, stepWh: 1 } } });
    expect(r.error!.issues[0].path).toEqual(["storage", "sizesWh"]);
  });
});

describe("optimiser form", () => {
  const devices = [
    { id: 7, name: "Seven", spec },
    { id: 9, name: "Nine", spec },
  ];

  it("ticked devices become candidates with their costs; text is never 0", () => {
    const { request, names } = optimiseFormToRequest(
      { "use-9": "on", "unitCost-9": "1200", "installCost-9": "", "lifeYears-9": "12", storageMode: "list", storageSizesWh: "0, 20 40", storageCostPerWh: "abc", storageLifeYears: "8", horizonYears: "20", discountRatePercent: "5" },
      devices,
    );
    expect(names).toEqual(["Nine"]);
    expect(request.candidates).toEqual([{ name: "Nine", device: spec, unitCost: 1200, installCost: undefined, lifeYears: 12 }]);
    expect(request.storage).toMatchObject({ sizesWh: [0, 20, 40], costPerWh: "abc", lifeYears: 8 });
  });

  it("names a candidate's error after its device", () => {
    expect(candidateErrorLabel("candidates0UnitCost", ["Nine"])).toBe("Nine");
    expect(candidateErrorLabel("storageCostPerWh", ["Nine"])).toBeNull();
  });
});

describe("device form: cold derating text", () => {
  it("reads °C:fraction pairs (a typographic minus too) and writes them back", () => {
    const curve = coldDeratingFromText("−20:0.5, 0:0.8; 20:1");
    expect(curve).toEqual([
      { tempC: -20, usableFraction: 0.5 },
      { tempC: 0, usableFraction: 0.8 },
      { tempC: 20, usableFraction: 1 },
    ]);
    expect(coldDeratingText(curve as never)).toBe("-20:0.5, 0:0.8, 20:1");
  });

  it("leaves text that is not pairs as text, so the schema names the field", () => {
    expect(coldDeratingFromText("cold")).toBe("cold");
    expect(deviceSchema.safeParse({ ...spec, coldDerating: "cold" }).error!.issues[0].path).toEqual(["coldDerating"]);
    expect(coldDeratingFromText("  ")).toBeUndefined();
  });
});

describe("switched-out periods typed on the optimiser form", () => {
  it("reads one period a line; dates are UTC midnights, date-times without a zone UTC", () => {
    expect(switchedOutFromText("Spring outage, 2025-04-01, 2025-04-15\n\nWorks; 2025-06-01 08:00; 2025-06-01T17:30:00+02:00")).toEqual([
      { name: "Spring outage", start: "2025-04-01T00:00:00Z", end: "2025-04-15T00:00:00Z" },
      { name: "Works", start: "2025-06-01T08:00:00Z", end: "2025-06-01T17:30:00+02:00" },
    ]);
    expect(switchedOutFromText("  ")).toBeUndefined();
  });

  it("a bad line is refused naming its line: the end before the start, or missing times", () => {
    const periods = switchedOutFromText("Fine, 2025-04-01, 2025-04-02\nBackwards, 2025-05-10, 2025-05-01\njust a name");
    const issues = switchedOutSchema.safeParse(periods).error!.issues;
    expect(issues.map((i) => i.path.join("."))).toEqual(["1.end", "2.start", "2.end"]);
    expect(issues[0].message).toBe("A switched-out period must end after it starts.");
    expect(candidateErrorLabel("switchedOut1End", [])).toBe("Switched-out line 2");
  });
});
