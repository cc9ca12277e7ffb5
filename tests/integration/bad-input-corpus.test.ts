// A corpus of bad input against every API route and form action (issue 8): wrong types,
// empty, huge, NaN/Infinity, control characters, lone surrogates, binary bodies, wrong
// content types, out-of-range timestamps and other organisations' ids. Each case must get a
// 4xx problem+json naming the field (or the page's field error), and add no row anywhere.
// The rows are counted in two organisations of this test's own, so other test files running
// at the same time cannot disturb the counts.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import http from "node:http";
import { randomBytes, randomUUID } from "node:crypto";
import { closeDb } from "../../db/index";
import { ApiKey, AuditEntry, Circuit, Crossing, DeviceProfile, LightingOption, LoadProfile, Organisation, RuleBookChange, Study, User } from "../../db/models";
import { hashPassword } from "../../lib/passwords";
import { apiKeyHash } from "../../app/utils/api-keys.server";
import { baseUrl, client, DEMO_PASSWORD, signIn, type Client } from "../support/http";
import { testDb } from "../support/db";

const tag = randomUUID().slice(0, 8);
const device = { minCurrentA: 40, maxCurrentA: 2000, harvestW: "min(0.004*I^2, 15)", loadW: 4 };
const location = { lat: 35.2, lon: -97.4 };
const goodSamples = Array.from({ length: 12 }, (_, i) => [new Date(Date.UTC(2025, 0, 1) + i * 300_000).toISOString(), 100 + i] as const);
const GOOD_CSV = "Timestamp,Current\n" + goodSamples.map(([t, a]) => `${t},${a}`).join("\n") + "\n";
// The request that used to loop forever in the quality report (issue 8, item 1).
const LOOPING_CSV = "Timestamp,Current\n1000000000000000,100\n1000000000000600,100\n";

interface Tenant {
  org: Organisation;
  engineer: Client;
  admin: Client;
  circuitId: number;
  otherCircuitId: number;
  crossingId: number;
  deviceId: number;
  profileId: number;
  studyId: number;
  userId: number;
  keyId: number;
}

let a: Tenant; // this test's organisation: the callers
let b: Tenant; // another organisation: its ids must be out of reach
let orgIds: number[];

async function tenant(label: string): Promise<Tenant> {
  const org = await Organisation.create({ name: `Corpus ${label} ${tag}` });
  const passwordHash = await hashPassword(DEMO_PASSWORD);
  const emails = { engineer: `corpus-eng-${label}-${tag}@example.com`, admin: `corpus-admin-${label}-${tag}@example.com` };
  const eng = await User.create({ organisationId: org.id, email: emails.engineer, name: `Engineer ${label}`, role: "engineer", passwordHash });
  await User.create({ organisationId: org.id, email: emails.admin, name: `Admin ${label}`, role: "admin", passwordHash });
  const [engineer, admin] = await Promise.all([signIn(emails.engineer), signIn(emails.admin)]);
  const circuit = await (await engineer.json("/api/v1/circuits", "POST", { name: `Line ${label}`, voltageKv: 138, phases: 3 })).json();
  const other = await (await engineer.json("/api/v1/circuits", "POST", { name: `Other line ${label}`, voltageKv: 69, phases: 3 })).json();
  const crossing = await (
    await engineer.json(`/api/v1/circuits/${circuit.id}/crossings`, "POST", { name: "River", lat: 35.2, lon: -97.4, spanLength: { value: 300, unit: "m" }, kind: "river" })
  ).json();
  const dev = await DeviceProfile.create({ organisationId: org.id, name: `Marker ${label}`, spec: { ...device, standbyW: 0, storageWh: 0, chargeEfficiency: 0.9, selfDischargePctPerDay: 0, initialCharge: 1, lifeYears: 20 } });
  const upload = await engineer.get(`/api/v1/circuits/${circuit.id}/profiles?timestampColumn=Timestamp&currentColumn=Current&name=Week`, {
    method: "POST",
    body: GOOD_CSV,
    headers: { "content-type": "text/csv" },
  });
  expect(upload.status, await upload.clone().text()).toBe(201);
  const profile = (await upload.json()).profile;
  const study = await engineer.json("/api/v1/studies", "POST", { crossingId: crossing.id, profileId: profile.id, deviceProfileId: dev.id });
  expect(study.status, await study.clone().text()).toBe(201);
  const key = await ApiKey.create({ organisationId: org.id, name: "Historian", prefix: "dk_corpus", keyHash: apiKeyHash(`corpus-${label}-${tag}`), role: "engineer", createdBy: eng.id });
  return {
    org,
    engineer,
    admin,
    circuitId: circuit.id,
    otherCircuitId: other.id,
    crossingId: crossing.id,
    deviceId: dev.id,
    profileId: profile.id,
    studyId: (await study.json()).id,
    userId: eng.id,
    keyId: key.id,
  };
}

const MODELS = { Circuit, Crossing, LoadProfile, DeviceProfile, LightingOption, Study, ApiKey, User, AuditEntry, RuleBookChange } as const;

/** Rows per table in both organisations. */
async function rowCounts(): Promise<Record<string, number>> {
  const out: Record<string, number> = {};
  for (const [name, model] of Object.entries(MODELS)) {
    out[name] = await (model as typeof Circuit).count({ where: { organisationId: orgIds } });
  }
  return out;
}

/** The response is a 4xx problem+json whose errors name `field` (a path, or its start). */
async function expectProblem(res: Response, status: number | number[], field?: string) {
  const text = await res.text();
  const statuses = Array.isArray(status) ? status : [status];
  expect(statuses, `status ${res.status}: ${text.slice(0, 300)}`).toContain(res.status);
  expect(res.headers.get("content-type")).toContain("application/problem+json");
  const body = JSON.parse(text);
  expect(body.status).toBe(res.status);
  expect(typeof body.title).toBe("string");
  if (field !== undefined) {
    const paths: string[] = (body.errors ?? []).map((e: { path: string }) => e.path);
    expect(paths.some((p) => p === field || p.startsWith(`${field}.`)), `errors ${JSON.stringify(body.errors)} should name ${field}`).toBe(true);
  }
  return body;
}

/** A page action's answer: the status and the field's error beside it (id="<field>-error") or the given text. */
async function expectPageError(res: Response, status: number, fieldOrText: { field?: string; text?: string }) {
  const html = await res.text();
  expect(res.status, html.slice(0, 300)).toBe(status);
  if (fieldOrText.field) expect(html).toContain(`id="${fieldOrText.field}-error"`);
  if (fieldOrText.text) expect(html).toContain(fieldOrText.text);
}

/** Raw request for bodies fetch would not send as given (bad JSON text, binary, a type of our choosing). */
function raw(c: Client, path: string, method: string, body: BodyInit | undefined, contentType?: string) {
  return c.get(path, { method, body, headers: contentType ? { "content-type": contentType } : {} });
}

