// The chart's buckets packed for the page (shared/packed-timeline.ts) come back as they were:
// same times to the millisecond, currents to 0.01 A, empty buckets empty.
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import type { ChartData } from "../../lib/engine/timeline";
import { packTimeline, unpackTimeline } from "../../shared/packed-timeline";

function chart(startSec: number, bucketSeconds: number, values: (readonly [number, number] | null)[]): ChartData {
  const iso = (sec: number) => new Date(sec * 1000).toISOString();
  return {
    start: iso(startSec),
    end: iso(startSec + values.length * bucketSeconds),
    bucketSeconds,
    points: values.map((v, k) => ({ t: iso(startSec + k * bucketSeconds), minA: v ? v[0] : null, maxA: v ? v[1] : null })),
    unknown: [],
    required: [],
  };
}

describe("packed timeline", () => {
  it("a hand-made case: two hours of 15-minute buckets with one empty", () => {
    const c = chart(1_704_067_200, 900, [[10, 30], [12.345, 12.355], null, [0, 645.5]]);
    const packed = packTimeline(c);
    expect(packed.minA).toBe("10,12.35,,0");
    expect(packed.maxA).toBe("30,12.36,,645.5");
    expect(unpackTimeline(packed)).toEqual([
      { t: Date.parse("2024-01-01T00:00:00Z"), minA: 10, maxA: 30 },
      { t: Date.parse("2024-01-01T00:15:00Z"), minA: 12.35, maxA: 12.36 },
      { t: Date.parse("2024-01-01T00:30:00Z"), minA: null, maxA: null },
      { t: Date.parse("2024-01-01T00:45:00Z"), minA: 0, maxA: 645.5 },
    ]);
    expect(unpackTimeline(packTimeline(chart(1_704_067_200, 900, [])))).toEqual([]);
    expect(unpackTimeline(packTimeline(chart(1_704_067_200, 900, [null])))).toEqual([{ t: Date.parse("2024-01-01T00:00:00Z"), minA: null, maxA: null }]);
  });

  it("round-trips any buckets: the same times as the ISO times, currents within 0.005 A", () => {
    const bucket = fc.option(fc.tuple(fc.double({ min: 0, max: 5000, noNaN: true }), fc.double({ min: 0, max: 5000, noNaN: true })), { nil: null });
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 4_000_000_000 }), fc.double({ min: 0.5, max: 86_400 * 30, noNaN: true }), fc.array(bucket, { maxLength: 60 }), (start, step, values) => {
        const c = chart(start, step, values);
        const back = unpackTimeline(packTimeline(c));
        expect(back).toHaveLength(c.points.length);
        back.forEach((p, k) => {
          expect(Math.abs(p.t - Date.parse(c.points[k].t))).toBeLessThanOrEqual(1);
          const v = values[k];
          if (v === null) expect(p).toMatchObject({ minA: null, maxA: null });
          else {
            expect(Math.abs(p.minA! - v[0])).toBeLessThanOrEqual(0.005 + 1e-9);
            expect(Math.abs(p.maxA! - v[1])).toBeLessThanOrEqual(0.005 + 1e-9);
          }
        });
      }),
    );
  });
});
