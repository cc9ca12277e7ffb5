import { describe, expect, it } from "vitest";
import { monthRanges, zoomRange } from "../../shared/zoom";

describe("chart zoom", () => {
  it("lists the UTC months a period touches, across a year end", () => {
    const months = monthRanges("2024-11-15T06:00:00.000Z", "2025-01-02T00:00:00.000Z");
    expect(months.map((m) => m.label)).toEqual(["2024-11", "2024-12", "2025-01"]);
    expect(months[1]).toEqual({ label: "2024-12", from: "2024-12-01T00:00:00.000Z", to: "2025-01-01T00:00:00.000Z" });
  });

  it("clamps a requested range to the period and ignores a bad one", () => {
    const whole = { start: 1000, end: 5000 };
    expect(zoomRange(whole, { from: new Date(0).toISOString(), to: new Date(3_000_000).toISOString() })).toEqual({ start: 1000, end: 3000 });
    expect(zoomRange(whole, { from: "not a date", to: new Date(2_000_000).toISOString() })).toBe(whole);
    expect(zoomRange(whole, { from: new Date(4_000_000).toISOString(), to: new Date(2_000_000).toISOString() })).toBe(whole);
    expect(zoomRange(whole, {})).toBe(whole);
  });
});
