// The optimiser (lib/optimise/optimise.ts): a closed-form case where only storage ≥ X Wh
// reaches go, costs worked by hand, pruning compared with brute force, and a property over
// random candidate lists.
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import type { Series } from "../../lib/series";
import { runStudy } from "../../lib/engine/simulate";
import { candidateCost, optimise, type OptimiseCandidate, type OptimiseInput } from "../../lib/optimise/optimise";

const HOUR = 3600;
const T0 = Date.UTC(2025, 0, 6) / 1000;
const DAYS = 20;

/** 12 h at 100 A, then 12 h at 0 A, every day; 15-minute samples, held (step interpolation). */
function halfDayLoad(): Series {
  const n = DAYS * 96 + 1;
  const t = new Float64Array(n);
  const amps = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    t[i] = T0 + i * 900;
    amps[i] = (i * 900) % (24 * HOUR) < 12 * HOUR ? 100 : 0;
  }
  return { t, amps };
}

// Above its minimum current the harvester gives a flat 10 W (written "10 + 0 * I": the engine asks for an expression in I); the light draws 2 W; lossless storage starting full.
// Dark each day for 12 h at 0 A, so the store must hold 12 h × 2 W = 24 Wh (closed form);
// it refills in the lit half: 12 h × (10 − 2) W = 96 Wh ≥ 24 Wh.
const X_WH = 24;
const harvester = (minCurrentA: number) => ({ minCurrentA, maxCurrentA: 1000, harvestW: "10 + 0 * I", loadW: 2, standbyW: 0, chargeEfficiency: 1, selfDischargePctPerDay: 0, initialCharge: 1 });

const base = {
  location: { lat: 0, lon: 0 },
  schedule: { kind: "always" as const },
  params: { interpolation: "step" as const },
  policy: { minKnownHours: 100 },
  storage: { sizesWh: [0, 6, 12, 20, 23, 25, 30, 48], costPerWh: 2, lifeYears: 10 },
  horizonYears: 20,
  discountRatePercent: 5,
};

