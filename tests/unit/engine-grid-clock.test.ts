// The hour × month grid in local clock time (issue 9, docs/computation.md "Hour × month grid"):
// around the daylight-saving changes of Europe/Berlin and America/Chicago, the grid counts the
// hour the clock on the wall shows, not local mean solar time.
import { describe, expect, it } from "vitest";
import { runStudy } from "../../lib/engine/simulate";
import { solarClock, zoneClock } from "../../lib/engine/clock";
import type { Series } from "../../lib/series";

const device = { minCurrentA: 40, maxCurrentA: 2000, harvestW: "0.1 * I", loadW: 1 };

/** The wall-clock hour in `zone` at a UTC second, straight from Intl (the test's own oracle). */
function wallHour(zone: string) {
  const f = new Intl.DateTimeFormat("en-GB", { timeZone: zone, hour: "numeric", hourCycle: "h23" });
  return (t: number) => Number(f.format(t * 1000));
}

/** 5-minute samples over [start, end): 10 A (below the 40 A minimum) while the wall clock shows hour `low`, else 100 A. */
function lowAtLocalHour(zone: string, low: number, start: number, end: number): Series {
  const hourOf = wallHour(zone);
  const n = Math.floor((end - start) / 300) + 1;
  const t = new Float64Array(n);
  const amps = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    t[i] = start + i * 300;
    amps[i] = hourOf(t[i]) === low ? 10 : 100;
  }
  return { t, amps };
}

describe("offsets of a zone over a period", () => {
  it("finds Berlin's 2025 changes to the second: 01:00 UTC on 30 March and 26 October (EU rule, from memory)", () => {
    const clock = zoneClock("Europe/Berlin", Date.UTC(2025, 0, 1) / 1000, Date.UTC(2026, 0, 1) / 1000);
    expect(Array.from(clock.offsets)).toEqual([-Infinity, 3600, Date.UTC(2025, 2, 30, 1) / 1000, 7200, Date.UTC(2025, 9, 26, 1) / 1000, 3600]);
    expect(clock.basis).toContain("Europe/Berlin");
  });

  it("has one offset in a zone without daylight saving, and solar time follows the longitude", () => {
    expect(Array.from(zoneClock("Asia/Kolkata", Date.UTC(2025, 0, 1) / 1000, Date.UTC(2025, 11, 31) / 1000).offsets)).toEqual([-Infinity, 5.5 * 3600]);
    expect(Array.from(solarClock(-90).offsets)).toEqual([-Infinity, -6 * 3600]);
  });
});

