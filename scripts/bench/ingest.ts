// Upload benchmark (issue 3): raw CSV POSTed to the served app, upload-to-stored.
//   (a) 1 year of 1-minute, 3-phase history (525,600 rows, ~22 MB)
//   (b) 10 years of 1-minute, 1-phase history (~5.26 M rows, ~160 MB)
// Each goes raw through POST /api/v1/circuits/{id}/profiles; medians of the wall time and
// of the server's CPU time per upload, the server's peak RSS (VmHWM) per case, papaparse's
// parse-only time on the same 1-year text, and pandas as a peer when Debian's package is there.
// Targets: (a) ≤ 1.5 s, (b) ≤ 15 s, peak RSS ≤ 500 MB, (a) ≤ 1.5 × parse-only.
// Run through `npm run bench:ingest` (scripts/bench/ingest.sh starts the bench instance and
// the server, then this script with BENCH_SERVER_PID and PORT set).
// Options: --runs-year N (default 5), --runs-decade N (default 2).
import { execFileSync, spawnSync } from "node:child_process";
import { request } from "node:http";
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { availableParallelism, loadavg, tmpdir } from "node:os";
import { join } from "node:path";
import { parseArgs } from "node:util";
import Papa from "papaparse";
import { generateLoadCsv, type LoadProfileSpec } from "../../lib/demo/load-generator";

const { values: args } = parseArgs({
  options: { "runs-year": { type: "string", default: "5" }, "runs-decade": { type: "string", default: "2" } },
});
const RUNS_YEAR = Number(args["runs-year"]);
const RUNS_DECADE = Number(args["runs-decade"]);
const PORT = Number(process.env.PORT ?? 3392);
const BASE = `http://127.0.0.1:${PORT}`;
const SERVER_PID = Number(process.env.BENCH_SERVER_PID);
if (!SERVER_PID) throw new Error("Run through `npm run bench:ingest` (BENCH_SERVER_PID is not set).");
const CLOCK_TICKS = Number(execFileSync("getconf", ["CLK_TCK"]).toString().trim()) || 100;

const TARGETS = { yearMs: 1500, decadeMs: 15000, rssMb: 500, ratio: 1.5 };

const median = (values: number[]) => {
  const s = [...values].sort((a, b) => a - b);
  return s.length % 2 ? s[s.length >> 1] : (s[s.length / 2 - 1] + s[s.length / 2]) / 2;
};

// --- the server process, from /proc ---------------------------------------------------

function readProc(file: string): string {
  try {
    return readFileSync(`/proc/${SERVER_PID}/${file}`, "utf8");
  } catch {
    throw new Error(`The server (pid ${SERVER_PID}) is gone: stopped from outside (npm stop?) or crashed; see .data/serve-bench.log.`);
  }
}

/** User + system CPU of the server so far, ms. */
function serverCpuMs(): number {
  const stat = readProc("stat");
  const fields = stat.slice(stat.lastIndexOf(")") + 2).split(" ");
  return ((Number(fields[11]) + Number(fields[12])) * 1000) / CLOCK_TICKS; // utime, stime
}

function serverStatusKb(key: "VmHWM" | "VmRSS"): number {
  const m = readProc("status").match(new RegExp(`^${key}:\\s+(\\d+) kB`, "m"));
  if (!m) throw new Error(`No ${key} in /proc/${SERVER_PID}/status`);
  return Number(m[1]);
}

/** Resets the peak RSS to the current RSS (Linux ≥ 4.0), so each case reports its own peak. */
function resetPeakRss(): boolean {
  try {
    writeFileSync(`/proc/${SERVER_PID}/clear_refs`, "5");
    return true;
  } catch {
    return false;
  }
}

// --- the app's API ----------------------------------------------------------------------

/**
 * One request on a fresh connection. Not fetch: its pooled keep-alive socket can be closed
 * by the server (5 s idle timeout) while this process is busy generating data, and the next
 * body write then fails with EPIPE.
 */
