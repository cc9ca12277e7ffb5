// Load benchmark (issue 8 "Load"): autocannon against the served production build on loopback.
//   1. 50 connections for 20 s on GET /api/v1/portfolio, the portfolio page and a study page;
//   2. the same reads while 4 one-year feasibility studies run in parallel, back to back;
//   3. 10 concurrent one-year uploads.
// First the server's CPU time per request of each read at one connection; then requests/s, p50,
// p99, errors per case and the peak of the server's total RSS (all its processes, worker threads
// included).
// Targets: 0 errors; reads p99 ≤ 250 ms, ≤ 400 ms while studies run; RSS ≤ 1 GB throughout.
// Run through `npm run bench:load` (scripts/bench/load.sh starts the bench instance and the
// server, then this script with BENCH_SERVER_PID and PORT set).
// Options: --duration S (default 20), --connections N (default 50), --studies N (default 4),
// --uploads N (default 10), --study-interval MIN (sampling of the feasibility CSV, default 10),
// --upload-interval MIN (default 1), --cpu-requests N (default 200), --cpu-only (stop after the
// CPU figures, e.g. for a profile: BENCH_NODE_FLAGS="--cpu-prof --cpu-prof-dir=.data/prof"),
// --idle-only (stop after the idle reads: no background studies, no uploads).
import { request } from "node:http";
import { readdirSync, readFileSync } from "node:fs";
import { availableParallelism, loadavg } from "node:os";
import { parseArgs } from "node:util";
import autocannon from "autocannon";
import { generateLoadCsv } from "../../lib/demo/load-generator";

const { values: args } = parseArgs({
  options: {
    duration: { type: "string", default: "20" },
    connections: { type: "string", default: "50" },
    studies: { type: "string", default: "4" },
    uploads: { type: "string", default: "10" },
    "study-interval": { type: "string", default: "10" },
    "upload-interval": { type: "string", default: "1" },
    "cpu-requests": { type: "string", default: "200" },
    "cpu-only": { type: "boolean", default: false },
    "idle-only": { type: "boolean", default: false },
  },
});
const DURATION = Number(args.duration);
const CONNECTIONS = Number(args.connections);
const STUDIES = Number(args.studies);
const UPLOADS = Number(args.uploads);
const CPU_REQUESTS = Number(args["cpu-requests"]);
const PORT = Number(process.env.PORT ?? 3392);
const BASE = `http://127.0.0.1:${PORT}`;
const SERVER_PID = Number(process.env.BENCH_SERVER_PID);
if (!SERVER_PID) throw new Error("Run through `npm run bench:load` (BENCH_SERVER_PID is not set).");
const TARGETS = { p99Ms: 250, p99UnderStudiesMs: 400, rssMb: 1024 };

// --- the server processes -------------------------------------------------------------------
// The server may be one process or a cluster (one primary, a worker process per core): every
// figure sums the whole process tree under BENCH_SERVER_PID.

function processTree(root: number): number[] {
  const pids = [root];
  for (let i = 0; i < pids.length; i++) {
    for (const task of safeReaddir(`/proc/${pids[i]}/task`)) {
      const children = safeRead(`/proc/${pids[i]}/task/${task}/children`).trim();
      if (children) pids.push(...children.split(/\s+/).map(Number));
    }
  }
  return pids;
}

function safeRead(file: string): string {
  try {
    return readFileSync(file, "utf8");
  } catch {
    return "";
  }
}

function safeReaddir(dir: string): string[] {
  try {
    return readdirSync(dir);
  } catch {
    return [];
  }
}

/** Resident memory of the whole tree now, in MB (worker threads live inside their process). */
function treeRssMb(): number {
  let kb = 0;
  for (const pid of processTree(SERVER_PID)) kb += Number(safeRead(`/proc/${pid}/status`).match(/^VmRSS:\s+(\d+) kB/m)?.[1] ?? 0);
  return kb / 1024;
}

