// Seeded, invented current histories for the demo scenario and for tests and benchmarks:
// daily and weekly cycles, a seasonal swing, noise, switching outages (zero current),
// historian gaps (missing rows) and a stuck-sensor stretch, written as a historian export.
// Every name here is invented.

export interface Stretch {
  /** Days after the start. */
  startDay: number;
  hours: number;
}

export interface LoadProfileSpec {
  seed: number;
  /** ISO start, UTC. */
  start: string;
  days: number;
  intervalMinutes: number;
  phases: 1 | 3;
  /** Mean current, A. */
  baseA: number;
  /** Half the day-to-night swing, A (peak late afternoon, trough before dawn). */
  dailySwingA: number;
  /** Half the summer-to-spring swing, A (peak late July). */
  seasonalSwingA: number;
  /** Extra drop of the night load in spring (March–May), A, deepest in mid-April. */
  springNightDipA?: number;
  /** Weekend load reduction, A. */
  weekendDropA?: number;
  /** Standard deviation of the noise, A. */
  noiseA?: number;
  /** Rows missing from the export. */
  gaps?: Stretch[];
  /** Line switched out: current 0. */
  outages?: Stretch[];
  /** The sensor repeats its last reading (quality still good). */
  stuck?: Stretch[];
  /** Phase imbalance factors for B and C (A is 1). */
  imbalance?: [number, number];
  /** Lines written before the header, without the leading "# ". */
  metadata?: string[];
}

/** mulberry32: a small, fast, seedable PRNG (uniform in [0, 1)). */
export function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Standard normal deviate (Box–Muller) from a uniform source. */
function normal(random: () => number): number {
  const u = 1 - random();
  const v = random();
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v);
}

const DAY_MS = 86_400_000;

function inStretches(stretches: Stretch[] | undefined, dayOffset: number): boolean {
  if (!stretches) return false;
  for (const s of stretches) if (dayOffset >= s.startDay && dayOffset < s.startDay + s.hours / 24) return true;
  return false;
}

/** "2024-01-01 00:15:00" in UTC. */
function historianTime(ms: number): string {
  return new Date(ms).toISOString().slice(0, 19).replace("T", " ");
}

/** Current in amperes at time `ms` before noise, outages and stuck readings. */
export function expectedCurrentA(spec: LoadProfileSpec, ms: number): number {
  const date = new Date(ms);
  const hour = date.getUTCHours() + date.getUTCMinutes() / 60;
  const dayOfYear = (ms - Date.UTC(date.getUTCFullYear(), 0, 1)) / DAY_MS;
  const weekday = date.getUTCDay();
  // Daily cycle: trough near 04:00, peak near 16:00.
  const daily = -Math.cos((2 * Math.PI * (hour - 4)) / 24);
  // Seasonal: peak in late July (day 205), low in spring and autumn shoulder.
  const seasonal = Math.cos((2 * Math.PI * (dayOfYear - 205)) / 365.25);
  let amps = spec.baseA + spec.dailySwingA * daily + spec.seasonalSwingA * seasonal;
  if (weekday === 0 || weekday === 6) amps -= spec.weekendDropA ?? 0;
  if (spec.springNightDipA) {
    // Spring (days 60–151), deepest mid-April; only at night (20:00–06:00).
    const spring = Math.max(0, Math.sin((Math.PI * (dayOfYear - 60)) / 91));
    const night = hour >= 20 || hour < 6 ? 1 : 0;
    if (dayOfYear >= 60 && dayOfYear < 151) amps -= spec.springNightDipA * spring * night;
  }
  return Math.max(0, amps);
}

/**
 * A historian-style CSV: metadata lines, then `Timestamp,IA [A],IB [A],IC [A],Quality`
 * (or `Timestamp,I [A],Quality` for one phase), UTC times, one decimal, OPC quality 192.
 */
