// Timestamps outside the accepted years, over-long periods and misread headers (issue 8,
// "Must not happen again" 1, 2 and 5). The range itself is documented in docs/input-limits.md.
import { describe, expect, it } from "vitest";
import { IngestError, ingestCsvText } from "../../lib/ingest/ingest";
import { ingestSamples } from "../../lib/ingest/samples";
import { buildQualityReport, monthBuckets } from "../../lib/ingest/quality";
import { sniffCsv } from "../../lib/ingest/sniff";
import { TimestampParser } from "../../lib/ingest/timestamps";
import { END_EPOCH_SECONDS, inTimeRange, MIN_EPOCH_SECONDS, spanProblem, utcYearOf } from "../../lib/ingest/time-range";
import { runStudy, StudyInputError } from "../../lib/engine";
import { DEFAULT_POLICY } from "../../shared/study-schemas";

const map = { timestampColumn: "Timestamp", currentColumn: "Current" } as const;

function ingestFailure(csv: string, options: Record<string, unknown> = {}): IngestError {
  try {
    ingestCsvText(csv, { ...map, ...options });
  } catch (error) {
    if (error instanceof IngestError) return error;
    throw error;
  }
  throw new Error("expected an IngestError");
}

describe("the accepted time range, years 1900–2200 (UTC)", () => {
  it("has its bounds at 1900-01-01 and 2201-01-01", () => {
    expect(new Date(MIN_EPOCH_SECONDS * 1000).toISOString()).toBe("1900-01-01T00:00:00.000Z");
    expect(new Date(END_EPOCH_SECONDS * 1000).toISOString()).toBe("2201-01-01T00:00:00.000Z");
    expect(inTimeRange(MIN_EPOCH_SECONDS)).toBe(true);
    expect(inTimeRange(MIN_EPOCH_SECONDS - 1)).toBe(false);
    expect(inTimeRange(END_EPOCH_SECONDS - 1)).toBe(true);
    expect(inTimeRange(END_EPOCH_SECONDS)).toBe(false);
    expect(inTimeRange(NaN)).toBe(false);
    expect(inTimeRange(Infinity)).toBe(false);
  });

  it("names the year of a value far outside what Date can hold", () => {
    expect(utcYearOf(1e15 / 1000)).toBe(33658); // 1e15 ms
    expect(utcYearOf(1e15)).toBeGreaterThan(31_000_000); // 1e15 s
    expect(Number.isNaN(utcYearOf(NaN))).toBe(true);
  });

  it("refuses out-of-range values from every format, and accepts values at the edges", () => {
    const cases: [ConstructorParameters<typeof TimestampParser>[0], string, string][] = [
      ["epoch-s", "1000000000000000", "-2208988800"],
      ["epoch-ms", "1000000000000000", "-2208988800000"],
      ["serial-days", "2958465", "2"], // serial 2 is 1900-01-01 in this conversion (day 25569 = 1970-01-01)
      ["iso", "2201-01-01T00:00:00Z", "1900-01-01T00:00:00Z"],
      ["iso", "1899-12-31T23:59:59Z", "2200-12-31T23:59:59Z"],
      ["ymd", "9999/12/31 00:00", "2200/12/31 00:00"],
      ["dmy", "01/01/1000", "01/01/1900"],
      ["mdy", "12/31/9999", "12/31/2200"],
    ];
    for (const [format, outside, inside] of cases) {
      const p = new TimestampParser(format, "UTC");
      expect(p.parse(outside), `${format} ${outside}`).toBeNaN();
      expect(p.problem).toBe("out-of-range-timestamp");
      expect(Number.isFinite(p.parse(inside)), `${format} ${inside}`).toBe(true);
    }
  });

  it("reads year 0001 as year 1, not 1901 (Date.UTC maps years below 100 to 19xx), then refuses it", () => {
    const p = new TimestampParser("iso", "UTC");
    expect(p.parse("0001-01-01T00:00:00Z")).toBeNaN();
    expect(p.problem).toBe("out-of-range-timestamp");
    expect(utcYearOf(p.lastOutOfRange)).toBe(1);
    const e = ingestFailure("Timestamp,Current\n0001-01-01T00:00:00Z,5\n0001-01-01T00:05:00Z,6\n");
    expect(e.status).toBe(422);
    expect(e.detail).toContain("year 1;");
    expect(e.detail).toContain("1900–2200");
  });
});