/** CPU time (user + system) used so far by the tree's live processes, in ms. */
function treeCpuMs(): number {
  const tick = 1000 / 100; // USER_HZ is 100 on Linux
  let ticks = 0;
  for (const pid of processTree(SERVER_PID)) {
    const fields = safeRead(`/proc/${pid}/stat`).split(") ")[1]?.split(" ");
    if (fields) ticks += Number(fields[11]) + Number(fields[12]);
  }
  return ticks * tick;
}

/** Samples the tree's RSS every 250 ms and keeps the highest sum (the peak of the total). */
function rssSampler() {
  let peak = treeRssMb();
  const timer = setInterval(() => (peak = Math.max(peak, treeRssMb())), 250);
  return {
    peak: () => peak,
    stop: () => clearInterval(timer),
  };
}

// --- the app's API --------------------------------------------------------------------------

function send(method: string, path: string, headers: Record<string, string>, body = ""): Promise<{ status: number; headers: Record<string, string | string[] | undefined>; text: string }> {
  return new Promise((resolve, reject) => {
    const req = request(`${BASE}${path}`, { method, agent: false, headers: { ...headers, "content-length": String(Buffer.byteLength(body)) } }, (res) => {
      const chunks: Buffer[] = [];
      res.on("data", (c: Buffer) => chunks.push(c));
      res.on("end", () => resolve({ status: res.statusCode ?? 0, headers: res.headers, text: Buffer.concat(chunks).toString("utf8") }));
      res.on("error", reject);
    });
    req.on("error", reject);
    req.end(body);
  });
}

async function signIn(): Promise<string> {
  const form = new URLSearchParams({ email: "engineer@example.com", password: "duskline-demo" }).toString();
  const res = await send("POST", "/login", { "content-type": "application/x-www-form-urlencoded" }, form);
  const cookie = [res.headers["set-cookie"] ?? []].flat()[0]?.split(";")[0];
  if (res.status !== 302 || !cookie) throw new Error(`sign-in answered ${res.status}`);
  return cookie;
}

const json = (cookie: string) => ({ cookie, "content-type": "application/json", accept: "application/json" });

/** A study page to read: the demo seed's first studied crossing. */
async function aStudyId(cookie: string): Promise<number> {
  const res = await send("GET", "/api/v1/portfolio", json(cookie));
  if (res.status !== 200) throw new Error(`portfolio answered ${res.status}`);
  const row = (JSON.parse(res.text).rows as { studyId: number | null }[]).find((r) => r.studyId);
  if (!row) throw new Error("The bench database has no study; the demo seed should have made some.");
  return row.studyId!;
}

// --- cases ----------------------------------------------------------------------------------

interface ReadFigures {
  name: string;
  requestsPerSecond: number;
  p50Ms: number;
  p99Ms: number;
  errors: number;
  requests: number;
}

/**
 * Server CPU per request (all processes, ms): `amount` requests one after another on one
 * connection, with the tree's CPU time read before and after. Much less sensitive than latency
 * to what else the machine is doing, so it compares runs on a busy machine.
 */
async function cpuPerRequest(path: string, cookie: string, amount: number): Promise<{ cpuMs: number; latencyMs: number }> {
  const before = treeCpuMs();
  const r = await autocannon({ url: BASE + path, connections: 1, amount, headers: { cookie, accept: path.startsWith("/api/") ? "application/json" : "text/html" } });
  if (r.non2xx || r.errors) throw new Error(`${path}: ${r.non2xx + r.errors} failed requests while measuring CPU`);
  return { cpuMs: (treeCpuMs() - before) / amount, latencyMs: r.latency.p50 };
}

