// Property tests: any valid series written in any supported dialect reads back to the same
// samples; arbitrary input never crashes the ingester (a result or an IngestError).
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { createIngester, IngestError, type IngestResult } from "../../lib/ingest/ingest";
import type { ConcreteTimestampFormat } from "../../lib/ingest/timestamps";

const ZONES = ["UTC", "America/Chicago", "Europe/Berlin", "Asia/Kolkata", "Australia/Lord_Howe", "America/St_Johns"];
const FORMATS: ConcreteTimestampFormat[] = ["iso", "ymd", "dmy", "mdy", "epoch-s", "epoch-ms", "serial-days"];
const DELIMITERS = { ",": ",", ";": ";", tab: "\t", "|": "|" } as const;

// The test's own writer uses Intl directly for wall-clock fields.
const formatters = new Map<string, Intl.DateTimeFormat>();
function wallClock(u: number, zone: string) {
  let f = formatters.get(zone);
  if (!f) {
    f = new Intl.DateTimeFormat("en-US", { timeZone: zone, hourCycle: "h23", year: "numeric", month: "numeric", day: "numeric", hour: "numeric", minute: "numeric", second: "numeric" });
    formatters.set(zone, f);
  }
  const p = Object.fromEntries(f.formatToParts(u * 1000).map((x) => [x.type, Number(x.value)]));
  const local = Date.UTC(p.year, p.month - 1, p.day, p.hour, p.minute, p.second) / 1000;
  return { ...p, offset: local - u, local } as Record<string, number>;
}
/** No offset change within ±3 h: the local time is neither skipped nor repeated. */
const steadyOffset = (u: number, zone: string) => wallClock(u - 10800, zone).offset === wallClock(u + 10800, zone).offset;

const pad = (n: number, w = 2) => String(n).padStart(w, "0");

function writeTime(u: number, d: Dialect): string {
  if (d.format === "epoch-s") return String(u);
  if (d.format === "epoch-ms") return String(u * 1000);
  const w = wallClock(u, d.zone);
  if (d.format === "serial-days") return (w.local / 86400 + 25569).toFixed(9);
  const hms = `${pad(w.hour)}:${pad(w.minute)}:${pad(w.second)}`;
  if (d.format === "iso") {
    let text = `${w.year}-${pad(w.month)}-${pad(w.day)}${d.isoT ? "T" : " "}${hms}`;
    if (d.offsets) {
      const o = Math.abs(w.offset);
      text += `${w.offset < 0 ? "-" : "+"}${pad(Math.floor(o / 3600))}:${pad((o % 3600) / 60)}`;
    }
    return text;
  }
  if (d.format === "ymd") return `${w.year}/${pad(w.month)}/${pad(w.day)} ${hms}`;
  if (d.format === "dmy") return `${pad(w.day)}.${pad(w.month)}.${w.year} ${hms}`;
  const h12 = w.hour % 12 || 12;
  return `${w.month}/${w.day}/${w.year} ${h12}:${pad(w.minute)}:${pad(w.second)} ${w.hour < 12 ? "AM" : "PM"}`;
}

function writeValue(tenths: number, d: Dialect): string {
  let text = d.unit === "kA" ? (tenths / 10000).toFixed(4) : (tenths / 10).toFixed(1);
  if (d.thousands && d.unit === "A" && tenths >= 10000) {
    const [whole, fraction] = text.split(".");
    text = `${whole.replace(/\B(?=(\d{3})+$)/g, d.decimal === "." ? "," : ".")}.${fraction}`;
  }
  if (d.decimal === ",") text = text.replace(/\.(\d+)$/, ",$1");
  const delimiter = DELIMITERS[d.delimiter];
  return text.includes(delimiter) ? `"${text}"` : text;
}

interface Dialect {
  delimiter: keyof typeof DELIMITERS;
  decimal: "." | ",";
  format: ConcreteTimestampFormat;
  zone: string;
  unit: "A" | "kA";
  unitInHeader: boolean;
  auto: boolean;
  offsets: boolean;
  isoT: boolean;
  thousands: boolean;
  crlf: boolean;
  bom: boolean;
  metadata: boolean;
}

const dialect: fc.Arbitrary<Dialect> = fc.record({
  delimiter: fc.constantFrom(",", ";", "tab", "|"),
  decimal: fc.constantFrom(".", ","),
  format: fc.constantFrom(...FORMATS),
  zone: fc.constantFrom(...ZONES),
  unit: fc.constantFrom("A", "kA"),
  unitInHeader: fc.boolean(),
  auto: fc.boolean(),
  offsets: fc.boolean(),
  isoT: fc.boolean(),
  thousands: fc.boolean(),
  crlf: fc.boolean(),
  bom: fc.boolean(),
  metadata: fc.boolean(),
});