export function generateLoadCsv(spec: LoadProfileSpec): string {
  const random = mulberry32(spec.seed);
  const startMs = Date.parse(spec.start);
  const stepMs = spec.intervalMinutes * 60_000;
  const rows = Math.floor((spec.days * DAY_MS) / stepMs);
  const noise = spec.noiseA ?? spec.baseA * 0.03;
  const [fb, fc] = spec.imbalance ?? [0.97, 1.03];
  const lines: string[] = [];
  for (const m of spec.metadata ?? []) lines.push(`# ${m}`);
  lines.push(spec.phases === 3 ? "Timestamp,IA [A],IB [A],IC [A],Quality" : "Timestamp,I [A],Quality");
  let stuckValue: number[] | null = null;
  for (let r = 0; r < rows; r++) {
    const ms = startMs + r * stepMs;
    const dayOffset = (ms - startMs) / DAY_MS;
    const base = expectedCurrentA(spec, ms);
    const shared = normal(random) * noise;
    let values: number[];
    if (inStretches(spec.outages, dayOffset)) values = spec.phases === 3 ? [0, 0, 0] : [0];
    else {
      const a = Math.max(0, base + shared + normal(random) * noise * 0.3);
      values = spec.phases === 3 ? [a, Math.max(0, a * fb + normal(random) * noise * 0.3), Math.max(0, a * fc + normal(random) * noise * 0.3)] : [a];
      values = values.map((v) => Math.round(v * 10) / 10);
    }
    if (inStretches(spec.stuck, dayOffset)) values = stuckValue ??= values;
    else stuckValue = null;
    if (inStretches(spec.gaps, dayOffset)) continue;
    lines.push(`${historianTime(ms)},${values.map((v) => v.toFixed(1)).join(",")},192`);
  }
  return lines.join("\n") + "\n";
}

export interface DemoProfile {
  key: string;
  title: string;
  description: string;
  /** Column mapping for ingest (matches the generated header). */
  mapping: { timestampColumn: string; phaseA?: string; phaseB?: string; phaseC?: string; currentColumn?: string; qualityColumn: string };
  spec: LoadProfileSpec;
}

const THREE_PHASE_MAPPING = { timestampColumn: "Timestamp", phaseA: "IA [A]", phaseB: "IB [A]", phaseC: "IC [A]", qualityColumn: "Quality" };

/** The invented demo scenario's load histories. */
export const DEMO_PROFILES: readonly DemoProfile[] = [
  {
    key: "glimmerford-138",
    title: "Glimmerford river crossing, 138 kV",
    description: "Healthy tie line: night load well above 40 A all year. One year of 15-minute data.",
    mapping: THREE_PHASE_MAPPING,
    spec: {
      seed: 138,
      start: "2024-01-01T00:00:00Z",
      days: 366,
      intervalMinutes: 15,
      phases: 3,
      baseA: 310,
      dailySwingA: 90,
      seasonalSwingA: 60,
      weekendDropA: 25,
      noiseA: 8,
      gaps: [
        { startDay: 41.25, hours: 5 },
        { startDay: 203.5, hours: 2 },
      ],
      outages: [{ startDay: 288.4, hours: 3 }],
      stuck: [{ startDay: 150.2, hours: 6 }],
      metadata: ["Historian export — Lanterncrest Power Cooperative (invented)", "Point: GLF-138 line current, UTC"],
    },
  },
  {
    key: "hollowmere-69",
    title: "Hollowmere canyon crossing, 69 kV",
    description: "Radial feeder whose night load falls below 40 A in spring. One year of 15-minute data.",
    mapping: THREE_PHASE_MAPPING,
    spec: {
      seed: 69,
      start: "2024-01-01T00:00:00Z",
      days: 366,
      intervalMinutes: 15,
      phases: 3,
      baseA: 125,
      dailySwingA: 35,
      seasonalSwingA: 20,
      springNightDipA: 50,
      weekendDropA: 10,
      noiseA: 4,
      gaps: [{ startDay: 97.1, hours: 9 }],
      outages: [
        { startDay: 120.3, hours: 4 },
        { startDay: 300.6, hours: 1.5 },
      ],
      stuck: [{ startDay: 230.5, hours: 3 }],
      metadata: ["Historian export — Lanterncrest Power Cooperative (invented)", "Point: HWM-69 line current, UTC"],
    },
  },
  {
    key: "saltbrook-115",
    title: "Saltbrook approach crossing, 115 kV",
    description: "Only 60 days of history: too little data for a verdict.",
    mapping: THREE_PHASE_MAPPING,
    spec: {
      seed: 115,
      start: "2024-09-01T00:00:00Z",
      days: 60,
      intervalMinutes: 15,
      phases: 3,
      baseA: 180,
      dailySwingA: 60,
      seasonalSwingA: 30,
      weekendDropA: 15,
      noiseA: 6,
      metadata: ["Historian export — Lanterncrest Power Cooperative (invented)", "Point: SBK-115 line current, UTC"],
    },
  },
];
