// Study figures that add up (issue 9): exceeded-p currents in the API and in saved studies, hours
// above the circuit's normal rating, the monthly Unknown column, and the policy form in per cent.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { randomUUID } from "node:crypto";
import { closeDb } from "../../db/index";
import { OrganisationPolicy } from "../../db/models";
import { baseUrl, signIn, type Client } from "../support/http";
import { testDb } from "../support/db";

const DEVICE = { minCurrentA: 40, maxCurrentA: 2000, harvestW: "min(0.004*I^2, 15)", loadW: 4 };
const base = { location: { lat: 40, lon: -100 }, device: DEVICE, schedule: { kind: "always" }, policy: { minKnownHours: 0, minCoverage: 0 } };

// Two days of 5-minute samples: 100 A for the first day, 10 A for the second.
function twoDays(): [string, number][] {
  const start = Date.UTC(2025, 5, 1);
  return Array.from({ length: 576 }, (_, i) => [new Date(start + i * 300_000).toISOString(), i < 288 ? 100 : 10]);
}

let engineer: Client;
beforeAll(async () => {
  testDb();
  engineer = await signIn("engineer@example.com");
});
afterAll(async () => {
  await closeDb();
});

describe("POST /api/v1/feasibility: current.exceeded and current.rating", () => {
  it("reports the currents exceeded 10 / 50 / 90 % of the known time, worked by hand", async () => {
    const res = await engineer.json("/api/v1/feasibility", "POST", { ...base, samples: twoDays(), ratingA: 50 });
    expect(res.status).toBe(200);
    const r = await res.json();
    // Known: 575 intervals of 5 min = 2875 min. At 100 A for 287 × 5 = 1435 min, then one 5-min ramp
    // 100 → 10 A, then 10 A. Half the known time is 1437.5 min: 2.5 min into the ramp,
    // 100 − 90 × 2.5 / 5 = 55 A. p10 lies inside the 100 A day, p90 inside the 10 A day.
    // Held values are steps in the curve: read to within the refined level step, (100 − 10) / 200² A.
    const step = 90 / 200 ** 2;
    expect(Math.abs(r.current.exceeded.p50A - 55)).toBeLessThan(step);
    expect(r.current.exceeded.p10A).toBeCloseTo(100, 6); // held at the top for half the time
    expect(Math.abs(r.current.exceeded.p90A - 10)).toBeLessThan(step);
    // Above 50 A: the 100 A day plus (100 − 50) / 90 of the ramp.
    expect(r.current.rating.ratingA).toBe(50);
    expect(r.current.rating.hoursAbove).toBeCloseTo((1435 + (50 / 90) * 5) / 60, 4);
    expect(r.current.hoursAboveMax).toBe(0); // the device's 2000 A is never reached
  });

  it("has no rating without one, and rejects a non-positive rating naming the field", async () => {
    const r = await (await engineer.json("/api/v1/feasibility", "POST", { ...base, samples: twoDays() })).json();
    expect(r.current.rating).toBeNull();
    const bad = await engineer.json("/api/v1/feasibility", "POST", { ...base, samples: twoDays(), ratingA: 0 });
    expect(bad.status).toBe(400);
    expect((await bad.json()).errors[0].path).toBe("ratingA");
  });
});

describe("saved study of a circuit with a normal rating", () => {
  it("judges hours above the circuit rating, shows both thresholds, the exceeded-p currents and the Unknown column", async () => {
    const name = `Rated ${randomUUID().slice(0, 6)}`;
    const circuit = await (await engineer.json("/api/v1/circuits", "POST", { name, voltageKv: 115, phases: 1, normalRatingA: 60 })).json();
    const crossing = await (
      await engineer.json(`/api/v1/circuits/${circuit.id}/crossings`, "POST", { name: "Rated crossing", lat: 40, lon: -100, spanLength: { value: 300, unit: "m" }, kind: "road" })
    ).json();
    // A 6-hour hole in the second day leaves required (always) time unknown.
    const rows = twoDays().filter(([t]) => !(t > "2025-06-02T06:00" && t < "2025-06-02T12:00"));
    const up = await fetch(`${baseUrl()}/api/v1/circuits/${circuit.id}/profiles?timestampColumn=Time&currentColumn=Amps`, {
      method: "POST",
      body: ["Time,Amps", ...rows.map(([t, a]) => `${t},${a}`)].join("\n"),
      headers: { cookie: engineer.cookie, "content-type": "text/csv" },
    });
    expect(up.status).toBe(201);
    const profileId = (await up.json()).profile.id;
    const dev = await engineer.post("/devices/new", { name: `Rated device ${randomUUID().slice(0, 6)}`, ...Object.fromEntries(Object.entries(DEVICE).map(([k, v]) => [k, String(v)])) });
    const deviceProfileId = Number(dev.headers.get("location")!.split("/").pop());
    const res = await engineer.json("/api/v1/studies", "POST", { crossingId: crossing.id, profileId, deviceProfileId, schedule: { kind: "always" }, params: { maxGapMinutes: 15 } });
    expect(res.status).toBe(201);
    const study = await res.json();
    const c = study.results.current;
    expect(c.rating.ratingA).toBe(60);
    expect(c.rating.hoursAbove).toBeCloseTo((1435 + (40 / 90) * 5) / 60, 4);
    expect(c.exceeded.p10A).toBeCloseTo(100, 6);
    for (const m of study.results.monthly) expect(m.litHours + m.darkHours + m.requiredUnknownHours).toBeCloseTo(m.requiredHours, 6);
    expect(study.results.monthly[0].requiredUnknownHours).toBeGreaterThan(5.9);

    const html = await (await engineer.get(`/studies/${study.id}`)).text();
    expect(html).toContain("Hours above the circuit&#x27;s 60 A normal rating");
    expect(html).toContain("Above the device&#x27;s 2,000 A maximum");
    expect(html).toContain("Unknown h");
    expect(html).toMatch(/exceeds 100\.0 A for 10 %, [\d.]+ A for half and 10\.0 A for 90 % of the known time/);
  });
});

describe("admin policy form in per cent", () => {
  it("stores 99.9 as 0.999 and refuses 998 with a per-cent message", async () => {
    const admin = await signIn("admin@example.com");
    const page = await (await admin.get("/admin/policy")).text();
    expect(page).toContain("Go: availability at least (%)");
    const bad = await admin.post("/admin/policy", { intent: "save", minKnownHours: "8000", minCoverage: "90", goAvailability: "998", maxDarkStretchHours: "0.5", marginalAvailability: "99" });
    expect(bad.status).toBe(400);
    expect(await bad.text()).toContain("Go availability must be between 0 and 100 %.");
    // Saving the defaults typed in per cent stores the default fractions (other tests rely on them).
    const ok = await admin.post("/admin/policy", { intent: "save", minKnownHours: "8000", minCoverage: "90", goAvailability: "99.9", maxDarkStretchHours: "0.5", marginalAvailability: "99" });
    expect(ok.status).toBe(200);
    const rows = await OrganisationPolicy.findAll();
    const saved = rows.map((r) => r.policy as Record<string, number>).find((p) => p.goAvailability !== undefined)!;
    expect(saved).toMatchObject({ minCoverage: 0.9, goAvailability: 0.999, marginalAvailability: 0.99, minKnownHours: 8000, maxDarkStretchHours: 0.5 });
  });
});