const csvUpload = (c: Client, circuitId: number, csv: BodyInit, query = "timestampColumn=Timestamp&currentColumn=Current", type = "text/csv") =>
  c.get(`/api/v1/circuits/${circuitId}/profiles?${query}`, { method: "POST", body: csv, headers: { "content-type": type } });

const form = (c: Client, path: string, fields: Record<string, string>) => c.post(path, fields);

beforeAll(async () => {
  testDb();
  a = await tenant("a");
  b = await tenant("b");
  orgIds = [a.org.id, b.org.id];
}, 120_000);
afterAll(async () => {
  await closeDb();
});

type Case = [name: string, run: () => Promise<void>];

/**
 * One test per case; each checks that no row was added in either organisation. The case
 * lists only read the tenants inside their closures, so they can be listed before beforeAll.
 */
function corpus(title: string, cases: () => Case[]) {
  describe(title, () => {
    for (const [name, run] of cases()) {
      it(name, async () => {
        const before = await rowCounts();
        await run();
        expect(await rowCounts(), "no row added").toEqual(before);
      });
    }
  });
}

const big = "x".repeat(100_000);
const surrogate = "zz-\ud800x";

corpus("JSON API: circuits", () => [
  ["lone surrogate in a name → 422 naming it", async () => expectProblem(await a.engineer.json("/api/v1/circuits", "POST", { name: surrogate, voltageKv: 138, phases: 3 }), 422, "name")],
  ["lone low surrogate in notes", async () => expectProblem(await a.engineer.json("/api/v1/circuits", "POST", { name: "N", voltageKv: 138, phases: 3, notes: "a\udc00" }), 422, "notes")],
  ["control character in a name", async () => expectProblem(await a.engineer.json("/api/v1/circuits", "POST", { name: "bell\u0007", voltageKv: 138, phases: 3 }), 400, "name")],
  ["empty name", async () => expectProblem(await a.engineer.json("/api/v1/circuits", "POST", { name: "", voltageKv: 138, phases: 3 }), 400, "name")],
  ["100,000-character name", async () => expectProblem(await a.engineer.json("/api/v1/circuits", "POST", { name: big, voltageKv: 138, phases: 3 }), 400, "name")],
  ["name as a number", async () => expectProblem(await a.engineer.json("/api/v1/circuits", "POST", { name: 42, voltageKv: 138, phases: 3 }), 400, "name")],
  ["voltage null is not 0", async () => expectProblem(await a.engineer.json("/api/v1/circuits", "POST", { name: "V", voltageKv: null, phases: 3 }), 400, "voltageKv")],
  ["voltage true is not 1", async () => expectProblem(await a.engineer.json("/api/v1/circuits", "POST", { name: "V", voltageKv: true, phases: 3 }), 400, "voltageKv")],
  ['voltage "" is not 0', async () => expectProblem(await a.engineer.json("/api/v1/circuits", "POST", { name: "V", voltageKv: "", phases: 3 }), 400, "voltageKv")],
  ["voltage 1e309 (Infinity after parsing)", async () => expectProblem(await raw(a.engineer, "/api/v1/circuits", "POST", '{"name":"V","voltageKv":1e309,"phases":3}', "application/json"), 400, "voltageKv")],
  ["NaN is not JSON", async () => expectProblem(await raw(a.engineer, "/api/v1/circuits", "POST", '{"name":"V","voltageKv":NaN,"phases":3}', "application/json"), 400, "body")],
  ["phases 2.5", async () => expectProblem(await a.engineer.json("/api/v1/circuits", "POST", { name: "P", voltageKv: 138, phases: 2.5 }), 400, "phases")],
  ["normal rating true is not 1", async () => expectProblem(await a.engineer.json("/api/v1/circuits", "POST", { name: "R", voltageKv: 138, phases: 3, normalRatingA: true }), 400, "normalRatingA")],
  ["unknown time zone", async () => expectProblem(await a.engineer.json("/api/v1/circuits", "POST", { name: "TZ", voltageKv: 138, phases: 3, timeZone: "Mars/Olympus" }), 400, "timeZone")],
  ["time zone as a number", async () => expectProblem(await a.engineer.json("/api/v1/circuits", "POST", { name: "TZ", voltageKv: 138, phases: 3, timeZone: 5 }), 400, "timeZone")],
  ["body is an array", async () => expectProblem(await a.engineer.json("/api/v1/circuits", "POST", []), 400)],
  ["body is null", async () => expectProblem(await raw(a.engineer, "/api/v1/circuits", "POST", "null", "application/json"), 400)],
  ["empty body", async () => expectProblem(await raw(a.engineer, "/api/v1/circuits", "POST", "", "application/json"), 400, "body")],
  ["binary body as JSON", async () => expectProblem(await raw(a.engineer, "/api/v1/circuits", "POST", new Uint8Array([0xff, 0xfe, 0x00, 0x81, 0x9c]), "application/json"), 400, "body")],
  ["text/plain body", async () => expectProblem(await raw(a.engineer, "/api/v1/circuits", "POST", JSON.stringify({ name: "T", voltageKv: 138, phases: 3 }), "text/plain"), 415, "content-type")],
  ["no content type", async () => expectProblem(await raw(a.engineer, "/api/v1/circuits", "POST", JSON.stringify({ name: "T", voltageKv: 138, phases: 3 })), 415)],
  ["PUT another organisation's circuit", async () => expectProblem(await a.engineer.json(`/api/v1/circuits/${b.circuitId}`, "PUT", { name: "Mine now", voltageKv: 138, phases: 3 }), 404)],
  ["DELETE another organisation's circuit", async () => expectProblem(await a.engineer.json(`/api/v1/circuits/${b.circuitId}`, "DELETE"), 404)],
  ["PUT a lone surrogate", async () => expectProblem(await a.engineer.json(`/api/v1/circuits/${a.circuitId}`, "PUT", { name: surrogate, voltageKv: 138, phases: 3 }), 422, "name")],
  ["PUT a name already taken", async () => expectProblem(await a.engineer.json(`/api/v1/circuits/${a.circuitId}`, "PUT", { name: "Other line a", voltageKv: 138, phases: 3 }), 409, "name")],
  ["circuit id abc", async () => expectProblem(await a.engineer.get("/api/v1/circuits/abc"), 404)],
  ["circuit id beyond 2^53", async () => expectProblem(await a.engineer.get("/api/v1/circuits/99999999999999999999"), 404)],
]);