async function readLoad(name: string, path: string, cookie: string): Promise<ReadFigures> {
  const r = await autocannon({ url: BASE + path, connections: CONNECTIONS, duration: DURATION, headers: { cookie, accept: path.startsWith("/api/") ? "application/json" : "text/html" } });
  return {
    name,
    requestsPerSecond: Math.round(r.requests.average),
    p50Ms: r.latency.p50,
    p99Ms: r.latency.p99,
    // Socket errors, timeouts and any answer other than 2xx.
    errors: r.errors + r.timeouts + r.non2xx,
    requests: r.requests.total,
  };
}

function studyBody(intervalMinutes: number): string {
  const csv = generateLoadCsv({ seed: 5, start: "2024-01-01T00:00:00Z", days: 365, intervalMinutes, phases: 1, baseA: 120, dailySwingA: 50, seasonalSwingA: 30, weekendDropA: 10 });
  return JSON.stringify({
    location: { lat: 44.2, lon: -97.1 },
    device: { minCurrentA: 60, maxCurrentA: 2000, harvestW: "min(0.004 * I^2, 15)", loadW: 4, standbyW: 0.1, storageWh: 40, chargeEfficiency: 0.9 },
    csv,
    csvOptions: { timestampColumn: "Timestamp", currentColumn: "I [A]", qualityColumn: "Quality" },
  });
}

/** `count` clients each running feasibility studies back to back until `stop` is set. */
function backgroundStudies(count: number, cookie: string, body: string) {
  let stop = false;
  const done = { studies: 0, errors: 0, ms: [] as number[] };
  const loops = Array.from({ length: count }, async () => {
    while (!stop) {
      const t0 = performance.now();
      const res = await send("POST", "/api/v1/feasibility", json(cookie), body).catch(() => ({ status: 0, text: "" }));
      if (res.status === 200) {
        done.studies++;
        done.ms.push(performance.now() - t0);
      } else {
        done.errors++;
        if (done.errors === 1) console.error(`feasibility answered ${res.status}: ${res.text.slice(0, 300)}`);
      }
    }
  });
  return {
    done,
    async stop() {
      stop = true;
      await Promise.all(loops);
    },
  };
}

async function concurrentUploads(cookie: string, count: number, intervalMinutes: number) {
  const res = await send("POST", "/api/v1/circuits", json(cookie), JSON.stringify({ name: `Load bench ${Date.now()}`, voltageKv: 138, phases: 3 }));
  if (res.status !== 201) throw new Error(`creating a circuit answered ${res.status}: ${res.text}`);
  const circuitId = JSON.parse(res.text).id;
  const csv = generateLoadCsv({ seed: 9, start: "2024-01-01T00:00:00Z", days: 365, intervalMinutes, phases: 3, baseA: 300, dailySwingA: 90, seasonalSwingA: 60 });
  const mapping = new URLSearchParams({ timestampColumn: "Timestamp", phaseA: "IA [A]", phaseB: "IB [A]", phaseC: "IC [A]", qualityColumn: "Quality" });
  const started = performance.now();
  const runs = await Promise.all(
    Array.from({ length: count }, async () => {
      const t0 = performance.now();
      const r = await send("POST", `/api/v1/circuits/${circuitId}/profiles?${mapping}`, { cookie, "content-type": "text/csv" }, csv).catch((e: Error) => ({ status: 0, text: e.message }));
      if (r.status !== 201) console.error(`upload answered ${r.status}: ${r.text.slice(0, 300)}`);
      return { ok: r.status === 201, ms: performance.now() - t0 };
    }),
  );
  const ms = runs.map((r) => r.ms).sort((a, b) => a - b);
  return { bytes: Buffer.byteLength(csv), errors: runs.filter((r) => !r.ok).length, medianMs: ms[ms.length >> 1], maxMs: ms.at(-1)!, wallMs: performance.now() - started };
}

// --- run ------------------------------------------------------------------------------------

const fmt = (n: number) => n.toLocaleString("en-US", { maximumFractionDigits: 0 });

