// The night-by-night calendar (lib/engine/nights.ts): binning by hand, the status rule, and the
// calendar of real engine runs adding up to the study's own totals.
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import type { Series } from "../../lib/series";
import { runStudy } from "../../lib/engine/simulate";
import { intersectIntervals, knownIntervals, nightCalendar, nightsOf, nightStatus, secondsPerDay } from "../../lib/engine/nights";

const HOUR = 3600;
const DAY = 86_400;
const T0 = Date.UTC(2025, 0, 6) / 1000; // 00:00 UTC

function series(n: number, stepSeconds: number, amps: (t: number) => number): Series {
  const t = new Float64Array(n);
  const a = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    t[i] = T0 + i * stepSeconds;
    a[i] = amps(t[i] - T0);
  }
  return { t, amps: a };
}

describe("interval helpers", () => {
  it("splits an interval across day bins (by hand: 20:00 to 04:00 next day from a midnight origin)", () => {
    const bins = secondsPerDay([T0 + 20 * HOUR, T0 + DAY + 4 * HOUR], T0, 3);
    expect(Array.from(bins)).toEqual([4 * HOUR, 4 * HOUR, 0]);
  });

  it("drops time before the first and after the last bin", () => {
    expect(Array.from(secondsPerDay([T0 - HOUR, T0 + HOUR, T0 + 2 * DAY - HOUR, T0 + 3 * DAY], T0, 2))).toEqual([HOUR, HOUR]);
  });

  it("takes sample intervals up to the maximum gap as known, merged and clipped", () => {
    // Samples at 0, 10, 20 min, then a 2 h gap, then 140, 150 min; gap limit 15 min.
    const t = [0, 600, 1200, 8400, 9000].map((s) => T0 + s);
    expect(knownIntervals(t, 900, T0 + 300, T0 + 8700)).toEqual([T0 + 300, T0 + 1200, T0 + 8400, T0 + 8700]);
  });

  it("intersects interval lists", () => {
    expect(intersectIntervals([0, 10, 20, 30], [5, 25])).toEqual([5, 10, 20, 25]);
    expect(intersectIntervals([0, 10], [10, 20])).toEqual([]);
  });

  it("bins keep every second of intervals inside the range (property)", () => {
    fc.assert(
      fc.property(fc.array(fc.integer({ min: 1, max: 3 * DAY }), { minLength: 2, maxLength: 20 }), (cuts) => {
        const sorted = [...new Set(cuts)].sort((a, b) => a - b);
        const pairs = sorted.slice(0, sorted.length - (sorted.length % 2)).map((x) => T0 + x);
        const total = pairs.reduce((sum, x, i) => sum + (i % 2 ? x : -x), 0);
        const bins = secondsPerDay(pairs, T0, 4);
        expect(bins.reduce((a, b) => a + b, 0)).toBe(total);
      }),
    );
  });
});

describe("night status", () => {
  it.each([
    [0, 0, 0, "none"],
    [600, 0, 0, "lit"],
    [600, 0, 100, "lit"],
    [600, 0, 300, "unknown"],
    [600, 30, 0, "partly"],
    [600, 600, 0, "dark"],
    [600, 500, 100, "dark"],
    [600, 400, 100, "partly"],
  ] as const)("required %d min, dark %d, unknown %d → %s", (required, dark, unknown, status) => {
    expect(nightStatus(required, dark, unknown)).toBe(status);
  });
});

describe("calendar of a study", () => {
  it("dates nights by the evening in local solar time and splits at local noon", () => {
    // Longitude 90° W: solar noon is 18:00 UTC. A dark stretch 17:00–19:00 UTC on 6 January falls
    // one hour in the night of the 5th and one in the night of the 6th.
    const offset = -6 * HOUR;
    const cal = nightCalendar({
      periodStart: T0,
      periodEnd: T0 + 2 * DAY,
      solarOffsetSeconds: offset,
      windows: [T0, T0 + 2 * DAY],
      t: [T0, T0 + 2 * DAY],
      maxGapSeconds: 3 * DAY,
      stretches: [T0 + 17 * HOUR, T0 + 19 * HOUR],
    });
    expect(cal.first).toBe("2025-01-05");
    expect(cal.darkMinutes).toEqual([60, 60, 0]);
    expect(cal.requiredMinutes).toEqual([18 * 60, 24 * 60, 6 * 60]);
    const nights = nightsOf(cal, offset);
    expect(nights.map((n) => n.date)).toEqual(["2025-01-05", "2025-01-06", "2025-01-07"]);
    expect(nights[1].start).toBe("2025-01-06T18:00:00.000Z");
    expect(nights.map((n) => n.status)).toEqual(["partly", "partly", "lit"]);
  });

  it("adds up to the study's required, dark and unknown hours (night schedule, gaps, storage)", () => {
    // 20 days, 10-minute samples; the current dips below the minimum for 3 h every 4th night and
    // the data stop for a day in the middle (the gap is beyond 3 × the sampling interval).
    const days = 20;
    const s = series(days * 144 + 1, 600, (t) => (Math.floor(t / DAY) % 4 === 0 && t % DAY < 3 * HOUR ? 10 : 200));
    const keep = Array.from(s.t, (t) => t < T0 + 9 * DAY || t >= T0 + 10 * DAY);
    const gappy = { t: s.t.filter((_, i) => keep[i]), amps: s.amps.filter((_, i) => keep[i]) };
    const r = runStudy(gappy, {
      device: { minCurrentA: 50, maxCurrentA: 2000, harvestW: "0.1 * I", loadW: 4, storageWh: 2 },
      schedule: { kind: "night", sunAltitudeDeg: -0.833 },
      location: { lat: 40, lon: -90 },
    });
    const cal = r.nights!;
    const sum = (xs: number[]) => xs.reduce((a, b) => a + b, 0);
    expect(sum(cal.requiredMinutes) / 60).toBeCloseTo(r.lighting.requiredHours, 1);
    expect(sum(cal.darkMinutes) / 60).toBeCloseTo(r.lighting.darkHours, 1);
    expect(sum(cal.unknownMinutes) / 60).toBeCloseTo(r.lighting.requiredHours - r.lighting.requiredKnownHours, 1);
    const statuses = nightsOf(cal, -6 * HOUR).map((n) => n.status);
    expect(statuses).toContain("unknown");
    expect(statuses).toContain("lit");
    expect(statuses.some((x) => x === "partly" || x === "dark")).toBe(true);
  });
});