corpus("JSON API: crossings", () => {
  const ok = { name: "Creek", lat: 35.2, lon: -97.4, spanLength: { value: 300, unit: "m" }, kind: "river" };
  const post = (body: unknown, circuitId = a.circuitId) => a.engineer.json(`/api/v1/circuits/${circuitId}/crossings`, "POST", body);
  return [
    ["lat null is not 0", async () => expectProblem(await post({ ...ok, lat: null }), 400, "lat")],
    ['lat "" is not 0', async () => expectProblem(await post({ ...ok, lat: "" }), 400, "lat")],
    ["lat true is not 1", async () => expectProblem(await post({ ...ok, lat: true }), 400, "lat")],
    ["lat 91", async () => expectProblem(await post({ ...ok, lat: 91 }), 400, "lat")],
    ["lon as text", async () => expectProblem(await post({ ...ok, lon: "west" }), 400, "lon")],
    ["span length missing", async () => expectProblem(await post({ ...ok, spanLength: undefined }), 400, "spanLength")],
    ["span length negative", async () => expectProblem(await post({ ...ok, spanLength: { value: -1, unit: "m" } }), 400, "spanLength.value")],
    ["span unit yards", async () => expectProblem(await post({ ...ok, spanLength: { value: 10, unit: "yd" } }), 400, "spanLength.unit")],
    ["unknown kind", async () => expectProblem(await post({ ...ok, kind: "volcano" }), 400, "kind")],
    ["lone surrogate in a name", async () => expectProblem(await post({ ...ok, name: surrogate }), 422, "name")],
    ["tab and newline in a name", async () => expectProblem(await post({ ...ok, name: "a\tb\nc" }), 400, "name")],
    ["another organisation's circuit", async () => expectProblem(await post(ok, b.circuitId), 404)],
    ["PUT another organisation's crossing", async () => expectProblem(await a.engineer.json(`/api/v1/crossings/${b.crossingId}`, "PUT", ok), 404)],
    ["PUT lat null", async () => expectProblem(await a.engineer.json(`/api/v1/crossings/${a.crossingId}`, "PUT", { ...ok, lat: null }), 400, "lat")],
    ["DELETE another organisation's crossing", async () => expectProblem(await a.engineer.json(`/api/v1/crossings/${b.crossingId}`, "DELETE"), 404)],
  ];
});

corpus("JSON API: load profile uploads", () => [
  ["the epoch-s CSV that used to loop forever → a fast 422 naming line 2", async () => {
    const started = Date.now();
    const body = await expectProblem(await csvUpload(a.engineer, a.circuitId, LOOPING_CSV, "timestampColumn=Timestamp&currentColumn=Current&timestampFormat=epoch-s"), 422, "body");
    expect(body.examples[0].line).toBe(2);
    expect(body.detail).toContain("1900–2200");
    expect(Date.now() - started).toBeLessThan(10_000); // the loop never returned at all
  }],
  ["the same CSV with the format detected", async () => void (await expectProblem(await csvUpload(a.engineer, a.circuitId, LOOPING_CSV), 422, "body"))],
  ["upload: 95 °C in the temperature column → 422 naming the line, no profile", async () => {
    const csv = "Timestamp,Current,Air\n" + goodSamples.map(([t, amps], i) => `${t},${amps},${i === 2 ? 95 : 20}`).join("\n") + "\n";
    const body = await expectProblem(await csvUpload(a.engineer, a.circuitId, csv, "timestampColumn=Timestamp&currentColumn=Current&temperatureColumn=Air"), 422, "body");
    expect(body.detail).toMatch(/^Line 4: 95 °C in temperature column "Air" is outside/);
  }],
  ["an epoch in year 14,645", async () => {
    const body = await expectProblem(await csvUpload(a.engineer, a.circuitId, "Timestamp,Current\n400000000000,100\n400000000600,100\n", "timestampColumn=Timestamp&currentColumn=Current&timestampFormat=epoch-s"), 422, "body");
    expect(body.detail).toContain("year 14645");
  }],
  ["a PDF in place of a profile's new data", async () => void (await expectProblem(await raw(a.engineer, `/api/v1/profiles/${a.profileId}?timestampColumn=Timestamp&currentColumn=Current`, "PUT", "%PDF-1.4\n1 0 obj\n", "text/csv"), 422))],
  ["replacement data naming a missing column", async () => void (await expectProblem(await raw(a.engineer, `/api/v1/profiles/${a.profileId}?timestampColumn=Timestamp&currentColumn=Nope`, "PUT", GOOD_CSV, "text/csv"), 422))],
  ["samples 9,000 years apart", async () => void (await expectProblem(await csvUpload(a.engineer, a.circuitId, "Timestamp,Current\n1000-01-01T00:00:00Z,1\n9999-12-31T00:00:00Z,2\n"), 422, "body"))],
  ["a history of 74 years", async () => {
    const body = await expectProblem(await csvUpload(a.engineer, a.circuitId, "Timestamp,Current\n1950-01-01T00:00:00Z,1\n2024-01-01T00:00:00Z,2\n"), 422, "body");
    expect(body.detail).toContain("50 years");
  }],
  ["year 0001 is year 1, out of range (not 1901)", async () => {
    const body = await expectProblem(await csvUpload(a.engineer, a.circuitId, "Timestamp,Current\n0001-01-01T00:00:00Z,1\n0001-01-01T00:05:00Z,2\n"), 422, "body");
    expect(body.detail).toContain("year 1;");
  }],
  ["an Excel serial in year 9999", async () => void (await expectProblem(await csvUpload(a.engineer, a.circuitId, "Timestamp,Current\n2958465,1\n2958465.5,2\n", "timestampColumn=Timestamp&currentColumn=Current&timestampFormat=serial-days"), 422, "body"))],
  // Random bytes are refused as not text (415), or as a known binary format when they happen to
  // begin with one's signature (422 "Not a CSV file": a clean-clone run drew an image header).
  ["binary body", async () => void (await expectProblem(await csvUpload(a.engineer, a.circuitId, new Uint8Array(randomBytes(4096))), [415, 422]))],
  ["JSON content type", async () => void (await expectProblem(await csvUpload(a.engineer, a.circuitId, GOOD_CSV, undefined, "application/json"), 415))],
  ["empty body", async () => void (await expectProblem(await csvUpload(a.engineer, a.circuitId, ""), 422, "body"))], // an empty file is named as such (issue 9)
  ["unknown time zone", async () => void (await expectProblem(await csvUpload(a.engineer, a.circuitId, GOOD_CSV, "timestampColumn=Timestamp&currentColumn=Current&timezone=Mars%2FOlympus"), 400, "timezone"))],
  ["no timestamp column", async () => void (await expectProblem(await csvUpload(a.engineer, a.circuitId, GOOD_CSV, "currentColumn=Current"), 400, "timestampColumn"))],
  ["a mapped column that is not there", async () => void (await expectProblem(await csvUpload(a.engineer, a.circuitId, GOOD_CSV, "timestampColumn=Timestamp&currentColumn=Amps"), 422, "body"))],
  ["control character in the profile name", async () => void (await expectProblem(await csvUpload(a.engineer, a.circuitId, GOOD_CSV, "timestampColumn=Timestamp&currentColumn=Current&name=a%07b"), 400, "name"))],
  ["plausibility cap as text", async () => void (await expectProblem(await csvUpload(a.engineer, a.circuitId, GOOD_CSV, "timestampColumn=Timestamp&currentColumn=Current&plausibilityCapA=lots"), 400, "plausibilityCapA"))],
  ["every current NaN", async () => void (await expectProblem(await csvUpload(a.engineer, a.circuitId, "Timestamp,Current\n2025-01-01T00:00:00Z,NaN\n2025-01-01T00:05:00Z,NaN\n"), 400))],
  ["another organisation's circuit", async () => void (await expectProblem(await csvUpload(a.engineer, b.circuitId, GOOD_CSV), 404))],
  ["DELETE another organisation's profile", async () => void (await expectProblem(await a.engineer.json(`/api/v1/profiles/${b.profileId}`, "DELETE"), 404))],
  ["replace another organisation's profile data", async () => void (await expectProblem(await raw(a.engineer, `/api/v1/profiles/${b.profileId}?timestampColumn=Timestamp&currentColumn=Current`, "PUT", GOOD_CSV, "text/csv"), 404))],
  ["GET another organisation's profiles", async () => void (await expectProblem(await a.engineer.get(`/api/v1/circuits/${b.circuitId}/profiles`), 404))],
]);