function send(method: string, path: string, headers: Record<string, string>, body: Buffer | string): Promise<{ status: number; headers: Record<string, string | string[] | undefined>; text: string }> {
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

async function createCircuit(cookie: string, name: string, phases: number): Promise<number> {
  const body = JSON.stringify({ name, voltageKv: 138, phases });
  const res = await send("POST", "/api/v1/circuits", { cookie, "content-type": "application/json", accept: "application/json" }, body);
  if (res.status !== 201) throw new Error(`creating a circuit answered ${res.status}: ${res.text}`);
  return JSON.parse(res.text).id;
}

interface UploadRun {
  wallMs: number;
  serverCpuMs: number;
  samples: number;
}

async function upload(cookie: string, circuitId: number, body: Buffer, mapping: Record<string, string>): Promise<UploadRun> {
  const cpu0 = serverCpuMs();
  const t0 = performance.now();
  const res = await send("POST", `/api/v1/circuits/${circuitId}/profiles?${new URLSearchParams(mapping)}`, { cookie, "content-type": "text/csv" }, body);
  const wallMs = performance.now() - t0;
  if (res.status !== 201) throw new Error(`upload answered ${res.status}: ${res.text.slice(0, 500)}`);
  const answer = JSON.parse(res.text);
  return { wallMs, serverCpuMs: serverCpuMs() - cpu0, samples: answer.profile.samples };
}

// --- data ---------------------------------------------------------------------------------

const SHAPE = { baseA: 300, dailySwingA: 90, seasonalSwingA: 60, weekendDropA: 20 };

function yearCsv(): string {
  return generateLoadCsv({
    seed: 1,
    start: "2024-01-01T00:00:00Z",
    days: 365,
    intervalMinutes: 1,
    phases: 3,
    ...SHAPE,
    metadata: ["Benchmark history (invented)", "Point: BENCH-1 line current, UTC"],
  });
}

/** Ten years of 1-phase minutes, generated a year at a time into one buffer (no 5 M-line array). */
function decadeCsv(): Buffer {
  const parts: Buffer[] = [];
  for (let year = 2015; year < 2025; year++) {
    const days = (Date.UTC(year + 1, 0, 1) - Date.UTC(year, 0, 1)) / 86_400_000;
    const spec: LoadProfileSpec = {
      seed: year,
      start: `${year}-01-01T00:00:00Z`,
      days,
      intervalMinutes: 1,
      phases: 1,
      ...SHAPE,
      metadata: year === 2015 ? ["Benchmark history (invented)", "Point: BENCH-10 line current, UTC"] : [],
    };
    const text = generateLoadCsv(spec);
    parts.push(Buffer.from(year === 2015 ? text : text.slice(text.indexOf("\n") + 1))); // header once
  }
  return Buffer.concat(parts);
}

const YEAR_MAPPING = { timestampColumn: "Timestamp", phaseA: "IA [A]", phaseB: "IB [A]", phaseC: "IC [A]", qualityColumn: "Quality", timezone: "UTC" };
const DECADE_MAPPING = { timestampColumn: "Timestamp", currentColumn: "I [A]", qualityColumn: "Quality", timezone: "UTC" };

// --- the pandas peer ----------------------------------------------------------------------

const PANDAS_SCRIPT = `
import sys, time, json, statistics
import pandas as pd
path, runs = sys.argv[1], int(sys.argv[2])
walls, cpus, below = [], [], 0
for _ in range(runs):
    w0, c0 = time.perf_counter(), time.process_time()
    df = pd.read_csv(path, comment="#", parse_dates=["Timestamp"])
    below = int((df[["IA [A]", "IB [A]", "IC [A]"]].min(axis=1) < 40.0).sum())
    walls.append((time.perf_counter() - w0) * 1000)
    cpus.append((time.process_time() - c0) * 1000)
print(json.dumps({"wall": statistics.median(walls), "cpu": statistics.median(cpus), "rows": len(df), "below": below, "version": pd.__version__}))
`;

// Debian's python3-pandas belongs to Debian's own interpreter, which another python3 earlier on
// PATH (e.g. pyenv's) does not see.
const PYTHON = existsSync("/usr/bin/python3") ? "/usr/bin/python3" : "python3";

function pandasPeer(csv: string, runs: number): { wallMs: number; cpuMs: number; note: string } | { skipped: string } {
  const probe = spawnSync(PYTHON, ["-c", "import pandas"], { encoding: "utf8" });
  if (probe.error) return { skipped: "python3 is not installed" };
  if (probe.status !== 0) return { skipped: "Debian's python3-pandas is not installed (python3 -c 'import pandas' fails); not installed by the benchmark" };
  const dir = mkdtempSync(join(tmpdir(), "duskline-bench-"));
  try {
    const path = join(dir, "year.csv");
    writeFileSync(path, csv);
    const run = spawnSync(PYTHON, ["-c", PANDAS_SCRIPT, path, String(runs)], { encoding: "utf8" });
    if (run.status !== 0) return { skipped: `pandas run failed: ${run.stderr.trim().split("\n").pop()}` };
    const r = JSON.parse(run.stdout);
    return { wallMs: r.wall, cpuMs: r.cpu, note: `pandas ${r.version}, ${r.rows} rows, ${r.below} below 40 A` };
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

// --- main ---------------------------------------------------------------------------------

const mb = (bytes: number) => `${(bytes / 1e6).toFixed(1)} MB`;
const ms = (v: number) => `${Math.round(v).toLocaleString("en-US")} ms`;
const verdict = (ok: boolean) => (ok ? "meets" : "MISSES");

async function main() {
  const load = () => loadavg().map((l) => l.toFixed(1)).join(" ");
  console.log(`server pid ${SERVER_PID} on ${BASE}; ${RUNS_YEAR} runs of (a), ${RUNS_DECADE} of (b); ${availableParallelism()} cores, load average ${load()}`);
  // Both files first: the uploads then run back to back.
  let t0 = performance.now();
  const yearText = yearCsv();
  const yearBody = Buffer.from(yearText);
  console.log(`generated (a): ${(yearText.split("\n").length - 4).toLocaleString("en-US")} rows, ${mb(yearBody.length)} in ${ms(performance.now() - t0)}`);
  t0 = performance.now();
  // --runs-decade 0 (a quick ratio run) skips generating the 160 MB file.
  const decadeBody = RUNS_DECADE > 0 ? decadeCsv() : Buffer.alloc(0);
  if (RUNS_DECADE > 0) console.log(`generated (b): ${mb(decadeBody.length)} in ${ms(performance.now() - t0)}`);

  const cookie = await signIn();
  const suffix = new Date().toISOString().slice(0, 19);
  const yearCircuit = await createCircuit(cookie, `Bench 3-phase ${suffix}`, 3);
  const decadeCircuit = await createCircuit(cookie, `Bench 1-phase ${suffix}`, 1);

  // (a) alternating with papaparse parse-only, so a busy machine slows both alike.
  const peakResetWorks = resetPeakRss();
  const yearRuns: UploadRun[] = [];
  const parseRuns: { wallMs: number; cpuMs: number }[] = [];
  for (let i = 0; i < RUNS_YEAR; i++) {
    yearRuns.push(await upload(cookie, yearCircuit, yearBody, { ...YEAR_MAPPING, name: `year run ${i + 1}` }));
    const cpu0 = process.cpuUsage();
    const p0 = performance.now();
    Papa.parse(yearText, { delimiter: "," });
    const wallMs = performance.now() - p0;
    const cpu = process.cpuUsage(cpu0);
    parseRuns.push({ wallMs, cpuMs: (cpu.user + cpu.system) / 1000 });
    console.log(`  (a) run ${i + 1}: upload ${ms(yearRuns[i].wallMs)} wall / ${ms(yearRuns[i].serverCpuMs)} server CPU; parse-only ${ms(wallMs)} wall / ${ms(parseRuns[i].cpuMs)} CPU`);
  }
  const yearPeakKb = serverStatusKb("VmHWM");

  const pandas = pandasPeer(yearText, Math.min(RUNS_YEAR, 3));

  resetPeakRss();
  const decadeRuns: UploadRun[] = [];
  for (let i = 0; i < RUNS_DECADE; i++) {
    decadeRuns.push(await upload(cookie, decadeCircuit, decadeBody, { ...DECADE_MAPPING, name: `decade run ${i + 1}` }));
    console.log(`  (b) run ${i + 1}: upload ${ms(decadeRuns[i].wallMs)} wall / ${ms(decadeRuns[i].serverCpuMs)} server CPU`);
  }
  const decadePeakKb = serverStatusKb("VmHWM");

  // --- table ---
  const yearWall = median(yearRuns.map((r) => r.wallMs));
  const yearCpu = median(yearRuns.map((r) => r.serverCpuMs));
  const decadeWall = median(decadeRuns.map((r) => r.wallMs));
  const decadeCpu = median(decadeRuns.map((r) => r.serverCpuMs));
  const parseWall = median(parseRuns.map((r) => r.wallMs));
  const parseCpu = median(parseRuns.map((r) => r.cpuMs));
  const peakMb = (kb: number) => (kb * 1024) / 1e6;
  const peakNote = peakResetWorks ? "peak during this case" : "peak since server start (clear_refs not writable)";
  const rows: [string, string, string, string, string][] = [
    ["(a) 1 year, 3-phase, upload→stored", ms(yearWall), ms(yearCpu), `≤ ${ms(TARGETS.yearMs)}`, verdict(yearWall <= TARGETS.yearMs)],
    decadeRuns.length
      ? ["(b) 10 years, 1-phase, upload→stored", ms(decadeWall), ms(decadeCpu), `≤ ${ms(TARGETS.decadeMs)}`, verdict(decadeWall <= TARGETS.decadeMs)]
      : ["(b) 10 years, 1-phase, upload→stored", "not run", "", `≤ ${ms(TARGETS.decadeMs)}`, ""],
    ["papaparse parse-only, (a)'s text", ms(parseWall), ms(parseCpu), "", ""],
    [
      "ratio (a) / parse-only",
      (yearWall / parseWall).toFixed(2),
      (yearCpu / parseCpu).toFixed(2),
      `≤ ${TARGETS.ratio}`,
      verdict(yearWall / parseWall <= TARGETS.ratio),
    ],
    ["server peak RSS (VmHWM) during (a)", `${peakMb(yearPeakKb).toFixed(0)} MB`, "", `≤ ${TARGETS.rssMb} MB`, verdict(peakMb(yearPeakKb) <= TARGETS.rssMb)],
    decadeRuns.length
      ? ["server peak RSS (VmHWM) during (b)", `${peakMb(decadePeakKb).toFixed(0)} MB`, "", `≤ ${TARGETS.rssMb} MB`, verdict(peakMb(decadePeakKb) <= TARGETS.rssMb)]
      : ["server peak RSS (VmHWM) during (b)", "not run", "", `≤ ${TARGETS.rssMb} MB`, ""],
  ];
  if ("skipped" in pandas) rows.push(["pandas peer (read_csv + threshold)", "skipped", "", "", ""]);
  else {
    rows.push(["pandas peer (read_csv + threshold)", ms(pandas.wallMs), ms(pandas.cpuMs), "", ""]);
    // The whole upload, stored, against a notebook that only parses (issue 9's peer target).
    rows.push(["ratio (a) / pandas peer", (yearWall / pandas.wallMs).toFixed(2), "", "≤ 1.0", verdict(yearWall / pandas.wallMs <= 1)]);
  }

  const head: [string, string, string, string, string] = ["measure (median)", "wall", "CPU", "target", ""];
  const widths = head.map((h, i) => Math.max(h.length, ...rows.map((r) => r[i].length)));
  const line = (r: string[]) => r.map((c, i) => (i === 0 ? c.padEnd(widths[i]) : c.padStart(widths[i]))).join("  ");
  console.log("");
  console.log(line(head));
  console.log(widths.map((w) => "-".repeat(w)).join("  "));
  for (const r of rows) console.log(line(r));
  console.log("");
  console.log(`CPU of an upload = the server process's user+system time during it; wall includes sending the body over loopback.`);
  console.log(`Samples stored: (a) ${yearRuns[0].samples.toLocaleString("en-US")}, (b) ${decadeRuns[0]?.samples.toLocaleString("en-US") ?? "not run"}; bodies ${mb(yearBody.length)} and ${mb(decadeBody.length)}. RSS: ${peakNote}.`);
  console.log(`Runs (wall, ms): (a) ${yearRuns.map((r) => r.wallMs.toFixed(0)).join(", ")}; (b) ${decadeRuns.map((r) => r.wallMs.toFixed(0)).join(", ")}; parse-only ${parseRuns.map((r) => r.wallMs.toFixed(0)).join(", ")}`);
  console.log(`Load average at the end: ${load()} (on ${availableParallelism()} cores; other work on the machine inflates wall times).`);
  console.log("skipped" in pandas ? `pandas peer skipped: ${pandas.skipped}.` : `pandas peer: ${pandas.note}.`);
}

await main();
