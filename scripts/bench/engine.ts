// Benchmark of the feasibility engine (issue 4). Run: npx tsx scripts/bench/engine.ts (npm run bench:engine)
// Prints medians of several runs on invented 1-minute data (no files, no network), each as wall time
// and CPU time of this process (process.cpuUsage: user + system, all its threads). Other processes
// on the machine inflate wall time; CPU time shows what the engine itself costs.
//   1 year full study (night windows, storage) — target ≤ 150 ms
//   10 years full study — target ≤ 1.5 s
//   decode + study of a stored year — target ≤ 300 ms including the database read; the read itself
//     needs MariaDB and is measured by npm run bench:ingest, so it is not in this figure
//   storage solver on 1 year — target ≤ 2 s
//   optimiser, 10 devices × 12 storage sizes on 1 year — target ≤ 5 s (issue 13)
// and a plain typed-array loop computing only hours at or above the minimum on the same data,
// with the ratio of the full study to that loop. Each figure follows WARM_UP unmeasured runs, so it
// is the steady state of a running server (the first study after start also pays for compiling).
import { loadavg } from "node:os";
import { defaultMaxGapSeconds, selectPhase, type ProfileSeries, type Series } from "../../lib/series";
import { decodeAmps, decodeTimes, encodeAmps, encodeTimes } from "../../lib/series-codec";
import { compileDevice } from "../../lib/engine/device";
import { prepareStudy, type StudyInput } from "../../lib/engine/prepare";
import { runStudy, simulate, studyResult } from "../../lib/engine/simulate";
import { solveMinStorage } from "../../lib/engine/solvers";
import { requiredWindows } from "../../lib/engine/sun";
import { optimise } from "../../lib/optimise/optimise";

const MINUTE = 60;
const WARM_UP = 3;

/** Invented feeder load: daily and seasonal swing, a slow weather term and a few low-load spells. */
function syntheticSeries(years: number): Series {
  const start = Date.UTC(2021, 0, 1) / 1000;
  const n = Math.round((years * 365.25 * 86_400) / MINUTE);
  const t = new Float64Array(n);
  const amps = new Float64Array(n);
  let weather = 0;
  let seed = 12345;
  const random = () => ((seed = (seed * 1103515245 + 12345) % 2147483648) / 2147483648);
  for (let i = 0; i < n; i++) {
    const s = start + i * MINUTE;
    t[i] = s;
    const day = (s % 86_400) / 86_400;
    const season = Math.cos((2 * Math.PI * (s - start)) / (365.25 * 86_400));
    weather = 0.999 * weather + 0.6 * (random() - 0.5);
    const lowSpell = Math.floor(s / (86_400 * 9)) % 7 === 3 ? 0.35 : 1;
    amps[i] = Math.max(0, lowSpell * (150 + 60 * season + 70 * Math.sin(2 * Math.PI * (day - 0.3))) + weather);
  }
  return { t, amps };
}

const input: StudyInput = {
  device: {
    minCurrentA: 60,
    maxCurrentA: 2000,
    harvestW: "min(0.004 * I^2, 15)",
    loadW: 4,
    standbyW: 0.1,
    storageWh: 40,
    chargeEfficiency: 0.9,
    selfDischargePctPerDay: 1,
  },
  schedule: { kind: "night", sunAltitudeDeg: -0.833 },
  location: { lat: 35.2, lon: -97.4 },
};

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2;
}

interface Timing {
  wall: number;
  cpu: number;
}

/** Median wall and CPU time in ms over `runs` runs after WARM_UP unmeasured ones. */
function timeMedian(runs: number, f: () => unknown, warmUp = WARM_UP): Timing {
  for (let w = 0; w < warmUp; w++) f();
  const wall: number[] = [];
  const cpu: number[] = [];
  for (let r = 0; r < runs; r++) {
    const c = process.cpuUsage();
    const a = performance.now();
    f();
    wall.push(performance.now() - a);
    const used = process.cpuUsage(c);
    cpu.push((used.user + used.system) / 1000);
  }
  return { wall: median(wall), cpu: median(cpu) };
}

function hoursAtOrAbove(series: Series, threshold: number, maxGap: number): number {
  const { t, amps } = series;
  let seconds = 0;
  for (let i = 0; i + 1 < t.length; i++) {
    const dt = t[i + 1] - t[i];
    if (dt <= maxGap && amps[i] >= threshold) seconds += dt;
  }
  return seconds / 3600;
}

const ms = (x: number) => (x >= 1000 ? `${(x / 1000).toFixed(2)} s ` : `${x.toFixed(1)} ms`).padStart(10);
const fmt = (t: Timing) => `${ms(t.wall)} wall  ${ms(t.cpu)} cpu`;
const line = (label: string, t: Timing, note = "") => console.log(`${label.padEnd(52)}${fmt(t)}${note ? `   ${note}` : ""}`);