corpus("JSON API: feasibility", () => {
  const ok = { samples: goodSamples, location, device };
  const post = (body: unknown) => a.engineer.json("/api/v1/feasibility", "POST", body);
  return [
    ["samples 9,000 years apart → 422 naming the sample", async () => void (await expectProblem(await post({ ...ok, samples: [["1000-01-01T00:00:00Z", 1], ["9999-12-31T00:00:00Z", 2]] }), 422, "samples.0.0"))],
    ["the looping epoch-s CSV → 422 naming csv", async () => void (await expectProblem(await post({ ...ok, samples: undefined, csv: LOOPING_CSV, csvOptions: { timestampColumn: "Timestamp", currentColumn: "Current", timestampFormat: "epoch-s" } }), 422, "csv"))],
    ["a 60-year span of samples", async () => void (await expectProblem(await post({ ...ok, samples: [["1950-01-01T00:00:00Z", 1], ["2010-01-01T00:00:00Z", 2]] }), 422, "samples"))],
    ["current as text", async () => void (await expectProblem(await post({ ...ok, samples: [["2025-01-01T00:00:00Z", "100"], ["2025-01-01T00:05:00Z", 100]] }), 400, "samples.0.1"))],
    ["time null", async () => void (await expectProblem(await post({ ...ok, samples: [[null, 1], ["2025-01-01T00:05:00Z", 100]] }), 400, "samples.0.0"))],
    ["one sample only", async () => void (await expectProblem(await post({ ...ok, samples: [goodSamples[0]] }), 400, "samples"))],
    ["lat null is not 0", async () => void (await expectProblem(await post({ ...ok, location: { lat: null, lon: 0 } }), 400, "location.lat"))],
    ['lat "" is not 0', async () => void (await expectProblem(await post({ ...ok, location: { lat: "", lon: 0 } }), 400, "location.lat"))],
    ["lat true is not 1", async () => void (await expectProblem(await post({ ...ok, location: { lat: true, lon: 0 } }), 400, "location.lat"))],
    ["lone surrogate in the harvest expression", async () => void (await expectProblem(await post({ ...ok, device: { ...device, harvestW: "\ud800" } }), 422, "device.harvestW"))],
    ["device missing", async () => void (await expectProblem(await post({ ...ok, device: undefined }), 400, "device"))],
    ["period start in year 1000", async () => void (await expectProblem(await post({ ...ok, periodStart: "1000-01-01T00:00:00Z" }), 400, "periodStart"))],
    ["a period of 74 years", async () => void (await expectProblem(await post({ ...ok, periodStart: "1950-01-01T00:00:00Z", periodEnd: "2024-01-01T00:00:00Z" }), 422))],
    ["csv without csvOptions", async () => void (await expectProblem(await post({ ...ok, samples: undefined, csv: GOOD_CSV }), 400, "csvOptions"))],
    ["a temperature column with the word warm in it → 422 naming csv (and the line)", async () => {
      // The fourth data row (line 5) reads "warm".
      const csv = "Timestamp,Current,Air\n" + goodSamples.map(([t, amps], i) => `${t},${amps},${i === 3 ? "warm" : 5}`).join("\n") + "\n";
      const body = await expectProblem(await post({ ...ok, samples: undefined, csv, csvOptions: { timestampColumn: "Timestamp", currentColumn: "Current", temperatureColumn: "Air" } }), 422, "csv");
      expect(body.detail).toMatch(/^Line 5: "warm" in temperature column "Air" is not a number/);
    }],
    ["temperature unit K", async () => void (await expectProblem(await post({ ...ok, samples: undefined, csv: GOOD_CSV, csvOptions: { timestampColumn: "Timestamp", currentColumn: "Current", temperatureColumn: "Current2", temperatureUnit: "K" } }), 400, "csvOptions.temperatureUnit"))],
    ["malformed JSON", async () => void (await expectProblem(await raw(a.engineer, "/api/v1/feasibility", "POST", '{"samples": [', "application/json"), 400, "body"))],
    ["cross-site style text/plain", async () => void (await expectProblem(await raw(a.engineer, "/api/v1/feasibility", "POST", JSON.stringify(ok), "text/plain"), 415))],
  ];
});

