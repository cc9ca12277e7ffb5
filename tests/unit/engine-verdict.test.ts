// Verdict (lib/engine/verdict.ts) and solvers (lib/engine/solvers.ts).
// Thresholds are the policy defaults of docs/computation.md "Verdict" (the organisation may change them).
import { describe, expect, it } from "vitest";
import type { Series } from "../../lib/series";
import { decideVerdict, mergePolicy, studyVerdict, type VerdictFigures, type YearFigures } from "../../lib/engine/verdict";
import { prepareStudy, type StudyInput } from "../../lib/engine/prepare";
import { runStudy } from "../../lib/engine/simulate";
import { solveMaxMinCurrent, solveMinStorage } from "../../lib/engine/solvers";
import { DEFAULT_POLICY, feasibilityRequestSchema } from "../../shared/study-schemas";

const policy = DEFAULT_POLICY;
const figures = (over: Partial<VerdictFigures>): VerdictFigures => ({
  totalHours: 8760,
  knownHours: 8700,
  coverage: 8700 / 8760,
  requiredKnownHours: 4300,
  availability: 0.9995,
  longestDarkStretchHours: 0.2,
  ...over,
});

describe("decideVerdict", () => {
  it("go at and above 99.9 % with no dark stretch over 30 minutes", () => {
    const v = decideVerdict(figures({ availability: 0.999 }), policy);
    expect(v.status).toBe("go");
    expect(v.reasons.join(" ")).toMatch(/meets the go threshold of 99\.9 %/);
  });

  it("marginal below 99.9 % but at or above 99 %, with the figures in words", () => {
    const v = decideVerdict(figures({ availability: 0.99623 }), policy);
    expect(v.status).toBe("marginal");
    expect(v.reasons).toContain("Availability 99.62 % is below the go threshold of 99.9 %.");
  });

  it("marginal when availability is fine but one dark stretch is longer than allowed", () => {
    const v = decideVerdict(figures({ availability: 0.9995, longestDarkStretchHours: 1.5 }), policy);
    expect(v.status).toBe("marginal");
    expect(v.reasons.join(" ")).toMatch(/Longest dark stretch 1\.5 h exceeds the 30 min limit/);
  });

  it("no-go below 99 %", () => {
    const v = decideVerdict(figures({ availability: 0.97 }), policy);
    expect(v.status).toBe("no-go");
    expect(v.reasons.join(" ")).toMatch(/below the marginal threshold of 99 %/);
  });

  it("shows enough digits that a value just below a threshold does not read as equal", () => {
    const v = decideVerdict(figures({ availability: 0.99896 }), policy);
    expect(v.status).toBe("marginal");
    expect(v.reasons[0]).toMatch(/Availability 99\.896 % is below the go threshold of 99\.9 %/);
  });

  it("insufficient data below 8000 known hours or below 90 % coverage, whatever the availability", () => {
    const short = decideVerdict(figures({ knownHours: 7999, coverage: 1 }), policy);
    expect(short.status).toBe("insufficient-data");
    expect(short.reasons[0]).toMatch(/Only 7,999 h .* at least 8,000 h/);
    const patchy = decideVerdict(figures({ knownHours: 8500, totalHours: 10_000, coverage: 0.85 }), policy);
    expect(patchy.status).toBe("insufficient-data");
    expect(patchy.reasons[0]).toMatch(/Coverage 85\.00 % .* minimum of 90 %/);
    const noNight = decideVerdict(figures({ requiredKnownHours: 0, availability: null }), policy);
    expect(noNight.status).toBe("insufficient-data");
  });

  it("the organisation's policy and per-study overrides apply", () => {
    const strict = mergePolicy(policy, { goAvailability: 0.9999 });
    expect(decideVerdict(figures({ availability: 0.9995 }), strict).status).toBe("marginal");
    expect(() => mergePolicy(policy, { marginalAvailability: 0.9999 })).toThrow(/cannot be above the go availability/);
  });
});

describe("worst complete calendar year", () => {
  const year = (y: number, complete: boolean, availability: number): YearFigures => ({ ...figures({ availability }), year: y, complete });
  const span = { start: Date.UTC(2021, 6, 1) / 1000, end: Date.UTC(2024, 6, 1) / 1000 };

  it("judges on the worst complete year when the period spans more than a year", () => {
    const v = studyVerdict(
      figures({ availability: 0.9992, knownHours: 26_000, totalHours: 26_300, coverage: 0.99 }),
      [year(2021, false, 0.9), year(2022, true, 0.9995), year(2023, true, 0.995), year(2024, false, 0.5)],
      span,
      policy,
    );
    expect(v.status).toBe("marginal");
    expect(v.basis).toMatchObject({ kind: "worst-complete-year", year: 2023 });
    expect(v.reasons[0]).toBe("Judged on 2023, the worst of the complete calendar years 2022, 2023.");
  });

  it("uses the whole period when it is a year or less", () => {
    const v = studyVerdict(figures({}), [year(2025, true, 0.5)], { start: Date.UTC(2025, 0, 1) / 1000, end: Date.UTC(2026, 0, 1) / 1000 }, policy);
    expect(v.status).toBe("go");
    expect(v.basis.kind).toBe("whole-period");
  });

  it("end to end: a 3-year profile with a bad week in 2023 is judged on 2023", () => {
    const start = Date.UTC(2021, 6, 1) / 1000;
    const n = 3 * 8760 + 24;
    const t = new Float64Array(n);
    const amps = new Float64Array(n);
    const badFrom = Date.UTC(2023, 2, 1) / 1000;
    for (let i = 0; i < n; i++) {
      t[i] = start + i * 3600;
      amps[i] = t[i] >= badFrom && t[i] < badFrom + 10 * 86_400 ? 5 : 150;
    }
    const r = runStudy(
      { t, amps },
      { device: { minCurrentA: 40, maxCurrentA: 2000, harvestW: "min(0.004 * I^2, 15)", loadW: 4 }, location: { lat: 35.2, lon: -97.4 } },
    );
    expect(r.yearly.map((y) => [y.year, y.complete])).toEqual([[2021, false], [2022, true], [2023, true], [2024, false]]);
    expect(r.yearly.find((y) => y.year === 2022)!.darkHours).toBe(0);
    expect(r.verdict.basis.year).toBe(2023);
    expect(r.verdict.status).toBe("no-go"); // ~120 dark night hours of ~4,400
    expect(r.verdict.reasons[0]).toMatch(/Judged on 2023/);
  });
});

