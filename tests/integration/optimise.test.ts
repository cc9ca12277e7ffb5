// The optimiser over HTTP (issue 13): POST /api/v1/optimise on a closed-form load, its
// recommendation re-run alone through /api/v1/feasibility (go) against every cheaper candidate (not
// go) over random candidate lists, the limits, and the crossing and fleet runs as jobs.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import fc from "fast-check";
import { randomUUID } from "node:crypto";
import { setTimeout as sleep } from "node:timers/promises";
import { closeDb } from "../../db/index";
import { Job, Study, User } from "../../db/models";
import { hashPassword } from "../../lib/passwords";
import { generateLoadCsv } from "../../lib/demo/load-generator";
import { baseUrl, signIn, type Client } from "../support/http";
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
let circuitId: number;
let crossingId: number;
let profileId: number;
let deviceId: number;
const deviceName = `Optimiser device ${randomUUID().slice(0, 6)}`;
// Invented: a year at hourly samples (enough known hours for the default policy's 8000).
const CSV = generateLoadCsv({ seed: 13, start: "2025-01-01T00:00:00Z", days: 366, intervalMinutes: 60, phases: 1, baseA: 90, dailySwingA: 40, seasonalSwingA: 15 });

beforeAll(async () => {
  testDb();
  const demo = (await User.findOne({ where: { email: "engineer@example.com" } }))!;
  const email = `optimise-${randomUUID().slice(0, 8)}@example.com`;
  await User.create({ organisationId: demo.organisationId, email, name: "Optimiser test engineer", role: "engineer", passwordHash: await hashPassword("optimise-test-pass-1"), active: true });
  engineer = await signIn(email, "optimise-test-pass-1");
  const circuit = await (await engineer.json("/api/v1/circuits", "POST", { name: `Optimiser test ${randomUUID().slice(0, 6)}`, voltageKv: 115, phases: 1 })).json();
  circuitId = circuit.id;
  const crossing = await (await engineer.json(`/api/v1/circuits/${circuitId}/crossings`, "POST", { name: "Optimiser crossing", lat: 45, lon: -95, spanLength: { value: 800, unit: "ft" }, kind: "river" })).json();
  crossingId = crossing.id;
  const up = await fetch(`${baseUrl()}/api/v1/circuits/${circuitId}/profiles?timestampColumn=Timestamp&currentColumn=${encodeURIComponent("I [A]")}`, {
    method: "POST",
    body: CSV,
    headers: { cookie: engineer.cookie, "content-type": "text/csv" },
  });
  expect(up.status).toBe(201);
  profileId = (await up.json()).profile.id;
  const device = await engineer.post("/devices/new", {
    name: deviceName,
    minCurrentA: "40",
    turnOnCurrentA: "55",
    maxCurrentA: "2000",
    harvestW: "min(0.004*I^2, 15)",
    loadW: "4",
    standbyW: "0.1",
    storageWh: "20",
    chargeEfficiency: "0.9",
    coldDerating: "-20:0.5, 20:1",
  });
  expect(device.status).toBe(302);
  deviceId = Number(device.headers.get("location")!.split("/").pop());
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


/** The optimiser form for our device only (other tests' devices are left unticked). */
function optimiserForm(extra: Record<string, string>): Record<string, string> {
  return {
    [`use-${deviceId}`]: "on",
    [`unitCost-${deviceId}`]: "900",
    [`installCost-${deviceId}`]: "300",
    [`lifeYears-${deviceId}`]: "15",
    storageMode: "list",
    storageSizesWh: "0, 20, 80, 400",
    storageCostPerWh: "1.5",
    storageLifeYears: "8",
    horizonYears: "20",
    discountRatePercent: "5",
    loadGrowthPercentPerYear: "-1",
    requireGoInLastYear: "on",
    monthlyTemperatureC: "-10 -8 0 8 15 20 24 23 17 9 1 -6",
    ...extra,
  };
}

describe("the optimiser on a crossing and on a circuit (jobs)", () => {
  it("the device form keeps the turn-on current and the cold curve", async () => {
    const page = await (await engineer.get(`/devices/${deviceId}`)).text();
    expect(page).toContain('value="55"');
    expect(page).toContain("-20:0.5, 20:1");
  });

  it("a bad form is a 400 naming the field and starts no job", async () => {
    const before = await Job.count({ where: { kind: "optimise.crossing" } });
    const res = await engineer.post(`/crossings/${crossingId}/optimise`, optimiserForm({ storageCostPerWh: "cheap", monthlyTemperatureC: "1 2 3" }));
    expect(res.status).toBe(400);
    const html = await res.text();
    expect(html).toContain("Storage cost per Wh must be a number.");
    expect(html).toContain("Give twelve monthly temperatures");
    expect(await Job.count({ where: { kind: "optimise.crossing" } })).toBe(before);
  });

  it("a crossing's run goes to its job page, and the job opens the result table", async () => {
    const res = await engineer.post(`/crossings/${crossingId}/optimise`, optimiserForm({ profileId: String(profileId) }));
    expect(res.status, await res.clone().text()).toBe(302);
    const jobId = Number(res.headers.get("location")!.match(/^\/jobs\/(\d+)$/)![1]);
    const job = await waitForJob(engineer, jobId);
    expect(job.state, JSON.stringify(job.error)).toBe("done");
    const result = job.result as { candidates: unknown[]; recommended: { name: string; storageWh: number } | null };
    expect(result.candidates).toHaveLength(4);
    // The job page sends a finished run to its result.
    const jobPage = await engineer.get(`/jobs/${jobId}`);
    expect(jobPage.status).toBe(302);
    expect(jobPage.headers.get("location")).toBe(`/crossings/${crossingId}/optimise?job=${jobId}`);
    const html = await (await engineer.get(`/crossings/${crossingId}/optimise?job=${jobId}`)).text();
    if (result.recommended) expect(html).toContain(`Recommended: <strong>${deviceName}</strong> with <strong>${result.recommended.storageWh}<!-- --> Wh</strong>`);
    else expect(html).toContain("Nothing offered reaches go");
    expect(html).toMatch(/aviation authority/i);
  });

  it("a circuit's run gives one row per crossing, a fleet total and a CSV", async () => {
    const res = await engineer.post("/optimise", optimiserForm({ scope: String(circuitId) }));
    expect(res.status, await res.clone().text()).toBe(302);
    const jobId = Number(res.headers.get("location")!.match(/^\/jobs\/(\d+)$/)![1]);
    const job = await waitForJob(engineer, jobId);
    expect(job.state, JSON.stringify(job.error)).toBe("done");
    const result = job.result as { rows: { crossing: string; equivalentAnnualCost: number | null }[]; totals: { crossings: number; equivalentAnnualCost: number } };
    expect(result.rows.map((r) => r.crossing)).toEqual(["Optimiser crossing"]);
    expect(result.totals.equivalentAnnualCost).toBeCloseTo(result.rows.reduce((s, r) => s + (r.equivalentAnnualCost ?? 0), 0), 9);
    const csv = await engineer.get(`/optimise.csv?job=${jobId}`);
    expect(csv.status).toBe(200);
    const text = await csv.text();
    expect(text.split("\r\n")[0]).toBe("circuit,crossing,load_profile,recommended_device,storage_wh,equivalent_annual_cost,present_value,note");
    expect(text).toContain("Optimiser crossing");
    expect(text).toContain("Fleet total");
    // Another crossing's page does not show this run.
    expect((await engineer.get(`/crossings/${crossingId}/optimise?job=${jobId}`)).status).toBe(404);
  });
});

describe("what the cold months cost, on a saved study", () => {
  const temperatures = [-10, -8, 0, 8, 15, 20, 24, 23, 17, 9, 1, -6];

  it("a study with monthly temperatures stores and shows the cold's cost", async () => {
    const res = await engineer.json("/api/v1/studies", "POST", { crossingId, profileId, deviceProfileId: deviceId, params: { monthlyTemperatureC: temperatures } });
    expect(res.status, await res.clone().text()).toBe(201);
    const id = (await res.json()).id as number;
    const study = (await Study.findByPk(id))!;
    const cold = (study.results as { coldCost: { darkHours: number; darkHoursWithoutDerating: number; extraDarkHours: number; byMonth: { temperatureC: number }[] } }).coldCost;
    // Derating only takes storage away, so it never darkens less (the same run without it is the bound).
    expect(cold.darkHours).toBeGreaterThanOrEqual(cold.darkHoursWithoutDerating - 1e-6);
    expect(cold.extraDarkHours).toBeCloseTo(cold.darkHours - cold.darkHoursWithoutDerating, 9);
    expect(cold.byMonth[0].temperatureC).toBe(-10);
    const html = await (await engineer.get(`/studies/${id}`)).text();
    expect(html).toContain("What the cold months cost");
  });

  it("the study form refuses eleven temperatures, naming the field", async () => {
    const res = await engineer.post(`/crossings/${crossingId}/studies/new`, { profileId: String(profileId), deviceProfileId: String(deviceId), scheduleKind: "night", monthlyTemperatureC: "1 2 3 4 5 6 7 8 9 10 11" });
    expect(res.status).toBe(400);
    expect(await res.text()).toContain('id="paramsMonthlyTemperatureC-error"');
  });
});