corpus("JSON API: optimiser", () => {
  const candidate = { name: "Unit", device, unitCost: 100, lifeYears: 20 };
  const ok = { samples: goodSamples, location, candidates: [candidate], storage: { sizesWh: [0, 10], costPerWh: 1, lifeYears: 10 } };
  const post = (body: unknown) => a.engineer.json("/api/v1/optimise", "POST", body);
  const many = (n: number) => Array.from({ length: n }, (_, i) => ({ ...candidate, name: `Unit ${i}` }));
  return [
    ["no candidates", async () => void (await expectProblem(await post({ ...ok, candidates: [] }), 400, "candidates"))],
    ["unit cost as text", async () => void (await expectProblem(await post({ ...ok, candidates: [{ ...candidate, unitCost: "100" }] }), 400, "candidates.0.unitCost"))],
    ["the same name twice", async () => void (await expectProblem(await post({ ...ok, candidates: [candidate, candidate] }), 400, "candidates.1.name"))],
    ["turn-on current below the drop-out", async () => void (await expectProblem(await post({ ...ok, candidates: [{ ...candidate, device: { ...device, turnOnCurrentA: 10 } }] }), 400, "candidates.0.device.turnOnCurrentA"))],
    ["both a size list and a range", async () => void (await expectProblem(await post({ ...ok, storage: { ...ok.storage, range: { fromWh: 0, toWh: 10, stepWh: 1 } } }), 400, "storage.sizesWh"))],
    ["a range of a million sizes → 422 naming the limit", async () => void (await expectProblem(await post({ ...ok, storage: { range: { fromWh: 0, toWh: 1e6, stepWh: 1 }, costPerWh: 1, lifeYears: 10 } }), 422, "storage.range"))],
    ["51 candidates → 422 naming the limit", async () => void (await expectProblem(await post({ ...ok, candidates: many(51) }), 422, "candidates"))],
    ["40 candidates × 60 sizes → 422 naming the pair limit", async () => void (await expectProblem(await post({ ...ok, candidates: many(40), storage: { ...ok.storage, sizesWh: Array.from({ length: 60 }, (_, i) => i) } }), 422, "storage.sizesWh"))],
    ["an unreadable harvest expression → 422 naming the candidate", async () => void (await expectProblem(await post({ ...ok, candidates: [{ ...candidate, device: { ...device, harvestW: "I +" } }] }), 422, "candidates.0.device.harvestW"))],
    ["eleven monthly temperatures", async () => void (await expectProblem(await post({ ...ok, monthlyTemperatureC: Array(11).fill(0) }), 400, "monthlyTemperatureC"))],
    ["malformed JSON", async () => void (await expectProblem(await raw(a.engineer, "/api/v1/optimise", "POST", '{"candidates": [', "application/json"), 400, "body"))],
  ];
});

corpus("JSON API: studies, what-if, markers", () => {
  const study = (body: unknown) => a.engineer.json("/api/v1/studies", "POST", body);
  const mine = () => ({ crossingId: a.crossingId, profileId: a.profileId, deviceProfileId: a.deviceId });
  return [
    ["another organisation's crossing", async () => void (await expectProblem(await study({ ...mine(), crossingId: b.crossingId }), 404))],
    ["another organisation's device profile", async () => void (await expectProblem(await study({ ...mine(), deviceProfileId: b.deviceId }), 404))],
    ["another organisation's load profile", async () => void (await expectProblem(await study({ ...mine(), profileId: b.profileId }), 404))],
    ["crossing id abc", async () => void (await expectProblem(await study({ ...mine(), crossingId: "abc" }), 400, "crossingId"))],
    ["crossing id true is not 1", async () => void (await expectProblem(await study({ ...mine(), crossingId: true }), 400, "crossingId"))],
    ["period start in year 0001", async () => void (await expectProblem(await study({ ...mine(), params: { periodStart: "0001-01-01T00:00:00Z" } }), 400, "params.periodStart"))],
    ["what-if on another organisation's study", async () => void (await expectProblem(await a.engineer.json(`/api/v1/studies/${b.studyId}/what-if`, "POST", { storageWh: 10 }), 404))],
    ["what-if minimum current as text", async () => void (await expectProblem(await a.engineer.json(`/api/v1/studies/${a.studyId}/what-if`, "POST", { minCurrentA: "abc" }), 400, "minCurrentA"))],
    ["what-if negative storage", async () => void (await expectProblem(await a.engineer.json(`/api/v1/studies/${a.studyId}/what-if`, "POST", { storageWh: -1 }), 400, "storageWh"))],
    ["GET another organisation's study", async () => void (await expectProblem(await a.engineer.get(`/api/v1/studies/${b.studyId}`), 404))],
    ["marker layout: unknown rule set", async () => void (await expectProblem(await a.engineer.json("/api/v1/markers/layout", "POST", { ruleSet: "xyz", spanLength: { value: 300, unit: "m" } }), 400, "ruleSet"))],
    ["marker layout: span 1e309", async () => void (await expectProblem(await raw(a.engineer, "/api/v1/markers/layout", "POST", '{"ruleSet":"faa","spanLength":{"value":1e309,"unit":"ft"}}', "application/json"), 400, "spanLength.value"))],
    ["notice check: height null", async () => void (await expectProblem(await a.engineer.json("/api/v1/notice-check", "POST", { heightAgl: { value: null, unit: "ft" }, siteElevation: { value: 0, unit: "ft" } }), 422, "heightAgl.value"))],
    ["notice check: height as text", async () => void (await expectProblem(await a.engineer.json("/api/v1/notice-check", "POST", { heightAgl: { value: "200", unit: "ft" }, siteElevation: { value: 0, unit: "ft" } }), 422, "heightAgl.value"))],
    ["notice check: lone surrogate in a unit", async () => void (await expectProblem(await a.engineer.json("/api/v1/notice-check", "POST", { heightAgl: { value: 1, unit: "\ud800" }, siteElevation: { value: 0, unit: "ft" } }), 422, "heightAgl.unit"))],
    ["notice check: form-encoded body", async () => void (await expectProblem(await raw(a.engineer, "/api/v1/notice-check", "POST", "heightAgl=1", "application/x-www-form-urlencoded"), 415))],
    ["marker layout: span null", async () => void (await expectProblem(await a.engineer.json("/api/v1/markers/layout", "POST", { ruleSet: "faa", spanLength: { value: null, unit: "ft" } }), 400, "spanLength.value"))],
  ];
});

