// The optimiser over HTTP (issue 13): POST /api/v1/optimise on a closed-form load, its
// recommendation re-run alone through /api/v1/feasibility (go) against every cheaper candidate (not
// go) over random candidate lists, the limits, and the crossing and fleet runs as jobs.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import fc from "fast-check";
import { randomUUID } from "node:crypto";
import { setTimeout as sleep } from "node:timers/promises";
import { closeDb } from "../../db/index";
import { Job, User } from "../../db/models";
import { hashPassword } from "../../lib/passwords";
import { signIn, type Client } from "../support/http";
import { testDb } from "../support/db";

const HOUR = 3600_000;
const T0 = Date.UTC(2025, 0, 6);
/** 20 days of 12 h at 100 A then 12 h at 0 A, 15-minute samples (the unit test's closed form). */
const samples = Array.from({ length: 20 * 96 + 1 }, (_, i) => [new Date(T0 + i * 900_000).toISOString(), (i * 900_000) % (24 * HOUR) < 12 * HOUR ? 100 : 0] as const);
// Flat 10 W above the minimum current, 2 W light, lossless store starting full: each 12 h at 0 A
// needs 12 h × 2 W = 24 Wh (closed form), so exactly the sizes ≥ 24 Wh reach go.
const harvester = (minCurrentA: number) => ({ minCurrentA, maxCurrentA: 1000, harvestW: "10 + 0 * I", loadW: 2, standbyW: 0, chargeEfficiency: 1, selfDischargePctPerDay: 0, initialCharge: 1 });
const study = { samples, location: { lat: 0, lon: 0 }, schedule: { kind: "always" }, interpolation: "step", policy: { minKnownHours: 100 } };

let engineer: Client;

beforeAll(async () => {
  testDb();
  const demo = (await User.findOne({ where: { email: "engineer@example.com" } }))!;
  const email = `optimise-${randomUUID().slice(0, 8)}@example.com`;
  await User.create({ organisationId: demo.organisationId, email, name: "Optimiser test engineer", role: "engineer", passwordHash: await hashPassword("optimise-test-pass-1"), active: true });
  engineer = await signIn(email, "optimise-test-pass-1");
});
afterAll(async () => {
  await closeDb();
});

describe("POST /api/v1/optimise", () => {
  it("recommends the cheapest size at or above the closed-form 24 Wh, from a range with a step", async () => {
    const res = await engineer.json("/api/v1/optimise", "POST", {
      ...study,
      candidates: [{ name: "Flat harvester", device: harvester(50), unitCost: 100, lifeYears: 20 }],
      storage: { range: { fromWh: 0, toWh: 40, stepWh: 5 }, costPerWh: 2, lifeYears: 10 },
      horizonYears: 20,
      discountRatePercent: 5,
    });
    expect(res.status, await res.clone().text()).toBe(200);
    const body = await res.json();
    expect(body.candidates.map((c: { storageWh: number }) => c.storageWh)).toEqual([0, 5, 10, 15, 20, 25, 30, 35, 40]);
    expect(body.recommended).toMatchObject({ name: "Flat harvester", storageWh: 25 });
    expect(body.closest).toBeNull();
    // Bisection: at most ⌈log2 10⌉ = 4 simulations for 9 sizes.
    expect(body.simulations).toBeLessThanOrEqual(4);
    expect(body.quality).toBeTypeOf("object");
  });

  it("when nothing reaches go it names the closest and what it would take", async () => {
    const res = await engineer.json("/api/v1/optimise", "POST", {
      ...study,
      candidates: [{ name: "Flat harvester", device: harvester(50), unitCost: 100, lifeYears: 20 }],
      storage: { sizesWh: [0, 10], costPerWh: 2, lifeYears: 10 },
    });
    const body = await res.json();
    expect(body.recommended).toBeNull();
    expect(body.closest).toMatchObject({ name: "Flat harvester", storageWh: 10 });
    expect(body.closest.wouldTake).toMatch(/Wh/);
  });

  it("property: the recommendation alone through /feasibility is go; every cheaper candidate is not", async () => {
    const candidate = fc.record({
      minCurrentA: fc.constantFrom(0, 50, 150),
      unitCost: fc.integer({ min: 0, max: 300 }),
      lifeYears: fc.constantFrom(5, 10, 20),
    });
    await fc.assert(
      fc.asyncProperty(
        fc.array(candidate, { minLength: 1, maxLength: 3 }),
        fc.uniqueArray(fc.integer({ min: 0, max: 40 }), { minLength: 1, maxLength: 4 }),
        async (list, sizesWh) => {
          const candidates = list.map((c, i) => ({ name: `C${i}`, device: harvester(c.minCurrentA), unitCost: c.unitCost, lifeYears: c.lifeYears }));
          const res = await engineer.json("/api/v1/optimise", "POST", { ...study, candidates, storage: { sizesWh, costPerWh: 2, lifeYears: 10 }, horizonYears: 20, discountRatePercent: 5 });
          expect(res.status).toBe(200);
          const body = (await res.json()) as { candidates: { name: string; storageWh: number; equivalentAnnualCost: number }[]; recommended: { name: string; storageWh: number; equivalentAnnualCost: number } | null };
          const verdictAlone = async (name: string, storageWh: number) => {
            const device = { ...candidates.find((c) => c.name === name)!.device, storageWh };
            const r = await engineer.json("/api/v1/feasibility", "POST", { ...study, device });
            expect(r.status).toBe(200);
            return ((await r.json()) as { verdict: { status: string } }).verdict.status;
          };
          const bar = body.recommended?.equivalentAnnualCost ?? Infinity;
          if (body.recommended) expect(await verdictAlone(body.recommended.name, body.recommended.storageWh)).toBe("go");
          for (const row of body.candidates.filter((c) => c.equivalentAnnualCost < bar)) expect(await verdictAlone(row.name, row.storageWh)).not.toBe("go");
        },
      ),
      { numRuns: 6 },
    );
  });

  it("a candidate list past the pair limit is a 422 naming the limit", async () => {
    const candidates = Array.from({ length: 20 }, (_, i) => ({ name: `C${i}`, device: harvester(50), unitCost: 1, lifeYears: 20 }));
    const res = await engineer.json("/api/v1/optimise", "POST", { ...study, candidates, storage: { range: { fromWh: 0, toWh: 149, stepWh: 1 }, costPerWh: 1, lifeYears: 10 } });
    expect(res.status).toBe(422);
    const body = await res.json();
    expect(body.errors[0]).toMatchObject({ path: "storage.range" });
    expect(body.detail).toMatch(/2000 candidate × storage-size pairs/);
  });
});

async function waitForJob(client: Client, id: number, timeoutMs = 90_000): Promise<Job> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    await client.get(`/api/v1/jobs/${id}`); // reading a job starts the app's runner
    const job = await Job.findByPk(id);
    if (job && (job.state === "done" || job.state === "failed")) return job;
    if (Date.now() > deadline) throw new Error(`Job ${id} still ${job?.state} after ${timeoutMs} ms`);
    await sleep(250);
  }
}

