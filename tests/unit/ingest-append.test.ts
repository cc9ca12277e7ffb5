// Appending a newer export (lib/ingest/append.ts): the newer upload wins over its whole time span.
import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { addCounts, mergeNewerWins } from "../../lib/ingest/append";
import type { ProfileSeries } from "../../lib/series";

const series = (t: number[], a: number[], b?: number[]): ProfileSeries => ({
  t: Float64Array.from(t),
  phases: { A: Float32Array.from(a), ...(b ? { B: Float32Array.from(b) } : {}) },
});

describe("newer upload wins over its time span", () => {
  it("replaces the stored samples inside the new span and keeps those outside", () => {
    const stored = series([0, 60, 120, 180, 240, 300], [1, 2, 3, 4, 5, 6], [11, 12, 13, 14, 15, 16]);
    // New file from 90 s to 250 s at another interval: stored 120, 180, 240 are replaced.
    const incoming = series([90, 150, 250], [20, 30, 40], [21, 31, 41]);
    const m = mergeNewerWins(stored, incoming);
    expect(Array.from(m.series.t)).toEqual([0, 60, 90, 150, 250, 300]);
    expect(Array.from(m.series.phases.A!)).toEqual([1, 2, 20, 30, 40, 6]);
    expect(Array.from(m.series.phases.B!)).toEqual([11, 12, 21, 31, 41, 16]);
    expect(m).toMatchObject({ replaced: 3, added: 3 });
  });

  it("appends after the end (the usual month-by-month case) and prepends before the start", () => {
    const stored = series([0, 60, 120], [1, 2, 3]);
    expect(Array.from(mergeNewerWins(stored, series([180, 240], [4, 5])).series.t)).toEqual([0, 60, 120, 180, 240]);
    expect(Array.from(mergeNewerWins(stored, series([-120, -60], [7, 8])).series.phases.A!)).toEqual([7, 8, 1, 2, 3]);
  });

  it("a stored sample at exactly the new file's first or last time is replaced", () => {
    const m = mergeNewerWins(series([0, 60, 120], [1, 2, 3]), series([60, 120], [9, 9]));
    expect(Array.from(m.series.phases.A!)).toEqual([1, 9, 9]);
    expect(m.replaced).toBe(2);
  });

  it("property: sorted, unique, every new sample kept, old ones only outside the new span", () => {
    const times = fc.uniqueArray(fc.integer({ min: 0, max: 10_000 }), { minLength: 1, maxLength: 60 }).map((a) => a.sort((x, y) => x - y));
    fc.assert(
      fc.property(times, times, (old, neu) => {
        const m = mergeNewerWins(series(old, old.map((x) => x + 0.5)), series(neu, neu.map((x) => -x)));
        const t = Array.from(m.series.t);
        for (let i = 1; i < t.length; i++) expect(t[i]).toBeGreaterThan(t[i - 1]);
        for (const x of neu) expect(m.series.phases.A![t.indexOf(x)]).toBe(-x);
        const kept = old.filter((x) => x < neu[0] || x > neu[neu.length - 1]);
        expect(t.length).toBe(kept.length + neu.length);
        expect(m.replaced).toBe(old.length - kept.length);
      }),
    );
  });
});

describe("combined counts", () => {
  it("adds rows read, invalid by reason and per phase", () => {
    const c = addCounts(
      { rowsRead: 100, invalid: { missing: 2 }, duplicates: 1, outOfOrder: 0, perPhaseInvalid: { A: { missing: 2 } } },
      { rowsRead: 50, invalid: { missing: 1, negative: 3 }, duplicates: 0, outOfOrder: 4, perPhaseInvalid: { A: { negative: 3 }, B: { missing: 1 } } },
    );
    expect(c).toEqual({ rowsRead: 150, invalid: { missing: 3, negative: 3 }, duplicates: 1, outOfOrder: 4, perPhaseInvalid: { A: { missing: 2, negative: 3 }, B: { missing: 1 } } });
  });
});