corpus("JSON API: devices, details, lighting options, lists (issue 12)", () => {
  const dev = { name: "Corpus sphere", minCurrentA: 30, maxCurrentA: 2000, harvestW: "min(0.005*I^2, 15)", loadW: 4 };
  const option = { name: "Solar", kind: "solar", unitPrice: 2400, installationMethod: "helicopter", mobilisation: 8000, ratePerHour: 3000, minutesPerUnit: 20, annualMaintenance: 150, serviceLifeYears: 10, horizonYears: 30, discountRatePercent: 7, feasibilityStatus: "go", feasibilityJustification: "Open sky." };
  return [
    ["device: unknown field → 422 naming it", async () => void (await expectProblem(await a.engineer.json("/api/v1/devices", "POST", { ...dev, colour: "red" }), 422, "colour"))],
    ["device: harvest expression that does not parse", async () => void (await expectProblem(await a.engineer.json("/api/v1/devices", "POST", { ...dev, harvestW: "I^^2" }), 400, "harvestW"))],
    ["device: minimum current as text", async () => void (await expectProblem(await a.engineer.json("/api/v1/devices", "POST", { ...dev, minCurrentA: "thirty" }), 400, "minCurrentA"))],
    ["device: PUT another organisation's", async () => void (await expectProblem(await a.engineer.json(`/api/v1/devices/${b.deviceId}`, "PUT", dev), 404))],
    ["device: GET another organisation's", async () => void (await expectProblem(await a.engineer.get(`/api/v1/devices/${b.deviceId}`), 404))],
    ["device: harvest table with falling currents names the row", async () => void (await expectProblem(await a.engineer.json("/api/v1/devices", "POST", { ...dev, harvestW: undefined, harvestPoints: [{ currentA: 50, watts: 1 }, { currentA: 40, watts: 2 }] }), 400, "harvestPoints.1.currentA"))],
    ["device: harvest table row's watts as text", async () => void (await expectProblem(await a.engineer.json("/api/v1/devices", "POST", { ...dev, harvestW: undefined, harvestPoints: [{ currentA: 10, watts: "1" }, { currentA: 40, watts: 2 }] }), 400, "harvestPoints.0.watts"))],
    ["device: harvest table of one row", async () => void (await expectProblem(await a.engineer.json("/api/v1/devices", "POST", { ...dev, harvestW: undefined, harvestPoints: [{ currentA: 10, watts: 1 }] }), 400, "harvestPoints"))],
    ["device: harvest expression and table together", async () => void (await expectProblem(await a.engineer.json("/api/v1/devices", "POST", { ...dev, harvestPoints: [{ currentA: 10, watts: 1 }, { currentA: 40, watts: 2 }] }), 400, "harvestPoints"))],
    ["device: unknown field inside a harvest row → 422", async () => void (await expectProblem(await a.engineer.json("/api/v1/devices", "POST", { ...dev, harvestW: undefined, harvestPoints: [{ currentA: 10, watts: 1, volts: 3 }, { currentA: 40, watts: 2 }] }), 422, "harvestPoints"))],
    ["device: harvest table of 201 rows", async () => void (await expectProblem(await a.engineer.json("/api/v1/devices", "POST", { ...dev, harvestW: undefined, harvestPoints: Array.from({ length: 201 }, (_, i) => ({ currentA: i + 1, watts: 1 })) }), 400, "harvestPoints"))],
    ["details: unknown rule set", async () => void (await expectProblem(await a.engineer.json(`/api/v1/crossings/${a.crossingId}/details`, "PUT", { ruleSet: "xyz" }), 400, "ruleSet"))],
    ["details: unknown nested-free field", async () => void (await expectProblem(await a.engineer.json(`/api/v1/crossings/${a.crossingId}/details`, "PUT", { ruleSet: "faa", towerColour: "red" }), 422, "towerColour"))],
    ["details: another organisation's crossing", async () => void (await expectProblem(await a.engineer.json(`/api/v1/crossings/${b.crossingId}/details`, "PUT", { ruleSet: "faa" }), 404))],
    ["option: negative unit price", async () => void (await expectProblem(await a.engineer.json(`/api/v1/crossings/${a.crossingId}/options`, "POST", { ...option, unitPrice: -1 }), 400, "unitPrice"))],
    ["option: without the justification a solar option needs", async () => void (await expectProblem(await a.engineer.json(`/api/v1/crossings/${a.crossingId}/options`, "POST", { ...option, feasibilityJustification: undefined }), 400, "feasibilityJustification"))],
    ["option: on another organisation's crossing", async () => void (await expectProblem(await a.engineer.json(`/api/v1/crossings/${b.crossingId}/options`, "POST", option), 404))],
    ["list: limit 501", async () => void (await expectProblem(await a.engineer.get("/api/v1/circuits?limit=501"), 400, "limit"))],
    ["list: limit 0", async () => void (await expectProblem(await a.engineer.get("/api/v1/devices?limit=0"), 400, "limit"))],
    ["list: a cursor this API did not give out", async () => void (await expectProblem(await a.engineer.get("/api/v1/circuits?cursor=not-a-cursor"), 400, "cursor"))],
    ["list: unknown query parameter → 422 naming it", async () => void (await expectProblem(await a.engineer.get("/api/v1/circuits?page=2"), 422, "page"))],
    ["studies list: another organisation's crossing", async () => void (await expectProblem(await a.engineer.get(`/api/v1/studies?crossingId=${b.crossingId}`), 404))],
    ["quality of another organisation's profile", async () => void (await expectProblem(await a.engineer.get(`/api/v1/profiles/${b.profileId}/quality`), 404))],
    ["comparison of another organisation's crossing", async () => void (await expectProblem(await a.engineer.get(`/api/v1/crossings/${b.crossingId}/comparison`), 404))],
    ["circuit: unknown top-level field → 422 naming it", async () => void (await expectProblem(await a.engineer.json("/api/v1/circuits", "POST", { name: "U", voltageKv: 138, phases: 3, colour: "blue" }), 422, "colour"))],
    ["study: unknown nested field → 422 naming it", async () => void (await expectProblem(await a.engineer.json("/api/v1/studies", "POST", { crossingId: a.crossingId, profileId: a.profileId, deviceProfileId: a.deviceId, params: { loadScale: 1, turbo: true } }), 422, "params.turbo"))],
  ];
});