describe("CSV ingest refuses out-of-range timestamps with the row named", () => {
  it("the epoch-s file that used to loop forever is a fast 422 naming line 2", () => {
    const started = performance.now();
    const e = ingestFailure("Timestamp,Current\n1000000000000000,100\n1000000000000600,100\n", { timestampFormat: "epoch-s" });
    expect(performance.now() - started).toBeLessThan(5000); // a loop would never return at all
    expect(e.status).toBe(422);
    expect(e.title).toBe("Timestamp out of range");
    expect(e.examples[0]).toMatchObject({ line: 2, text: "1000000000000000,100" });
  });

  it("detected formats are range-checked too (auto reads the same file as epoch-ms, year 33658)", () => {
    const e = ingestFailure("Timestamp,Current\n1000000000000000,100\n1000000000000600,100\n");
    expect(e.status).toBe(422);
    expect(e.detail).toContain("year 33658");
  });

  it("one bad row among good ones stops the file at that row", () => {
    const e = ingestFailure("Timestamp,Current\n2024-01-01 00:00,5\n2024-01-01 00:05,6\n9999-12-31 00:00,7\n");
    expect(e.status).toBe(422);
    expect(e.examples[0].line).toBe(4);
  });

  it("a history spanning more than 50 years is refused with the limit stated", () => {
    const e = ingestFailure("Timestamp,Current\n1950-01-01 00:00,5\n2024-01-01 00:05,6\n");
    expect(e.status).toBe(422);
    expect(e.detail).toContain("limited to 50 years");
    expect(ingestCsvText("Timestamp,Current\n1990-01-01 00:00,5\n2024-01-01 00:05,6\n", map).series.t.length).toBe(2);
  });
});

describe("JSON samples", () => {
  it("1000-01-01 and 9999-12-31 are refused with the sample's path", () => {
    expect(() => ingestSamples([["2024-01-01T00:00:00Z", 1], ["9999-12-31T00:00:00Z", 2]])).toThrow(IngestError);
    try {
      ingestSamples([["1000-01-01T00:00:00Z", 1], ["9999-12-31T00:00:00Z", 2]]);
    } catch (error) {
      expect((error as IngestError).status).toBe(422);
      expect((error as IngestError).path).toBe("samples.0.0");
      expect((error as IngestError).detail).toContain("year 1000");
    }
  });

  it("two in-range samples 60 years apart exceed the period limit", () => {
    try {
      ingestSamples([["1950-01-01T00:00:00Z", 1], ["2010-01-01T00:00:00Z", 2]]);
      throw new Error("expected a refusal");
    } catch (error) {
      expect((error as IngestError).status).toBe(422);
      expect((error as IngestError).detail).toContain("50 years");
    }
  });
});

describe("month bucketing never loops", () => {
  it("NaN, infinite or reversed bounds give no buckets", () => {
    expect(monthBuckets(NaN, 100)).toEqual([]);
    expect(monthBuckets(0, NaN)).toEqual([]);
    expect(monthBuckets(0, Infinity)).toEqual([]);
    expect(monthBuckets(100, 0)).toEqual([]);
  });

  it("a span beyond the accepted years gives no buckets instead of millions", () => {
    expect(monthBuckets(-30e9, 250e9)).toEqual([]);
  });

  it("a quality report over NaN times returns", () => {
    const r = buildQualityReport({ t: Float64Array.from([NaN, NaN]), phases: { A: Float32Array.from([1, 2]) } });
    expect(r.monthlyCoverage).toEqual([]);
  });

  it("months still come out right for an ordinary span", () => {
    const jan = Date.UTC(2024, 0, 15) / 1000;
    const mar = Date.UTC(2024, 2, 2) / 1000;
    expect(monthBuckets(jan, mar).map((b) => b.month)).toEqual(["2024-01", "2024-02", "2024-03"]);
  });
});

describe("a first data row whose current is NaN is data, not the header", () => {
  it("sniffs the real header and reads the row as a not-a-number sample", () => {
    const csv = "Timestamp,Current\n2024-01-01T00:00:00Z,NaN\n2024-01-01T00:05:00Z,100\n2024-01-01T00:10:00Z,101\n";
    expect(sniffCsv(csv, { complete: true }).headerLineIndex).toBe(0);
    const r = ingestCsvText(csv, map);
    expect(r.detected.columns).toEqual(["Timestamp", "Current"]);
    expect(r.quality.rowsRead).toBe(3);
    expect(r.quality.invalid).toEqual({ "not-a-number": 1 });
  });

  it("the same holds for null and #N/A", () => {
    for (const word of ["null", "#N/A"]) {
      const csv = `Timestamp,Current\n2024-01-01T00:00:00Z,${word}\n2024-01-01T00:05:00Z,100\n2024-01-01T00:10:00Z,101\n`;
      expect(sniffCsv(csv, { complete: true }).headerLineIndex, word).toBe(0);
    }
  });
});

describe("the engine bounds the analysed period", () => {
  const t = Float64Array.from([Date.UTC(2024, 0, 1) / 1000, Date.UTC(2024, 0, 2) / 1000]);
  const base = {
    device: { minCurrentA: 10, maxCurrentA: 1000, harvestW: "0.01*I", loadW: 1, standbyW: 0, storageWh: 0, chargeEfficiency: 0.9, selfDischargePctPerDay: 0, initialCharge: 1, lifeYears: 20 },
    schedule: { kind: "always" as const },
    location: { lat: 40, lon: -100 },
    policy: DEFAULT_POLICY,
  };
  const run = (params: Record<string, unknown>) => runStudy({ t, amps: Float64Array.from([100, 100]) }, { ...base, params } as never);

  it("refuses a period start in year 1000 and a 9,000-year period", () => {
    expect(() => run({ periodStart: "1000-01-01T00:00:00Z" })).toThrow(StudyInputError);
    expect(() => run({ periodStart: "1950-01-01T00:00:00Z", periodEnd: "2024-01-02T00:00:00Z" })).toThrow(/50 years/);
  });
});