const oneYear = syntheticSeries(1);
const tenYears = syntheticSeries(10);
const load = loadavg().map((x) => x.toFixed(1)).join(" ");
console.log(
  `Engine benchmark — medians after ${WARM_UP} warm-up runs; node ${process.version}; ${oneYear.t.length.toLocaleString("en-US")} samples per year at 1 min; load average ${load}`,
);

const baseline = timeMedian(15, () => hoursAtOrAbove(oneYear, 60, 180));
const full1 = timeMedian(9, () => runStudy(oneYear, input));
line("plain loop, hours at or above (1 y)", baseline);
line("full study, 1 year (target ≤ 150 ms)", full1, `ratio to plain loop ${(full1.cpu / baseline.cpu).toFixed(1)}× cpu, ${(full1.wall / baseline.wall).toFixed(1)}× wall`);

// Where the time goes, for one year.
const context = prepareStudy(oneYear, input);
const noStorage = context.device.withChanges({ storageWh: 0 });
const parts: [string, Timing][] = [
  ["  night windows (suncalc)", timeMedian(9, () => requiredWindows({ kind: "night", sunAltitudeDeg: -0.833 }, 35.2, -97.4, oneYear.t[0], oneYear.t[oneYear.t.length - 1]))],
  ["  3 × median interval (lib/series)", timeMedian(9, () => defaultMaxGapSeconds(oneYear.t))],
  ["  compile device (mathjs → table, not reused)", timeMedian(9, () => compileDevice(input.device, { reuseTable: false }))],
  ["  compile device (table reused)", timeMedian(9, () => compileDevice(input.device))],
  ["  prepare (all of the above + curve)", timeMedian(9, () => prepareStudy(oneYear, input))],
  ["  simulate with storage", timeMedian(9, () => simulate(context.prepared, context.device))],
  ["  simulate without storage", timeMedian(9, () => simulate(context.prepared, noStorage))],
  ["  simulate + results from prepared", timeMedian(9, () => studyResult(context))],
];
for (const [label, timing] of parts) line(label, timing);

const full10 = timeMedian(5, () => runStudy(tenYears, input), 1);
line("full study, 10 years (target ≤ 1.5 s)", full10);

// A stored profile as the app keeps it (times and one phase as BLOBs, amps in Float32).
const stored = { times: encodeTimes(oneYear.t), phaseA: encodeAmps(Float32Array.from(oneYear.amps)) };
const rerun = timeMedian(9, () => {
  const profile: ProfileSeries = { t: decodeTimes(stored.times), phases: { A: decodeAmps(stored.phaseA) } };
  return runStudy(selectPhase(profile, "A"), input);
});
line("decode + study, 1 year (target ≤ 300 ms)", rerun, "DB read itself not included; see npm run bench:ingest");

let solverIterations = 0;
let solverValue: number | undefined;
const solver = timeMedian(
  3,
  () => {
    const r = solveMinStorage(prepareStudy(oneYear, input));
    solverIterations = r.iterations;
    solverValue = r.value;
  },
  1,
);
line("storage solver, 1 year (target ≤ 2 s)", solver, `(${solverIterations} simulations, answer ${solverValue} Wh)`);

// The new physics on the same year: hysteresis (turn-on above drop-out) and cold derating by month.
const physics = prepareStudy(oneYear, {
  ...input,
  device: { ...input.device, turnOnCurrentA: 90, coldDerating: [{ tempC: -20, usableFraction: 0.5 }, { tempC: 20, usableFraction: 1 }] },
  params: { monthlyTemperatureC: [-8, -5, 2, 9, 15, 21, 25, 24, 18, 10, 2, -5] },
});
line("  simulate with hysteresis + cold derating", timeMedian(9, () => simulate(physics.prepared, physics.device)));

// Optimiser (issue 13): 10 candidate devices × 12 storage sizes on one year, bisection pruning.
const candidates = Array.from({ length: 10 }, (_, k) => ({
  name: `Candidate ${k + 1}`,
  device: { ...input.device, minCurrentA: 20 + 10 * k, harvestW: `min(${(0.002 + 0.0005 * k).toFixed(4)} * I^2, ${10 + k})`, loadW: 3 + (k % 3) },
  unitCost: 800 + 150 * k,
  installCost: 400,
  lifeYears: 15 + (k % 3) * 5,
}));
const optimiserInput = {
  location: input.location,
  schedule: input.schedule,
  candidates,
  storage: { sizesWh: [0, 10, 20, 40, 60, 80, 120, 160, 240, 320, 480, 640], costPerWh: 0.8, lifeYears: 8 },
  horizonYears: 20,
  discountRatePercent: 5,
};
let optimised: ReturnType<typeof optimise> | undefined;
const optimiser = timeMedian(3, () => (optimised = optimise(oneYear, optimiserInput)), 1);
line(
  "optimiser, 10 devices × 12 sizes, 1 year (target ≤ 5 s)",
  optimiser,
  `(${optimised!.simulations} simulations of 120 pairs; recommended ${optimised!.recommended ? `${optimised!.recommended.name} at ${optimised!.recommended.storageWh} Wh` : "none"})`,
);
