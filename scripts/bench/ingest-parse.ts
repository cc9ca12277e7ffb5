// Parse benchmark for the CSV ingester (issue 3): one year of 1-minute, 3-phase history
// (525,600 rows) generated in memory; median of 5 runs of
//   (a) papaparse parsing the text only, and
//   (b) the full ingester (parse, timestamps, values, quality flags, quality report).
// Target: (b) ≤ 1.5 × (a) and about 1 s or less.
// Run: npx tsx scripts/bench/ingest-parse.ts [timezone]
import Papa from "papaparse";
import { generateLoadCsv } from "../../lib/demo/load-generator";
import { ingestCsvText } from "../../lib/ingest/ingest";

const RUNS = 5;
const timezone = process.argv[2] ?? "UTC";

function median(values: number[]): number {
  const s = [...values].sort((a, b) => a - b);
  return s[s.length >> 1];
}

/** Wall and CPU milliseconds of one call. */
function measure(run: () => unknown): { wall: number; cpu: number } {
  const cpu0 = process.cpuUsage();
  const t0 = performance.now();
  run();
  const wall = performance.now() - t0;
  const cpu = process.cpuUsage(cpu0);
  return { wall, cpu: (cpu.user + cpu.system) / 1000 };
}

const t0 = performance.now();
const csv = generateLoadCsv({
  seed: 1,
  start: "2024-01-01T00:00:00Z",
  days: 365,
  intervalMinutes: 1,
  phases: 3,
  baseA: 300,
  dailySwingA: 90,
  seasonalSwingA: 60,
  metadata: ["Benchmark history (invented)"],
});
const rows = csv.split("\n").length - 3;
console.log(`generated ${rows.toLocaleString("en-US")} rows, ${(csv.length / 1e6).toFixed(1)} MB in ${(performance.now() - t0).toFixed(0)} ms; zone ${timezone}`);

const options = {
  timestampColumn: "Timestamp",
  phaseA: "IA [A]",
  phaseB: "IB [A]",
  phaseC: "IC [A]",
  qualityColumn: "Quality",
  timezone,
};

let samples = 0;
const parseOnly = { wall: [] as number[], cpu: [] as number[] };
const full = { wall: [] as number[], cpu: [] as number[] };
// Alternate the two so a busy machine slows both alike.
for (let i = 0; i < RUNS; i++) {
  const a = measure(() => Papa.parse(csv, { delimiter: "," }));
  parseOnly.wall.push(a.wall);
  parseOnly.cpu.push(a.cpu);
  const b = measure(() => {
    samples = ingestCsvText(csv, options).series.t.length;
  });
  full.wall.push(b.wall);
  full.cpu.push(b.cpu);
}
const show = (label: string, m: { wall: number[]; cpu: number[] }) =>
  console.log(
    `${label.padEnd(28)} median ${median(m.wall).toFixed(0).padStart(5)} ms wall, ${median(m.cpu).toFixed(0).padStart(5)} ms CPU   runs: ${m.wall.map((x) => x.toFixed(0)).join(", ")}`,
  );
show("(a) papaparse parse-only", parseOnly);
show("(b) full ingester", full);
console.log(`samples kept: ${samples.toLocaleString("en-US")}`);
console.log(
  `ratio (b)/(a): ${(median(full.wall) / median(parseOnly.wall)).toFixed(2)} wall, ${(median(full.cpu) / median(parseOnly.cpu)).toFixed(2)} CPU  (target ≤ 1.5; (b) ≤ ~1000 ms)`,
);