async function main() {
  const cookie = await signIn();
  const studyId = await aStudyId(cookie);
  const reads: [string, string][] = [
    ["GET /api/v1/portfolio", "/api/v1/portfolio"],
    ["portfolio page", "/portfolio"],
    [`study page (/studies/${studyId})`, `/studies/${studyId}`],
  ];
  // Warm-up: the first engine request starts the worker threads; the first page render warms the JIT.
  const body = studyBody(Number(args["study-interval"]));
  for (const [, path] of reads) await send("GET", path, { cookie });
  await send("POST", "/api/v1/feasibility", json(cookie), body);

  const rss = rssSampler();
  console.log(`CPU per request, 1 connection, ${CPU_REQUESTS} requests each (server processes: ${processTree(SERVER_PID).length}):`);
  for (const [name, path] of reads) {
    const { cpuMs, latencyMs } = await cpuPerRequest(path, cookie, CPU_REQUESTS);
    console.log(`  ${name}: ${cpuMs.toFixed(1)} ms CPU, p50 ${latencyMs} ms`);
  }
  if (args["cpu-only"]) return rss.stop();
  console.log(`\nLoad bench: ${CONNECTIONS} connections × ${DURATION} s per read; ${availableParallelism()} cores, load average ${loadavg()[0].toFixed(1)}\n`);
  const rows: (ReadFigures & { underStudies: boolean })[] = [];
  for (const [name, path] of reads) rows.push({ ...(await readLoad(name, path, cookie)), underStudies: false });

  // --idle-only: the same table and RSS line, without the studies and the uploads.
  const background = args["idle-only"] ? null : backgroundStudies(STUDIES, cookie, body);
  if (background) {
    for (const [name, path] of reads) rows.push({ ...(await readLoad(name, path, cookie)), underStudies: true });
    await background.stop();
  }
  const uploads = background ? await concurrentUploads(cookie, UPLOADS, Number(args["upload-interval"])) : null;
  rss.stop();
  const peakMb = rss.peak();

  console.log("| reads | while | req/s | p50 ms | p99 ms | errors | target p99 |");
  console.log("|---|---|---:|---:|---:|---:|---|");
  for (const r of rows) {
    const target = r.underStudies ? TARGETS.p99UnderStudiesMs : TARGETS.p99Ms;
    // No answer at all within the run is a miss too (autocannon does not count those as errors).
    const verdict = r.requests > 0 && r.p99Ms <= target && r.errors === 0 ? "met" : "MISSED";
    console.log(`| ${r.name} | ${r.underStudies ? `${STUDIES} studies running` : "idle"} | ${fmt(r.requestsPerSecond)} | ${r.p50Ms} | ${r.p99Ms} | ${r.errors} | ≤ ${target} ms: ${verdict} |`);
  }
  if (background && uploads) {
    const studyMs = [...background.done.ms].sort((a, b) => a - b);
    console.log(
      `\nBackground feasibility studies (one year at ${args["study-interval"]}-minute sampling, ${(Buffer.byteLength(body) / 1e6).toFixed(1)} MB JSON): ${background.done.studies} done, ${background.done.errors} errors, median ${fmt(studyMs[studyMs.length >> 1] ?? NaN)} ms each.`,
    );
    console.log(
      `${UPLOADS} concurrent uploads (one year, 3 phases, ${args["upload-interval"]}-minute, ${(uploads.bytes / 1e6).toFixed(1)} MB each): ${uploads.errors} errors, median ${fmt(uploads.medianMs)} ms, slowest ${fmt(uploads.maxMs)} ms, all done in ${fmt(uploads.wallMs)} ms.`,
    );
  }
  console.log(`Server peak RSS (sum over the server's processes, sampled every 250 ms, its engine processes and threads included): ${fmt(peakMb)} MB (target ≤ ${TARGETS.rssMb} MB: ${peakMb <= TARGETS.rssMb ? "met" : "MISSED"}).`);
}

await main();
