import { describe, expect, it } from "vitest";
import { detectTimestampFormat, TimestampParser, ZoneResolver } from "../../lib/ingest/timestamps";

// 2024-01-01T00:00:00Z in epoch seconds: 19,723 days × 86,400 s.
const NEW_YEAR_2024 = 19723 * 86400;

describe("timestamp formats", () => {
  it("reads ISO 8601 with T or space, seconds optional, fractions, Z and offsets", () => {
    const p = new TimestampParser("iso", "UTC");
    expect(p.parse("2024-01-01T00:00:00Z")).toBe(NEW_YEAR_2024);
    expect(p.parse("2024-01-01 00:00:00")).toBe(NEW_YEAR_2024);
    expect(p.parse("2024-01-01 00:00")).toBe(NEW_YEAR_2024);
    expect(p.parse("2024-01-01")).toBe(NEW_YEAR_2024);
    expect(p.parse("2024-01-01T00:00:00.250Z")).toBe(NEW_YEAR_2024 + 0.25);
    expect(p.parse("2024-01-01T02:00:00+02:00")).toBe(NEW_YEAR_2024);
    expect(p.parse("2023-12-31T19:30:00-0430")).toBe(NEW_YEAR_2024);
    expect(p.parse("2024-01-01 00:00:00 UTC")).toBe(NEW_YEAR_2024);
  });

  it("reads year-first dates with slashes or dots (ymd)", () => {
    const p = new TimestampParser("ymd", "UTC");
    expect(p.parse("2024/01/01 00:00")).toBe(NEW_YEAR_2024);
    expect(p.parse("2024.1.1 0:00:00")).toBe(NEW_YEAR_2024);
  });

  it("reads day-first and month-first dates, 12-hour clocks and two-digit years", () => {
    const dmy = new TimestampParser("dmy", "UTC");
    const mdy = new TimestampParser("mdy", "UTC");
    const march10 = NEW_YEAR_2024 + (31 + 29 + 9) * 86400;
    expect(dmy.parse("10/03/2024 00:00")).toBe(march10);
    expect(dmy.parse("10.03.2024")).toBe(march10);
    expect(mdy.parse("3/10/2024 12:00:00 AM")).toBe(march10);
    expect(mdy.parse("3/10/2024 2:15 PM")).toBe(march10 + 14 * 3600 + 15 * 60);
    expect(mdy.parse("3/10/24 12:00 PM")).toBe(march10 + 12 * 3600);
    expect(mdy.parse("3/10/2024, 2:15:00 AM")).toBe(march10 + 2 * 3600 + 15 * 60);
  });

  it("reads epoch seconds, epoch milliseconds and spreadsheet serial days", () => {
    expect(new TimestampParser("epoch-s").parse("1704067200")).toBe(NEW_YEAR_2024);
    expect(new TimestampParser("epoch-s").parse("1704067200.5")).toBe(NEW_YEAR_2024 + 0.5);
    expect(new TimestampParser("epoch-ms").parse("1704067200250")).toBe(NEW_YEAR_2024 + 0.25);
    const serial = new TimestampParser("serial-days");
    // 1900 date system: serial 25569 is 1970-01-01, so 2024-01-01 is 25569 + 19723.
    expect(serial.parse("25569")).toBe(0);
    expect(serial.parse("45292")).toBe(NEW_YEAR_2024);
    expect(serial.parse("45292.75")).toBe(NEW_YEAR_2024 + 18 * 3600);
  });

  it("serial days are wall-clock times in the chosen zone; epochs are absolute", () => {
    expect(new TimestampParser("serial-days", "America/Chicago").parse("45292")).toBe(NEW_YEAR_2024 + 6 * 3600);
    expect(new TimestampParser("epoch-s", "America/Chicago").parse("1704067200")).toBe(NEW_YEAR_2024);
  });

  it("rejects impossible dates and garbage with the reason bad-timestamp", () => {
    const p = new TimestampParser("iso", "UTC");
    for (const bad of ["2023-02-29", "2024-13-01", "2024-01-32", "2024-01-01 24:00", "2024-01-01 10:60", "yesterday", "", "2024-01-01T00:00:00Zjunk"]) {
      expect(p.parse(bad), bad).toBeNaN();
      expect(p.problem).toBe("bad-timestamp");
    }
    expect(new TimestampParser("epoch-s").parse("12abc")).toBeNaN();
    expect(new TimestampParser("mdy").parse("13/01/2024")).toBeNaN();
  });
});

