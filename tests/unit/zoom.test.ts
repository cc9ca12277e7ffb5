import { describe, expect, it } from "vitest";
import { chartBuckets, monthRanges, zoomRange, zoomSteps } from "../../shared/zoom";
import { formatLocal, startOfLocalDay } from "../../shared/zoned-time";

const s = (iso: string) => Date.parse(iso) / 1000;

describe("chart zoom", () => {
  it("lists the UTC months a period touches, across a year end", () => {
    const months = monthRanges("2024-11-15T06:00:00.000Z", "2025-01-02T00:00:00.000Z");
    expect(months.map((m) => m.label)).toEqual(["2024-11", "2024-12", "2025-01"]);
    expect(months[1]).toEqual({ label: "2024-12", from: "2024-12-01T00:00:00.000Z", to: "2025-01-01T00:00:00.000Z" });
  });

  it("lists local months in the circuit's zone: Chicago's December starts at 06:00 UTC (UTC−6 in winter)", () => {
    const months = monthRanges("2024-12-01T03:00:00.000Z", "2025-01-02T00:00:00.000Z", "America/Chicago");
    // 03:00 UTC on 1 December is still 30 November in Chicago.
    expect(months.map((m) => m.label)).toEqual(["2024-11", "2024-12", "2025-01"]);
    expect(months[1]).toEqual({ label: "2024-12", from: "2024-12-01T06:00:00.000Z", to: "2025-01-01T06:00:00.000Z" });
  });

  it("clamps a requested range to the period and ignores a bad one", () => {
    const whole = { start: 1000, end: 5000 };
    expect(zoomRange(whole, { from: new Date(0).toISOString(), to: new Date(3_000_000).toISOString() })).toEqual({ start: 1000, end: 3000 });
    expect(zoomRange(whole, { from: "not a date", to: new Date(2_000_000).toISOString() })).toBe(whole);
    expect(zoomRange(whole, { from: new Date(4_000_000).toISOString(), to: new Date(2_000_000).toISOString() })).toBe(whole);
    expect(zoomRange(whole, {})).toBe(whole);
  });

  it("reads local dates (to inclusive) and months in the zone, across Berlin's spring change", () => {
    const whole = { start: s("2025-01-01T00:00:00Z"), end: s("2026-01-01T00:00:00Z") };
    // 30 March 2025 in Berlin is 23 hours long: 29 Mar 23:00 UTC to 30 Mar 22:00 UTC.
    expect(zoomRange(whole, { from: "2025-03-30", to: "2025-03-30" }, "Europe/Berlin")).toEqual({ start: s("2025-03-29T23:00:00Z"), end: s("2025-03-30T22:00:00Z") });
    // A week: seven local days.
    expect(zoomRange(whole, { from: "2025-06-02", to: "2025-06-08" }, "Europe/Berlin")).toEqual({ start: s("2025-06-01T22:00:00Z"), end: s("2025-06-08T22:00:00Z") });
    expect(zoomRange(whole, { month: "2025-03" }, "Europe/Berlin")).toEqual({ start: s("2025-02-28T23:00:00Z"), end: s("2025-03-31T22:00:00Z") });
    expect(zoomRange(whole, { month: "2025-13" }, "Europe/Berlin")).toBe(whole);
  });

  it("offers the day, the week and steps of the same length from the range on show", () => {
    const whole = { start: s("2025-01-01T06:00:00Z"), end: s("2025-12-31T06:00:00Z") };
    const week = zoomRange(whole, { from: "2025-03-10", to: "2025-03-16" }, "America/Chicago");
    const steps = zoomSteps(week, whole, "America/Chicago");
    expect(steps.day).toEqual({ from: "2025-03-10", to: "2025-03-10" });
    expect(steps.week).toEqual({ from: "2025-03-10", to: "2025-03-16" });
    expect(steps.previous).toEqual({ from: "2025-03-03", to: "2025-03-09" });
    expect(steps.next).toEqual({ from: "2025-03-17", to: "2025-03-23" });
    expect(zoomSteps(whole, whole, "America/Chicago").previous).toBeNull();
  });
});

describe("chart buckets", () => {
  it("never cuts buckets finer than the samples: a week of hourly samples gets 168, a year of minutes 600", () => {
    expect(chartBuckets({ start: 0, end: 7 * 86_400 }, 3600)).toBe(168);
    expect(chartBuckets({ start: 0, end: 365 * 86_400 }, 60)).toBe(600);
    expect(chartBuckets({ start: 0, end: 3600 }, 3600)).toBe(2);
  });
});

describe("local times on pages", () => {
  it("shows the wall clock with its offset, daylight saving included [offsets of the US and EU rules, from memory]", () => {
    expect(formatLocal("2025-01-15T12:00:00Z", "America/Chicago")).toBe("2025-01-15 06:00 UTC−6");
    expect(formatLocal("2025-07-15T12:00:00Z", "America/Chicago")).toBe("2025-07-15 07:00 UTC−5");
    expect(formatLocal("2025-07-15T12:00:00Z", "Asia/Kolkata")).toBe("2025-07-15 17:30 UTC+5:30");
    expect(formatLocal("2025-07-15T12:00:00Z", "UTC")).toBe("2025-07-15 12:00 UTC");
  });

  it("finds the start of a local day, also when midnight is skipped (Santiago's spring change, 7 September 2025, from memory)", () => {
    expect(new Date(startOfLocalDay("2025-03-09", "America/Chicago")).toISOString()).toBe("2025-03-09T06:00:00.000Z");
    expect(new Date(startOfLocalDay("2025-03-10", "America/Chicago")).toISOString()).toBe("2025-03-10T05:00:00.000Z");
    // Clocks go from 00:00 to 01:00 in Santiago: the day begins at 01:00 local (UTC−3) = 04:00 UTC.
    expect(new Date(startOfLocalDay("2025-09-07", "America/Santiago")).toISOString()).toBe("2025-09-07T04:00:00.000Z");
  });
});
