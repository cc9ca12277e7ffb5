import { describe, expect, it } from "vitest";
import { canonicalJson, fingerprint, staleReasons, type ApprovalSnapshot } from "../../lib/review/staleness";

const approved: ApprovalSnapshot = {
  studyId: 10,
  studyInputs: fingerprint({ device: { minCurrentA: 40 }, policy: { goAvailability: 0.999 } }),
  option: { id: 3, name: "Line-fed markers", fingerprint: fingerprint({ unitPrice: 6500 }), presentValue: 120000, equivalentAnnualCost: 10000, currency: "USD" },
  policy: fingerprint({ goAvailability: 0.999 }),
  ruleSet: "faa",
  spanLength: { value: 1000, unit: "ft" },
  details: fingerprint({ supportHeightA: 30 }),
};

describe("approval staleness", () => {
  it("is fresh when nothing changed", () => {
    expect(staleReasons(approved, structuredClone(approved))).toEqual([]);
  });
  it("a newer study run", () => {
    expect(staleReasons(approved, { ...approved, studyId: 11 })).toEqual(["a newer study (#11) has run since study #10 was approved"]);
  });
  it("the same study with other inputs", () => {
    expect(staleReasons(approved, { ...approved, studyInputs: "x" })).toEqual(["the inputs of study #10 have changed"]);
  });
  it("the option edited, its cost changed, or deleted", () => {
    const edited = { ...approved, option: { ...approved.option!, fingerprint: fingerprint({ unitPrice: 7000 }) } };
    expect(staleReasons(approved, edited)).toEqual(['the approved option "Line-fed markers" has been edited']);
    // Same option figures, another cost (its units follow the marker layout, which changed).
    const costlier = { ...approved, option: { ...approved.option!, equivalentAnnualCost: 12000 } };
    expect(staleReasons(approved, costlier)).toEqual(['the cost of the approved option "Line-fed markers" has changed']);
    expect(staleReasons(approved, { ...approved, option: null })).toEqual(['the approved option "Line-fed markers" has been deleted']);
  });
  it("a do-not-proceed approval has no option to go stale", () => {
    const none = { ...approved, option: null };
    expect(staleReasons(none, { ...none })).toEqual([]);
  });
  it("policy, rule set, span length, span details", () => {
    expect(staleReasons(approved, { ...approved, policy: "p" })).toEqual(["the organisation's verdict policy has changed"]);
    expect(staleReasons(approved, { ...approved, ruleSet: "icao" })).toEqual(["the rule set has changed from FAA to ICAO"]);
    expect(staleReasons(approved, { ...approved, spanLength: { value: 1200, unit: "ft" } })).toEqual(["the span length has changed from 1000 ft to 1200 ft"]);
    expect(staleReasons(approved, { ...approved, spanLength: { value: 1000, unit: "m" } })).toHaveLength(1);
    expect(staleReasons(approved, { ...approved, details: "d" })).toEqual(["the span and marking details have changed"]);
  });
  it("lists every change at once", () => {
    expect(staleReasons(approved, { ...approved, studyId: 12, policy: "p", ruleSet: "icao" })).toHaveLength(3);
  });
  it("fingerprints ignore key order but not values", () => {
    expect(canonicalJson({ b: 1, a: { d: [2, 1], c: null } })).toBe('{"a":{"c":null,"d":[2,1]},"b":1}');
    expect(fingerprint({ a: 1, b: 2 })).toBe(fingerprint({ b: 2, a: 1 }));
    expect(fingerprint({ a: 1, b: 2 })).not.toBe(fingerprint({ a: 1, b: 3 }));
  });
});
