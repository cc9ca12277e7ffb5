// A plain-fetch client of the Duskline API (no SDK): creates a circuit and a crossing, uploads a
// current history (CSV), runs a study of the crossing as a job, waits for it, and prints the
// verdict. Run:  DUSKLINE_URL=http://127.0.0.1:3000 DUSKLINE_KEY=<api key> npx tsx examples/duskline-client.ts [file.csv]
// The key needs circuits:write, profiles:write, devices:read, studies:write and studies:read
// (on a developer's machine the demo key dl_demo_local_only_key has every scope).
import { randomUUID } from "node:crypto";
import { readFile } from "node:fs/promises";

const base = (process.env.DUSKLINE_URL ?? "http://127.0.0.1:3000").replace(/\/$/, "") + "/api/v1";
const key = process.env.DUSKLINE_KEY ?? "dl_demo_local_only_key";
const csvPath = process.argv[2] ?? new URL("./sample-load.csv", import.meta.url).pathname;

/** One call; a problem+json answer becomes an error naming the fields. 429: waits Retry-After and tries again. */
async function api(path: string, init: { method?: string; json?: unknown; csv?: string } = {}): Promise<{ status: number; location: string | null; body: any }> {
  // One key per logical request, reused on a retry: a retried POST never creates a second record.
  const idempotencyKey = randomUUID();
  for (;;) {
    const headers: Record<string, string> = { authorization: `Bearer ${key}` };
    let body: string | undefined;
    if (init.json !== undefined) [headers["content-type"], body] = ["application/json", JSON.stringify(init.json)];
    if (init.csv !== undefined) [headers["content-type"], body] = ["text/csv", init.csv];
    if ((init.method ?? "GET") === "POST") headers["idempotency-key"] = idempotencyKey;
    const res = await fetch(base + path, { method: init.method ?? "GET", headers, body });
    if (res.status === 429) {
      await new Promise((r) => setTimeout(r, Number(res.headers.get("retry-after") ?? "1") * 1000));
      continue;
    }
    const text = await res.text();
    const parsed = text ? JSON.parse(text) : null;
    if (!res.ok) {
      const fields = (parsed?.errors ?? []).map((e: { path: string; message: string }) => `${e.path}: ${e.message}`).join("; ");
      throw new Error(`${init.method ?? "GET"} ${path} → ${res.status} ${parsed?.title ?? ""}${fields ? ` (${fields})` : parsed?.detail ? ` (${parsed.detail})` : ""}`);
    }
    return { status: res.status, location: res.headers.get("location"), body: parsed };
  }
}

const run = randomUUID().slice(0, 8);
const circuit = (await api("/circuits", { method: "POST", json: { name: `Client example line ${run}`, voltageKv: 115, phases: 3 } })).body;
const crossing = (await api(`/circuits/${circuit.id}/crossings`, { method: "POST", json: { name: "Example river", lat: 38.6, lon: -92.2, spanLength: { value: 900, unit: "ft" }, kind: "river" } })).body;
const upload = await api(`/circuits/${circuit.id}/profiles?timestampColumn=time&currentColumn=amps&name=Example%20export`, { method: "POST", csv: await readFile(csvPath, "utf8") });
console.log(`uploaded profile ${upload.body.profile.id}: ${upload.body.profile.samples} samples`);

const devices = (await api("/devices?limit=500")).body.devices.filter((d: { retired: boolean }) => !d.retired);
if (devices.length === 0) throw new Error("The organisation has no device profile; create one first (POST /devices).");

const queued = await api("/studies", { method: "POST", json: { crossingId: crossing.id, profileId: upload.body.profile.id, deviceProfileId: devices[0].id, async: true } });
if (queued.status !== 202 || !queued.location) throw new Error(`Expected a job (202), got ${queued.status}`);
console.log(`study queued as job ${queued.body.id}`);

let job = queued.body;
for (const started = Date.now(); job.state !== "done"; ) {
  if (job.state === "failed") throw new Error(`The job failed: ${job.error?.detail ?? "no detail"}`);
  if (Date.now() - started > 120_000) throw new Error("The job did not finish within 2 minutes.");
  await new Promise((r) => setTimeout(r, 500));
  job = (await api(queued.location.replace(/^\/api\/v1/, ""))).body;
}
const study = (await api(job.resultUrl.replace(/^\/api\/v1/, ""))).body;
console.log(`study ${study.id} of crossing ${crossing.id}: verdict ${study.verdict}`);