const samples = fc
  .record({
    start: fc.integer({ min: 946_684_800, max: 1_893_456_000 }), // 2000 … 2030
    steps: fc.array(fc.integer({ min: 60, max: 3 * 86400 }), { minLength: 0, maxLength: 30 }),
    values: fc.array(fc.integer({ min: 0, max: 200_000 }), { minLength: 31, maxLength: 31 }),
    chunk: fc.integer({ min: 1, max: 4096 }),
  })
  .map(({ start, steps, values, chunk }) => {
    const times = [start];
    for (const s of steps) times.push(times[times.length - 1] + s);
    return { times, values: times.map((_, k) => values[k]), chunk };
  });

function ingestChunked(text: string, options: Record<string, unknown>, chunk: number): IngestResult {
  const ingester = createIngester(options as never);
  for (let i = 0; i < text.length; i += chunk) ingester.write(text.slice(i, i + chunk));
  return ingester.end();
}

describe("round trip through every dialect", () => {
  it("any valid series written in any supported dialect reads back to the same samples", () => {
    fc.assert(
      fc.property(dialect, samples, (d, s) => {
        if (d.decimal === "," && d.format === "serial-days" && d.delimiter === ",") d.delimiter = ";"; // serial days are written with a point
        const withOffsets = d.format === "iso" && d.offsets;
        const absolute = d.format === "epoch-s" || d.format === "epoch-ms" || withOffsets;
        const keep = s.times.map((u) => absolute || steadyOffset(u, d.zone));
        const times = s.times.filter((_, k) => keep[k]);
        const values = s.values.filter((_, k) => keep[k]);
        fc.pre(times.length > 0);

        const delimiter = DELIMITERS[d.delimiter];
        const column = d.unitInHeader ? `Current [${d.unit}]` : "Load";
        const lines = d.metadata ? ["# exported for a property test", ""] : [];
        lines.push(`Time${delimiter}${column}`);
        times.forEach((u, k) => lines.push(`${writeTime(u, d)}${delimiter}${writeValue(values[k], d)}`));
        const text = (d.bom ? "\uFEFF" : "") + lines.join(d.crlf ? "\r\n" : "\n") + (d.crlf ? "\r\n" : "\n");

        const dayMonth = d.format === "dmy" || d.format === "mdy";
        const options = {
          timestampColumn: "Time",
          currentColumn: column,
          unit: d.unit,
          timezone: d.zone,
          timestampFormat: d.auto && !dayMonth ? "auto" : d.format,
          decimal: d.decimal,
          delimiter: d.auto ? "auto" : d.delimiter,
        };
        const r = ingestChunked(text, options, s.chunk);
        expect(r.series.t.length).toBe(times.length);
        const tolerance = d.format === "serial-days" ? 1e-3 : 0;
        times.forEach((u, k) => {
          expect(Math.abs(r.series.t[k] - u)).toBeLessThanOrEqual(tolerance);
          const expected = Math.fround(values[k] / 10);
          expect(Math.abs(r.series.phases.A![k] - expected)).toBeLessThanOrEqual(1e-6 * Math.max(1, expected));
        });
        expect(r.quality.rowsRead).toBe(times.length);
      }),
      { numRuns: 300 },
    );
  });
});

describe("arbitrary input", () => {
  const lineArb = fc.oneof(
    fc.constantFrom("2024-01-01 00:00,5", "2024-01-01 00:15,6", "2024-01-02 00:15,-1", "", "#c", '"', ';;', "Time,Amps", "\u0000", "x,y,z", "2024-13-45 99:99,1e999"),
    fc.string({ maxLength: 40 }),
    fc.string({ unit: "binary", maxLength: 40 }),
  );
  const inputArb = fc.oneof(
    fc.string({ unit: "binary", maxLength: 400 }),
    fc.tuple(fc.boolean(), fc.array(lineArb, { maxLength: 40 })).map(([header, rows]) => (header ? "Time,Amps\n" : "") + rows.join("\n")),
  );

  it("never crashes: always a consistent result or an IngestError with a known status", () => {
    fc.assert(
      fc.property(inputArb, fc.integer({ min: 1, max: 64 }), fc.constantFrom("auto", "iso", "dmy"), (text, chunk, timestampFormat) => {
        let result: IngestResult | null = null;
        try {
          result = ingestChunked(text, { timestampColumn: "Time", currentColumn: "Amps", timestampFormat }, chunk);
        } catch (e) {
          expect(e).toBeInstanceOf(IngestError);
          const error = e as IngestError;
          expect([400, 413, 415, 422]).toContain(error.status);
          expect(error.title.length).toBeGreaterThan(0);
          expect(error.examples.length).toBeLessThanOrEqual(10);
          for (const ex of error.examples) expect(ex.line).toBeGreaterThanOrEqual(1);
          return;
        }
        const { t } = result.series;
        for (let i = 1; i < t.length; i++) expect(t[i]).toBeGreaterThan(t[i - 1]);
        const dropped = Object.values(result.quality.invalid).reduce((a, b) => a + (b ?? 0), 0);
        expect(result.quality.rowsRead).toBe(result.quality.validSamples + dropped + result.quality.duplicates);
      }),
      { numRuns: 400 },
    );
  });
});