corpus("form actions", () => {
  const eng = () => a.engineer;
  return [
    ["new circuit: empty name", async () => expectPageError(await form(eng(), "/circuits/new", { name: "", voltageKv: "138", phases: "3" }), 400, { field: "name" })],
    ["new circuit: empty voltage is an error, not 0", async () => expectPageError(await form(eng(), "/circuits/new", { name: "F", voltageKv: "", phases: "3" }), 400, { field: "voltageKv" })],
    ["new circuit: voltage abc", async () => expectPageError(await form(eng(), "/circuits/new", { name: "F", voltageKv: "abc", phases: "3" }), 400, { field: "voltageKv" })],
    ["new circuit: voltage Infinity", async () => expectPageError(await form(eng(), "/circuits/new", { name: "F", voltageKv: "Infinity", phases: "3" }), 400, { field: "voltageKv" })],
    ["new circuit: 100,000-character name", async () => expectPageError(await form(eng(), "/circuits/new", { name: big, voltageKv: "138", phases: "3" }), 400, { field: "name" })],
    ["new circuit: name already used", async () => expectPageError(await form(eng(), "/circuits/new", { name: "Line a", voltageKv: "138", phases: "3" }), 400, { field: "name" })],
    ["new circuit: NUL in a name", async () => expectPageError(await form(eng(), "/circuits/new", { name: "a\u0000b", voltageKv: "138", phases: "3" }), 400, { field: "name" })],
    ["new circuit: posted as application/octet-stream", async () =>
      expectPageError(await eng().post("/circuits/new", new URLSearchParams({ name: "O", voltageKv: "1", phases: "3" }), { headers: { "content-type": "application/octet-stream" } }), 400, { text: "application/x-www-form-urlencoded" })],
    ["new circuit: malformed multipart", async () =>
      expectPageError(await eng().post("/circuits/new", new URLSearchParams(), { body: "--x\r\nContent-Disposition: form-data; name=\"name\"\r\n\r\nunterminated", headers: { "content-type": "multipart/form-data; boundary=x" } } as RequestInit), 400, { text: "malformed" })],
    ["new circuit: binary body", async () =>
      expectPageError(await eng().post("/circuits/new", new URLSearchParams(), { body: new Uint8Array(randomBytes(512)), headers: { "content-type": "image/png" } } as RequestInit), 400, { text: "form" })],
    ["new circuit: 2 MB form", async () => expectPageError(await form(eng(), "/circuits/new", { name: "x".repeat(2 * 1024 * 1024), voltageKv: "1", phases: "3" }), 413, { text: "limit" })],
    ["edit circuit: empty voltage", async () => expectPageError(await form(eng(), `/circuits/${a.circuitId}/edit`, { name: "Line a", voltageKv: "", phases: "3" }), 400, { field: "voltageKv" })],
    ["edit another organisation's circuit", async () => expectPageError(await form(eng(), `/circuits/${b.circuitId}/edit`, { name: "Mine", voltageKv: "138", phases: "3" }), 404, {})],
    ["new crossing: empty lat and lon are errors, not 0, 0", async () => {
      const res = await form(eng(), `/circuits/${a.circuitId}/crossings/new`, { name: "Empty", lat: "", lon: "", spanLengthValue: "300", spanLengthUnit: "m", kind: "river" });
      const html = await res.text();
      expect(res.status).toBe(400);
      expect(html).toContain('id="lat-error"');
      expect(html).toContain('id="lon-error"');
    }],
    ["new crossing: lat abc", async () => expectPageError(await form(eng(), `/circuits/${a.circuitId}/crossings/new`, { name: "X", lat: "abc", lon: "1", spanLengthValue: "300", spanLengthUnit: "m", kind: "river" }), 400, { field: "lat" })],
    ["new crossing: empty span", async () => expectPageError(await form(eng(), `/circuits/${a.circuitId}/crossings/new`, { name: "X", lat: "1", lon: "1", spanLengthValue: "", spanLengthUnit: "m", kind: "river" }), 400, { field: "spanLengthValue" })],
    ["new crossing on another organisation's circuit", async () => expectPageError(await form(eng(), `/circuits/${b.circuitId}/crossings/new`, { name: "X", lat: "1", lon: "1", spanLengthValue: "300", spanLengthUnit: "m", kind: "river" }), 404, {})],
    ["edit crossing: empty lat", async () => expectPageError(await form(eng(), `/crossings/${a.crossingId}/edit`, { name: "River", lat: "", lon: "1", spanLengthValue: "300", spanLengthUnit: "m", kind: "river" }), 400, { field: "lat" })],
    ["edit another organisation's crossing", async () => expectPageError(await form(eng(), `/crossings/${b.crossingId}/edit`, { name: "X", lat: "1", lon: "1", spanLengthValue: "300", spanLengthUnit: "m", kind: "river" }), 404, {})],
    ["crossing details: support height abc", async () => expectPageError(await form(eng(), `/crossings/${a.crossingId}/details`, { supportHeightA: "abc", ruleSet: "faa", icaoColour: "red", costCurrency: "USD" }), 400, { field: "supportHeightA" })],
    ["new lighting option: units abc", async () =>
      expectPageError(await form(eng(), `/crossings/${a.crossingId}/options/new`, { name: "O", kind: "line-powered", units: "abc", unitPrice: "1", installationMethod: "helicopter", mobilisation: "0", ratePerHour: "0", minutesPerUnit: "0", annualMaintenance: "0", serviceLifeYears: "20", horizonYears: "20", discountRatePercent: "5" }), 400, { field: "units" })],
    ["new study: load profile abc", async () => expectPageError(await form(eng(), `/crossings/${a.crossingId}/studies/new`, { profileId: "abc", deviceProfileId: String(a.deviceId), scheduleKind: "always" }), 400, { field: "profileId" })],
    ["new study: period start in year 1000", async () =>
      expectPageError(await form(eng(), `/crossings/${a.crossingId}/studies/new`, { profileId: String(a.profileId), deviceProfileId: String(a.deviceId), scheduleKind: "always", periodStart: "1000-01-01" }), 400, { field: "paramsPeriodStart" })],
    ["new device: minimum current abc", async () => expectPageError(await form(eng(), "/devices/new", { name: "D", minCurrentA: "abc", maxCurrentA: "100", harvestW: "I", loadW: "1" }), 400, { field: "minCurrentA" })],
    ["new device: control character in the name", async () => expectPageError(await form(eng(), "/devices/new", { name: "D\u001b[31m", minCurrentA: "1", maxCurrentA: "100", harvestW: "I", loadW: "1" }), 400, { field: "name" })],
    ["new device: harvest table with a negative watt names the row", async () =>
      expectPageError(await form(eng(), "/devices/new", { name: "D", minCurrentA: "1", maxCurrentA: "100", loadW: "1", harvestMode: "table", "harvestPoints.0.currentA": "5", "harvestPoints.0.watts": "1", "harvestPoints.1.currentA": "9", "harvestPoints.1.watts": "-2" }), 400, { text: "Row 2: the power cannot be negative (-2 W)." })],
    ["new device: harvest table chosen with no rows", async () => expectPageError(await form(eng(), "/devices/new", { name: "D", minCurrentA: "1", maxCurrentA: "100", loadW: "1", harvestMode: "table" }), 400, { text: "at least two rows" })],
    ["study page what-if: storage abc", async () => expectPageError(await form(eng(), `/studies/${a.studyId}`, { intent: "what-if", storageWh: "abc" }), 400, { text: "Storage must be a number of watt-hours." })],
    ["study page what-if on another organisation's study", async () => expectPageError(await form(eng(), `/studies/${b.studyId}`, { intent: "what-if", storageWh: "5" }), 404, {})],
    ["edit another organisation's device", async () => expectPageError(await form(eng(), `/devices/${b.deviceId}`, { name: "D", minCurrentA: "1", maxCurrentA: "100", harvestW: "I", loadW: "1" }), 404, {})],
    ["people: deactivate userId=abc", async () => expectPageError(await form(a.admin, "/admin/users", { intent: "deactivate", userId: "abc" }), 400, { text: "Choose a person from the list." })],
    ["people: deactivate another organisation's user", async () => {
      const res = await form(a.admin, "/admin/users", { intent: "deactivate", userId: String(b.userId) });
      expect([400, 404]).toContain(res.status);
      expect((await User.findByPk(b.userId))!.active).toBe(true);
    }],
    ["people: invite a 100,000-character e-mail", async () => expectPageError(await form(a.admin, "/admin/users", { intent: "invite", email: `${big}@example.com`, name: "Long", role: "engineer" }), 400, { text: "254 characters" })],
    ["people: role change userId=1.5", async () => expectPageError(await form(a.admin, "/admin/users", { intent: "role", userId: "1.5", role: "manager" }), 400, {})],
    ["API keys: revoke keyId=abc", async () => expectPageError(await form(a.admin, "/admin/api-keys", { intent: "revoke", keyId: "abc" }), 400, { text: "Choose a key from the list." })],
    ["API keys: revoke another organisation's key", async () => {
      await expectPageError(await form(a.admin, "/admin/api-keys", { intent: "revoke", keyId: String(b.keyId) }), 404, {});
      expect((await ApiKey.findByPk(b.keyId))!.revokedAt).toBeNull();
    }],
    ["API keys: control character in the name", async () => expectPageError(await form(a.admin, "/admin/api-keys", { name: "k\u0008", role: "engineer" }), 400, { field: "name" })],
    ["rule book: confirm with a spacing of abc and a date of 2026-02-30", async () => {
      const res = await form(a.admin, "/rules/faa.spacing", { edition: "M", paragraph: "¶3.5.1.3", confirmedOn: "2026-02-30", value_value: "abc" });
      const html = await res.text();
      expect(res.status).toBe(400);
      expect(html).toContain('id="confirmedOn-error"');
      expect(html).toContain('id="value_value-error"');
    }],
    ["rule book: an ICAO diameter that would break the table's order", async () =>
      expectPageError(await form(a.admin, "/rules/icao.spacing-80cm", { edition: "9th", paragraph: "6.2.3", confirmedOn: "2026-12-01", value_diameter_value: "200", value_maxSpacing_value: "35" }), 400, { field: "value_diameter_value" })],
    ["crossing temperatures: eleven months", async () =>
      expectPageError(await form(eng(), `/crossings/${a.crossingId}/temperatures`, { monthlyC: "1 2 3 4 5 6 7 8 9 10 11" }), 400, { field: "monthlyC" })],
    ["crossing temperatures: 80 °C in July and text in March", async () =>
      expectPageError(await form(eng(), `/crossings/${a.crossingId}/temperatures`, { monthlyC: "1 2 warm 4 5 6 80 8 9 10 11 12", source: "x" }), 400, { field: "monthlyC", text: "July: Monthly temperatures must be between −60 and 60 °C." })],
    ["optimiser: a switched-out period that ends before it starts", async () =>
      expectPageError(
        await form(eng(), `/crossings/${a.crossingId}/optimise`, { [`use-${a.deviceId}`]: "on", [`unitCost-${a.deviceId}`]: "900", storageSizesWh: "0 10", storageCostPerWh: "1", storageLifeYears: "8", switchedOut: "Works, 2025-05-10, 2025-05-01" }),
        400,
        { text: "Switched-out line 1" },
      )],
    ["aviation record: a site elevation of abc", async () =>
      expectPageError(await form(eng(), `/crossings/${a.crossingId}/aviation`, { siteElevation: "abc" }), 400, { field: "siteElevation" })],
    ["policy: go availability abc", async () => expectPageError(await form(a.admin, "/admin/policy", { minKnownHours: "8000", minCoverage: "0.9", goAvailability: "abc", maxDarkStretchHours: "0.5", marginalAvailability: "0.99" }), 400, { field: "goAvailability" })],
    ["sign in with a 100,000-character e-mail", async () => {
      const c = client();
      const res = await c.post("/login", { email: `${big}@example.com`, password: "whatever-it-is" });
      expect(res.status).toBe(400);
      expect(await res.text()).toContain("254 characters");
      expect(c.cookie).toBe("");
    }],
    ["sign in posted as application/octet-stream", async () => {
      const res = await client().post("/login", new URLSearchParams({ email: "admin@example.com", password: DEMO_PASSWORD }), { headers: { "content-type": "application/octet-stream" } });
      expect(res.status).toBe(400);
    }],
    ["forgot password with a 100,000-character e-mail", async () => {
      const res = await client().post("/forgot-password", { email: `${big}@example.com` });
      expect(res.status).toBe(400);
    }],
  ];
});