describe("the grid counts wall-clock hours", () => {
  for (const [zone, from, to] of [
    ["Europe/Berlin", Date.UTC(2025, 2, 20), Date.UTC(2025, 3, 10)],
    ["Europe/Berlin", Date.UTC(2025, 9, 15), Date.UTC(2025, 10, 5)],
    ["America/Chicago", Date.UTC(2025, 2, 1), Date.UTC(2025, 2, 20)],
    ["America/Chicago", Date.UTC(2025, 10, 1), Date.UTC(2025, 10, 12)],
  ] as const) {
    it(`${zone}, ${new Date(from).toISOString().slice(0, 10)} – ${new Date(to).toISOString().slice(0, 10)}: only the 03:00 row is below the minimum, wholly`, () => {
      const s = lowAtLocalHour(zone, 3, from / 1000, to / 1000);
      const r = runStudy(s, { device, location: { lat: 50, lon: 8 }, schedule: { kind: "always" }, params: { interpolation: "step", timeZone: zone } });
      const grid = r.hourMonthBelowMin.share;
      for (let h = 0; h < 24; h++) {
        for (let m = 0; m < 12; m++) {
          const v = grid[h][m];
          if (v == null) continue;
          if (h === 3) expect(v).toBeCloseTo(1, 9);
          else expect(v).toBeCloseTo(0, 9);
        }
      }
      expect(r.hourMonthBelowMin.timeBasis).toContain(zone);
      // Solar time (longitude 8° E: UTC + 32 min) smears the same load over two rows.
      const solar = runStudy(s, { device, location: { lat: 50, lon: 8 }, schedule: { kind: "always" }, params: { interpolation: "step" } });
      const rowsWithBelow = solar.hourMonthBelowMin.share.filter((row) => row.some((v) => v != null && v > 1e-9)).length;
      expect(rowsWithBelow).toBeGreaterThan(1);
    });
  }

  it("puts the months by the local calendar: 23:30 UTC on 31 January is February in Berlin", () => {
    // Below the minimum only from 23:00 to 23:59 UTC on 31 January (00:00–00:59 on 1 February in Berlin).
    const start = Date.UTC(2025, 0, 31, 12) / 1000;
    const n = 24 * 12;
    const t = new Float64Array(n);
    const amps = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      t[i] = start + i * 300;
      amps[i] = t[i] >= Date.UTC(2025, 0, 31, 23) / 1000 && t[i] < Date.UTC(2025, 1, 1) / 1000 ? 10 : 100;
    }
    const r = runStudy({ t, amps }, { device, location: { lat: 50, lon: 8 }, schedule: { kind: "always" }, params: { interpolation: "step", timeZone: "Europe/Berlin" } });
    expect(r.hourMonthBelowMin.share[0][1]).toBeCloseTo(1, 9); // hour 0, February
    expect(r.hourMonthBelowMin.share[23][0]).toBeCloseTo(0, 9); // hour 23, January
  });

  it("counts the monthly table by the same local calendar (the hour below the minimum is February's in Berlin, January's in UTC)", () => {
    // 5-minute samples from 12:00 UTC on 31 January to 12:00 UTC on 1 February: below the 40 A
    // minimum only from 23:00 to 24:00 UTC on 31 January, which is 00:00–01:00 on 1 February in
    // Berlin (UTC+1 in winter). Always required, step interpolation: the hour is exactly 1 h.
    const start = Date.UTC(2025, 0, 31, 12) / 1000;
    const n = 24 * 12 + 1;
    const t = new Float64Array(n);
    const amps = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      t[i] = start + i * 300;
      amps[i] = t[i] >= Date.UTC(2025, 0, 31, 23) / 1000 && t[i] < Date.UTC(2025, 1, 1) / 1000 ? 10 : 100;
    }
    const run = (timeZone?: string) => runStudy({ t, amps }, { device, location: { lat: 50, lon: 8 }, schedule: { kind: "always" }, params: { interpolation: "step", timeZone } });
    const below = (r: ReturnType<typeof run>) => Object.fromEntries(r.monthly.map((m) => [m.month, m.hoursBelowMin]));
    const berlin = run("Europe/Berlin");
    expect(berlin.monthly.map((m) => m.month)).toEqual(["2025-01", "2025-02"]);
    expect(below(berlin)["2025-01"]).toBeCloseTo(0, 9);
    expect(below(berlin)["2025-02"]).toBeCloseTo(1, 9);
    // Berlin's January in the table ends at 23:00 UTC: 11 h of the 24 h period (12:00–23:00 UTC).
    expect(berlin.monthly[0].totalHours).toBeCloseTo(11, 9);
    const utc = run();
    expect(below(utc)["2025-01"]).toBeCloseTo(1, 9);
    expect(below(utc)["2025-02"]).toBeCloseTo(0, 9);
    expect(utc.monthly[0].totalHours).toBeCloseTo(12, 9);
  });

  it("takes a whole local calendar year as complete and judges on it, with the year's local bounds", () => {
    // Two years and a bit of hourly samples at 100 A (always above the minimum) in New York; the
    // period starts at local midnight of 1 January 2024 (05:00 UTC), so 2024 is complete by the
    // local calendar though it starts after UTC midnight.
    const zone = "America/New_York";
    const start = Date.UTC(2024, 0, 1, 5) / 1000;
    const end = Date.UTC(2026, 0, 10) / 1000;
    const n = Math.floor((end - start) / 3600) + 1;
    const t = Float64Array.from({ length: n }, (_, i) => start + i * 3600);
    const amps = new Float64Array(n).fill(100);
    const r = runStudy({ t, amps }, { device, location: { lat: 40.7, lon: -74 }, schedule: { kind: "always" }, params: { interpolation: "step", timeZone: zone } });
    expect(r.yearly.filter((y) => y.complete).map((y) => y.year)).toEqual([2024, 2025]);
    expect(r.verdict.basis.kind).toBe("worst-complete-year");
    // EST is UTC−5: local midnight of 1 January is 05:00 UTC.
    expect(r.verdict.basis.start).toBe(new Date(Date.UTC(r.verdict.basis.year!, 0, 1, 5)).toISOString());
    expect(r.verdict.basis.end).toBe(new Date(Date.UTC(r.verdict.basis.year! + 1, 0, 1, 5)).toISOString());
  });
});