describe("solvers", () => {
  // One year of hourly current with a low-load spell every 9 days (invented).
  function yearWithSpells(spellDays: number): Series {
    const start = Date.UTC(2025, 0, 1) / 1000;
    const n = 8760 + 1;
    const t = new Float64Array(n);
    const amps = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      t[i] = start + i * 3600;
      const day = i / 24;
      amps[i] = day % 9 < spellDays ? 20 : 120 + 40 * Math.sin((2 * Math.PI * i) / 24);
    }
    return { t, amps };
  }
  const input: StudyInput = {
    device: { minCurrentA: 40, maxCurrentA: 2000, harvestW: "min(0.004 * I^2, 15)", loadW: 4, storageWh: 0 },
    location: { lat: 35.2, lon: -97.4 },
  };
  const status = (s: Series, device: object) => runStudy(s, { ...input, device: { ...input.device, ...device } }).verdict.status;

  it("smallest storage reaching go: go at the answer, not go two tolerances below", () => {
    const s = yearWithSpells(1);
    const r = solveMinStorage(prepareStudy(s, input), { toleranceWh: 1 });
    expect(r.reachable).toBe(true);
    expect(r.unit).toBe("Wh");
    expect(r.value!).toBeGreaterThan(10);
    expect(status(s, { storageWh: r.value })).toBe("go");
    expect(status(s, { storageWh: r.value! - 2 })).not.toBe("go");
    expect(r.iterations).toBeGreaterThan(3);
  });

  it("storage cannot help a store that starts empty on a line that never carries enough current", () => {
    const s = yearWithSpells(9); // always 20 A < 40 A minimum
    const r = solveMinStorage(prepareStudy(s, { ...input, device: { ...input.device, initialCharge: 0 } }));
    expect(r.reachable).toBe(false);
    expect(r.value).toBeUndefined();
    expect(r.reason).toMatch(/does not reach go/);
  });

  it("not reachable when there is not enough data", () => {
    const s = yearWithSpells(1);
    const short = { t: s.t.subarray(0, 24 * 30), amps: s.amps.subarray(0, 24 * 30) };
    expect(solveMinStorage(prepareStudy(short, input)).reachable).toBe(false);
    expect(solveMaxMinCurrent(prepareStudy(short, input)).reason).toMatch(/Not enough data/);
  });

  it("largest minimum current still reaching go: go at the answer, not go two tolerances above", () => {
    const s = yearWithSpells(0); // 80–160 A daily swing, no spells
    const r = solveMaxMinCurrent(prepareStudy(s, input), { toleranceA: 0.5 });
    expect(r.reachable).toBe(true);
    // No storage: the answer lies inside the 80–160 A swing (the lowest currents fall partly by day).
    expect(r.value!).toBeGreaterThan(80);
    expect(r.value!).toBeLessThan(160);
    expect(status(s, { minCurrentA: r.value })).toBe("go");
    expect(status(s, { minCurrentA: r.value! + 1 })).not.toBe("go");
  });

  it("not reachable when even a 0 A minimum does not light the load", () => {
    const s = yearWithSpells(0);
    const r = solveMaxMinCurrent(prepareStudy(s, { ...input, device: { ...input.device, harvestW: "min(0.001 * I, 1)" } }));
    expect(r.reachable).toBe(false);
    expect(r.reason).toMatch(/0 A/);
  });
});

describe("feasibility request schema", () => {
  const body = {
    samples: [["2025-01-01T00:00:00Z", 112.5], ["2025-01-01T00:05:00Z", 108.0]],
    location: { lat: 35.2, lon: -97.4 },
    device: { minCurrentA: 40, maxCurrentA: 2000, harvestW: "min(0.004*I^2, 15)", loadW: 4, standbyW: 0.1, storageWh: 0, chargeEfficiency: 0.9 },
    schedule: { kind: "night", sunAltitudeDeg: -0.833 },
    interpolation: "linear",
    maxGapMinutes: 15,
    policy: { goAvailability: 0.999 },
  };

  it("accepts the the API section of README.md example and fills defaults", () => {
    const parsed = feasibilityRequestSchema.parse(body);
    expect(parsed.device.initialCharge).toBe(1);
    expect(parsed.phase).toBe("A");
    expect(parsed.loadScale).toBe(1);
  });

  it("gives readable errors with paths", () => {
    const r = feasibilityRequestSchema.safeParse({ ...body, samples: undefined, location: { lat: 95, lon: 0 }, device: { ...body.device, minCurrentA: 3000 } });
    expect(r.success).toBe(false);
    const issues = r.error!.issues.map((i) => [i.path.join("."), i.message]);
    expect(issues).toContainEqual(["location.lat", "Latitude must be between −90 and 90."]);
    expect(issues).toContainEqual(["device.maxCurrentA", "Maximum current must be above the minimum operating current."]);
    expect(issues).toContainEqual(["samples", "Send either samples or csv."]);
  });
});