describe("time zones", () => {
  it("applies the zone to local times and lets an explicit offset win", () => {
    const berlin = new TimestampParser("iso", "Europe/Berlin");
    expect(berlin.parse("2024-01-01 01:00")).toBe(NEW_YEAR_2024); // CET = UTC+1
    expect(berlin.parse("2024-07-01 02:00")).toBe(NEW_YEAR_2024 + 182 * 86400); // CEST = UTC+2
    expect(berlin.parse("2024-01-01T00:00:00Z")).toBe(NEW_YEAR_2024);
    expect(berlin.parse("2024-01-01T05:30:00+05:30")).toBe(NEW_YEAR_2024);
    expect(new TimestampParser("iso", "Asia/Kolkata").parse("2024-01-01 05:30")).toBe(NEW_YEAR_2024);
  });

  // US daylight saving 2024: 10 March has 23 hours (92 rows at 15 min), 3 November has
  // 25 hours (100 rows). [published: Energy Policy Act of 2005, §110]
  const quarterHours = (from: number, to: number) => {
    const out: string[] = [];
    for (let h = from; h < to; h++) for (const m of ["00", "15", "30", "45"]) out.push(`${String(h).padStart(2, "0")}:${m}`);
    return out;
  };

  it("America/Chicago, 10 March 2024: 02:00–02:59 does not exist; the day has 23 hours, 92 rows", () => {
    const p = new TimestampParser("iso", "America/Chicago");
    const times: number[] = [];
    let nonexistent = 0;
    for (const hm of quarterHours(0, 24)) {
      const t = p.parse(`2024-03-10 ${hm}`);
      if (Number.isNaN(t)) {
        expect(p.problem).toBe("nonexistent-local-time");
        nonexistent++;
      } else times.push(t);
    }
    times.push(p.parse("2024-03-11 00:00"));
    expect(nonexistent).toBe(4);
    expect(times.length - 1).toBe(92);
    expect((times[times.length - 1] - times[0]) / 3600).toBe(23);
    for (let i = 1; i < times.length; i++) expect(times[i] - times[i - 1]).toBe(900);
  });

  it("America/Chicago, 3 November 2024: the repeated 01:00 hour is placed by file order; 25 hours, 100 rows", () => {
    const p = new TimestampParser("iso", "America/Chicago");
    const wallClock = [...quarterHours(0, 2), ...quarterHours(1, 24)]; // 01:00–01:45 twice
    expect(wallClock).toHaveLength(100);
    const times = wallClock.map((hm) => p.parse(`2024-11-03 ${hm}`));
    times.push(p.parse("2024-11-04 00:00"));
    expect(times.every((t) => !Number.isNaN(t))).toBe(true);
    expect((times[100] - times[0]) / 3600).toBe(25);
    for (let i = 1; i < times.length; i++) expect(times[i] - times[i - 1]).toBe(900);
    // First pass is CDT (UTC−5), second pass CST (UTC−6).
    expect(new Date(times[4] * 1000).toISOString()).toBe("2024-11-03T06:00:00.000Z");
    expect(new Date(times[8] * 1000).toISOString()).toBe("2024-11-03T07:00:00.000Z");
    expect(p.ambiguousLocalTimes).toBe(8);
  });

  it("hourly data through a fold: an unchanged local time is the second pass", () => {
    const p = new TimestampParser("iso", "America/Chicago");
    const times = ["00:00", "01:00", "01:00", "02:00"].map((hm) => p.parse(`2024-11-03 ${hm}`));
    expect(times.slice(1).map((t, i) => t - times[i])).toEqual([3600, 3600, 3600]);
  });

  it("handles half-hour shifts (Australia/Lord_Howe) without hand-written rules", () => {
    const p = new TimestampParser("iso", "Australia/Lord_Howe");
    expect(p.parse("2024-10-06 02:15")).toBeNaN(); // 02:00–02:29 skipped
    expect(p.problem).toBe("nonexistent-local-time");
    const before = p.parse("2024-10-06 01:59");
    const after = p.parse("2024-10-06 02:30");
    expect(after - before).toBe(60);
  });

  it("ZoneResolver.offsetAt agrees with known offsets", () => {
    const chicago = new ZoneResolver("America/Chicago");
    expect(chicago.offsetAt(NEW_YEAR_2024)).toBe(-6 * 3600);
    expect(chicago.offsetAt(NEW_YEAR_2024 + 182 * 86400)).toBe(-5 * 3600);
  });
});

describe("format detection", () => {
  it("recognises each format from sample values", () => {
    expect(detectTimestampFormat(["2024-01-01T00:00:00Z"]).format).toBe("iso");
    expect(detectTimestampFormat(["2024/01/01 00:00"]).format).toBe("ymd");
    expect(detectTimestampFormat(["1704067200", "1704067260"]).format).toBe("epoch-s");
    expect(detectTimestampFormat(["1704067200000"]).format).toBe("epoch-ms");
    expect(detectTimestampFormat(["45292.0104166667"]).format).toBe("serial-days");
    expect(detectTimestampFormat(["hello", "world"]).format).toBeNull();
  });

  it("a first field above 12 means day first; a second field above 12 means month first", () => {
    expect(detectTimestampFormat(["01/02/2024 00:00", "13/02/2024 00:00"])).toMatchObject({ format: "dmy", dayMonthAmbiguous: false });
    expect(detectTimestampFormat(["02/01/2024 00:00", "02/13/2024 00:00"])).toMatchObject({ format: "mdy", dayMonthAmbiguous: false });
  });

  it("dates that fit both orders are flagged ambiguous, not guessed silently", () => {
    expect(detectTimestampFormat(["01/02/2024 00:00", "02/02/2024 00:00", "12/11/2024 00:00"]).dayMonthAmbiguous).toBe(true);
  });
});