describe("optimiser: closed form", () => {
  const small: OptimiseCandidate = { name: "Small harvester", device: harvester(50), unitCost: 100, installCost: 0, lifeYears: 20 };

  it(`only storage ≥ ${X_WH} Wh reaches go, so the cheapest go is the 25 Wh size`, () => {
    const result = optimise(halfDayLoad(), { ...base, candidates: [small] });
    const verdictOf = (wh: number) => result.candidates.find((r) => r.storageWh === wh)!.verdict;
    expect(verdictOf(25)).toBe("go");
    expect(verdictOf(30)).toBe("go");
    expect(verdictOf(48)).toBe("go");
    for (const wh of [0, 6, 12, 20, 23]) expect(verdictOf(wh)).not.toBe("go");
    expect(result.recommended).toMatchObject({ name: "Small harvester", storageWh: 25 });
    // Bisection over 8 sizes: at most ⌈log2 9⌉ = 4 simulations. Once 30 Wh is shown to be go only
    // smaller sizes are tried, so 48 Wh is never simulated: its go is inferred.
    expect(result.simulations).toBeLessThanOrEqual(4);
    expect(result.candidates.find((r) => r.storageWh === 48)!.evaluation).toBe("inferred-go");
  });

  it("23 Wh leaves 1 Wh / 2 W = 0.5 h dark every day (the closed form's other side)", () => {
    const r = runStudy(halfDayLoad(), { ...base, device: { ...harvester(50), storageWh: 23 } });
    expect(r.lighting.longestDarkStretchHours).toBeCloseTo(0.5, 6);
  });

  it("costs: device once (life = horizon), storage twice (life 10 of 20 years), discounted at 5 %", () => {
    // PV = 100 + 25·2 + 25·2 / 1.05^10 = 150 + 50 / 1.628895 = 180.6957; EAC = PV × CRF(5 %, 20) = PV × 0.0802426
    const cost = candidateCost(small, 25, base.storage, 20, 5);
    expect(cost.presentValue).toBeCloseTo(150 + 50 / Math.pow(1.05, 10), 9);
    expect(cost.presentValue).toBeCloseTo(180.6957, 3);
    expect(cost.equivalentAnnualCost).toBeCloseTo(180.6957 * 0.0802426, 3);
  });

  it("prefers a dearer device when it needs less storage and costs less per year overall", () => {
    const alwaysOn: OptimiseCandidate = { name: "Zero-threshold harvester", device: harvester(0), unitCost: 120, installCost: 0, lifeYears: 20 };
    const result = optimise(halfDayLoad(), { ...base, candidates: [small, alwaysOn] });
    // 120 at 0 Wh < 100 + 50 + 50/1.05^10 at 25 Wh.
    expect(result.recommended).toMatchObject({ name: "Zero-threshold harvester", storageWh: 0 });
  });

  it("when nothing reaches go it names the closest candidate and what it would take", () => {
    const result = optimise(halfDayLoad(), { ...base, storage: { ...base.storage, sizesWh: [0, 10] }, candidates: [small] });
    expect(result.recommended).toBeNull();
    expect(result.closest).toMatchObject({ name: "Small harvester", storageWh: 10 });
    expect(result.closest!.wouldTake).toMatch(/Go from about 2[45] Wh/);
  });

  it("progress counts the closest's solver runs as they happen and never reaches the whole before the end", () => {
    const seen: [number, number][] = [];
    const result = optimise(halfDayLoad(), { ...base, storage: { ...base.storage, sizesWh: [0, 10] }, candidates: [small] }, { onProgress: (done, most) => seen.push([done, most]) });
    // One report per simulation: 2 for the bisection over [0, 10] Wh, the rest the solver's.
    expect(seen.length).toBe(result.simulations);
    expect(result.simulations).toBeGreaterThan(2);
    expect(seen.map(([done]) => done)).toEqual(seen.map((_, k) => k + 1));
    // Load 2 W: ⌈log2 2⌉ = 2 bisection runs + the solver's most, 2 + ⌈log2 366⌉ + ⌈log2 17,568⌉ = 2 + 9 + 15 = 26.
    for (const [done, most] of seen) {
      expect(most).toBe(2 + 26);
      expect(done).toBeLessThan(most);
    }
  });

  it("too little data: every candidate is insufficient-data and nothing is recommended", () => {
    const result = optimise(halfDayLoad(), { ...base, policy: { minKnownHours: 8000 }, candidates: [small, { ...small, name: "Other" }] });
    expect(new Set(result.candidates.map((r) => r.verdict))).toEqual(new Set(["insufficient-data"]));
    expect(result.recommended).toBeNull();
    expect(result.closest).toBeNull();
  });
});

describe("optimiser: pruning never changes the answer", () => {
  const series = halfDayLoad();
  const candidateArb = fc.record({
    minCurrentA: fc.constantFrom(0, 50, 150),
    loadW: fc.constantFrom(1, 2, 3),
    unitCost: fc.integer({ min: 0, max: 500 }),
    lifeYears: fc.integer({ min: 5, max: 30 }),
  });

  it("matches brute force: every inferred verdict agrees with a direct run, and the recommendation is the cheapest go", () => {
    fc.assert(
      fc.property(fc.array(candidateArb, { minLength: 1, maxLength: 3 }), fc.uniqueArray(fc.integer({ min: 0, max: 60 }), { minLength: 1, maxLength: 6 }), (specs, sizes) => {
        const candidates = specs.map((s, i) => ({ name: `Device ${i}`, device: { ...harvester(s.minCurrentA), loadW: s.loadW }, unitCost: s.unitCost, installCost: 10, lifeYears: s.lifeYears }));
        const input: OptimiseInput = { ...base, storage: { ...base.storage, sizesWh: sizes }, candidates };
        const result = optimise(series, input);
        let cheapestGo: { name: string; storageWh: number; eac: number } | null = null;
        for (const row of result.candidates) {
          const candidate = candidates.find((c) => c.name === row.name)!;
          const direct = runStudy(series, { ...input, device: { ...candidate.device, storageWh: row.storageWh } }).verdict.status;
          if (row.verdict === null) expect(direct).not.toBe("go");
          else expect(row.verdict === "go").toBe(direct === "go");
          if (direct === "go" && (!cheapestGo || row.equivalentAnnualCost < cheapestGo.eac)) cheapestGo = { name: row.name, storageWh: row.storageWh, eac: row.equivalentAnnualCost };
        }
        expect(result.recommended?.equivalentAnnualCost ?? null).toBe(cheapestGo?.eac ?? null);
      }),
      { numRuns: 25 },
    );
  });
});