describe("concurrent creates of one name", () => {
  it("ten parallel POSTs of the same circuit name: one 201, the rest 409 naming the field, one row", async () => {
    const before = await rowCounts();
    const name = `Race ${tag}`;
    const responses = await Promise.all(Array.from({ length: 10 }, () => a.engineer.json("/api/v1/circuits", "POST", { name, voltageKv: 138, phases: 3 })));
    const statuses = responses.map((r) => r.status).sort();
    expect(statuses.filter((s) => s === 201)).toHaveLength(1);
    for (const r of responses.filter((r) => r.status !== 201)) await expectProblem(r, 409, "name");
    const after = await rowCounts();
    expect(after.Circuit).toBe(before.Circuit + 1);
  });

  it("parallel form creates of the same device name: one saved, the rest a field error", async () => {
    const name = `Race device ${tag}`;
    const fields = { name, minCurrentA: "40", maxCurrentA: "2000", harvestW: "min(0.004*I^2, 15)", loadW: "4" };
    const responses = await Promise.all(Array.from({ length: 6 }, () => a.engineer.post("/devices/new", fields)));
    expect(responses.filter((r) => r.status === 302)).toHaveLength(1);
    for (const r of responses.filter((r) => r.status !== 302)) await expectPageError(r, 400, { field: "name" });
    expect(await DeviceProfile.count({ where: { organisationId: a.org.id, name } })).toBe(1);
  });
});

describe("body limits are enforced while the body streams", () => {
  /** Streams `total` bytes chunked to the feasibility route; resolves with the status and how much was sent before the answer. */
  function streamBody(total: number, headers: Record<string, string | number> = {}) {
    return new Promise<{ status: number; sent: number; body: string }>((resolve, reject) => {
      const url = new URL("/api/v1/feasibility", baseUrl());
      const req = http.request(url, { method: "POST", headers: { "content-type": "application/json", cookie: a.engineer.cookie, ...headers } });
      let sent = 0;
      let answered = false;
      const chunk = Buffer.alloc(1 << 20, 0x20);
      req.on("response", (res) => {
        answered = true;
        let body = "";
        res.on("data", (d) => (body += d));
        res.on("end", () => {
          resolve({ status: res.statusCode!, sent, body });
          req.destroy();
        });
      });
      req.on("error", (e) => (answered ? undefined : reject(e)));
      const pump = () => {
        while (!answered && sent < total) {
          sent += chunk.length;
          if (!req.write(chunk)) return void req.once("drain", pump);
        }
        if (!answered) req.end();
      };
      pump();
    });
  }

  it("a chunked body past the 64 MB limit is refused with 413 before it is all sent", async () => {
    const r = await streamBody(200 * 1024 * 1024);
    expect(r.status).toBe(413);
    expect(r.body).toContain("limit");
    expect(r.sent).toBeLessThan(200 * 1024 * 1024);
  });

  it("a declared Content-Length over the limit is refused at once", async () => {
    const r = await streamBody(1 << 20, { "content-length": 100 * 1024 * 1024 });
    expect(r.status).toBe(413);
    expect(r.sent).toBeLessThan(100 * 1024 * 1024);
  });
});
