// The temperature column of a load CSV (lib/ingest/temperatures.ts through the ingester): monthly
// means worked by hand, °F converted, blanks skipped, and refusals that name the row.
import { describe, expect, it } from "vitest";
import { IngestError, ingestCsvText } from "../../lib/ingest/ingest";
import { mergeRecordedTemperatures, monthlyMeansC, toCelsius } from "../../lib/ingest/temperatures";
import { ingestOptionsSchema } from "../../shared/ingest-options";

const csv = (rows: string[]) => ["Time,Amps,Air", ...rows].join("\n");
const options = { timestampColumn: "Time", currentColumn: "Amps", temperatureColumn: "Air" };

function refusal(text: string, extra: Record<string, unknown> = {}): IngestError {
  try {
    ingestCsvText(text, { ...options, ...extra });
  } catch (error) {
    if (error instanceof IngestError) return error;
    throw error;
  }
  throw new Error("the file was accepted");
}

describe("temperature column", () => {
  const rows = [
    "2025-01-31T22:00:00Z,100,-4",
    "2025-01-31T23:00:00Z,100,-6",
    "2025-02-01T00:00:00Z,100,", // a gap: skipped
    "2025-02-01T01:00:00Z,100,1.5",
    "2025-02-01T02:00:00Z,100,2.5",
    "2025-02-01T03:00:00Z,100,3.5",
  ];

  it("keeps the mean of each UTC month with its count of readings", () => {
    const r = ingestCsvText(csv(rows), options);
    // January: (−4 − 6) / 2 = −5; February: (1.5 + 2.5 + 3.5) / 3 = 2.5 (by hand); the blank is no reading.
    expect(r.temperature).toEqual({ column: "Air", unit: "C", months: { "2025-01": { meanC: -5, readings: 2 }, "2025-02": { meanC: 2.5, readings: 3 } } });
    expect(monthlyMeansC(r.temperature)).toEqual({ "2025-01": -5, "2025-02": 2.5 });
    expect(r.series.t.length).toBe(6); // the current samples are untouched by the column
  });

  it("groups by UTC month without a circuit zone, even when the timestamps are local", () => {
    // 00:30 on 1 February in Berlin (UTC+1) is 23:30 on 31 January UTC.
    const r = ingestCsvText(csv(["2025-02-01 00:30,100,-3", "2025-02-01 02:00,100,1"]), { ...options, timezone: "Europe/Berlin" });
    expect(r.temperature!.months).toEqual({ "2025-01": { meanC: -3, readings: 1 }, "2025-02": { meanC: 1, readings: 1 } });
  });

  it("groups by the circuit's local month when its zone is given (the study's months)", () => {
    // Same rows in UTC: 23:00 UTC on 31 January is already midnight of 1 February in Berlin.
    const r = ingestCsvText(csv(rows), options, { monthsTimeZone: "Europe/Berlin" });
    // January (Berlin): only 22:00 UTC = 23:00 local, −4; February: (−6 + 1.5 + 2.5 + 3.5) / 4 = 0.375 → 0.38 (by hand, 2 decimals).
    expect(r.temperature!.months).toEqual({ "2025-01": { meanC: -4, readings: 1 }, "2025-02": { meanC: 0.38, readings: 4 } });
    // Local timestamps in Berlin on a Berlin circuit: each reading in the month it was written in.
    const local = ingestCsvText(csv(["2025-02-01 00:30,100,-3", "2025-02-01 02:00,100,1"]), { ...options, timezone: "Europe/Berlin" }, { monthsTimeZone: "Europe/Berlin" });
    expect(local.temperature!.months).toEqual({ "2025-02": { meanC: -1, readings: 2 } });
  });

  it("converts °F: 14 °F is −10 °C and 50 °F is 10 °C (C = (F − 32) × 5/9), mean 0 °C", () => {
    expect(toCelsius(14, "F")).toBeCloseTo(-10, 12);
    const r = ingestCsvText(csv(["2025-03-01T00:00:00Z,100,14", "2025-03-01T01:00:00Z,100,50"]), { ...options, temperatureUnit: "F" });
    expect(r.temperature!.months["2025-03"]).toEqual({ meanC: 0, readings: 2 });
    expect(r.temperature!.unit).toBe("F");
  });

  it("reads decimal commas with the decimal option", () => {
    const r = ingestCsvText(["Time;Amps;Air", "2025-03-01T00:00:00Z;100;-1,5", "2025-03-01T01:00:00Z;100;2,5"].join("\n"), { ...options, decimal: ",", delimiter: ";" });
    expect(r.temperature!.months["2025-03"].meanC).toBe(0.5);
  });

  it("refuses a value that is not a number, naming its line and the column", () => {
    const e = refusal(csv([...rows.slice(0, 3), "2025-02-01T01:00:00Z,100,warm"]));
    expect(e.status).toBe(422);
    expect(e.detail).toMatch(/^Line 5: "warm" in temperature column "Air" is not a number/);
    expect(e.examples[0]).toMatchObject({ line: 5, problem: "temperature is not a number" });
  });

  it("refuses an implausible temperature (a °F column read as °C), naming its line", () => {
    const e = refusal(csv(["2025-07-01T00:00:00Z,100,20", "2025-07-01T01:00:00Z,100,95"]));
    expect(e.status).toBe(422);
    expect(e.detail).toMatch(/^Line 3: 95 °C in temperature column "Air" is outside -60 to 60 °C/);
    // The same value as °F is 35 °C: accepted.
    expect(ingestCsvText(csv(["2025-07-01T00:00:00Z,100,95", "2025-07-01T01:00:00Z,100,95"]), { ...options, temperatureUnit: "F" }).temperature!.months["2025-07"].meanC).toBe(35);
  });

  it("a mapped column that is not in the header is refused like any other mapping", () => {
    expect(refusal(csv(rows), { temperatureColumn: "Outside" }).detail).toMatch(/Column "Outside" is not in the header/);
  });

  it("a column holding only blanks keeps no temperatures and says so", () => {
    const r = ingestCsvText(csv(["2025-01-01T00:00:00Z,100,", "2025-01-01T01:00:00Z,100,"]), options);
    expect(r.temperature).toBeNull();
    expect(r.warnings.join(" ")).toMatch(/Temperature column "Air" holds no readings/);
  });

  it("the mapping refuses a column mapped twice and an unknown unit", () => {
    const twice = ingestOptionsSchema.safeParse({ ...options, temperatureColumn: "Amps" });
    expect(twice.success).toBe(false);
    expect(twice.error!.issues[0].message).toBe('Column "Amps" is mapped twice.');
    const unit = ingestOptionsSchema.safeParse({ ...options, temperatureUnit: "K" });
    expect(unit.error!.issues[0]).toMatchObject({ path: ["temperatureUnit"], message: 'Temperature unit must be "C" or "F".' });
  });

  it("an append's months replace the stored ones they cover; the others stay", () => {
    const stored = { column: "Air", unit: "C" as const, months: { "2025-01": { meanC: -5, readings: 2 }, "2025-02": { meanC: 2.5, readings: 3 } } };
    const newer = { column: "Air", unit: "C" as const, months: { "2025-02": { meanC: 1, readings: 10 }, "2025-03": { meanC: 6, readings: 4 } } };
    expect(mergeRecordedTemperatures(stored, newer)!.months).toEqual({ "2025-01": { meanC: -5, readings: 2 }, "2025-02": { meanC: 1, readings: 10 }, "2025-03": { meanC: 6, readings: 4 } });
    expect(mergeRecordedTemperatures(stored, null)).toBe(stored);
  });
});
