// Records the fault tests share: a circuit with a crossing, a device profile, and CSV bodies.
import { randomUUID } from "node:crypto";
import { expect } from "vitest";
import { baseUrl, type Client } from "../support/http";

/** `days` of 5-minute samples at 120 A, one header line. */
export function dayCsv(days = 2, amps = 120): string {
  const lines = ["Time,Amps"];
  const start = Date.UTC(2025, 2, 1);
  for (let i = 0; i < days * 288; i++) lines.push(`${new Date(start + i * 300_000).toISOString()},${amps}`);
  return lines.join("\n") + "\n";
}

export interface Scene {
  circuitId: number;
  crossingId: number;
  deviceProfileId: number;
  profileId: number;
}

/** A fresh circuit, crossing, uploaded profile and device profile of the engineer's organisation. */
export async function createScene(engineer: Client, base = baseUrl()): Promise<Scene> {
  const tag = randomUUID().slice(0, 8);
  const circuit = await (await engineer.json("/api/v1/circuits", "POST", { name: `Fault test ${tag}`, voltageKv: 115, phases: 1 })).json();
  const crossing = await (
    await engineer.json(`/api/v1/circuits/${circuit.id}/crossings`, "POST", { name: "Fault crossing", lat: 40, lon: -100, spanLength: { value: 900, unit: "ft" }, kind: "river" })
  ).json();
  const up = await uploadCsv(engineer, circuit.id, dayCsv(), "base profile", base);
  expect(up.status).toBe(201);
  const profileId = (await up.json()).profile.id;
  const device = { minCurrentA: 40, maxCurrentA: 2000, harvestW: "min(0.004*I^2, 15)", loadW: 4, standbyW: 0.1, storageWh: 50, chargeEfficiency: 0.9 };
  const created = await engineer.post("/devices/new", { name: `Fault device ${tag}`, ...Object.fromEntries(Object.entries(device).map(([k, v]) => [k, String(v)])) });
  expect(created.status).toBe(302);
  return { circuitId: circuit.id, crossingId: crossing.id, profileId, deviceProfileId: Number(created.headers.get("location")!.split("/").pop()) };
}

export function uploadCsv(engineer: Client, circuitId: number, csv: string, name: string, base = baseUrl(), headers: Record<string, string> = {}) {
  const query = new URLSearchParams({ timestampColumn: "Time", currentColumn: "Amps", name });
  return fetch(`${base}/api/v1/circuits/${circuitId}/profiles?${query}`, {
    method: "POST",
    body: csv,
    headers: { cookie: engineer.cookie, "x-forwarded-for": engineer.address, "content-type": "text/csv", ...headers },
  });
}

export function studyBody(scene: Scene) {
  return { crossingId: scene.crossingId, profileId: scene.profileId, deviceProfileId: scene.deviceProfileId, schedule: { kind: "always" } };
}
