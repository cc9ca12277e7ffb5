// When the light is required: night windows from the sun's geometric altitude (docs/computation.md
// "Required-on schedule"), computed with suncalc (Meeus-family solar position, as NOAA uses).
import { getPosition, getTimes, times as sunTimeRows } from "suncalc";
import type { Schedule } from "../../shared/study-schemas";

const DAY_S = 86_400;
const RAD = Math.PI / 180;

/**
 * Required windows within [startSec, endSec] as a flat array [start0, end0, start1, end1, …]
 * of epoch seconds, ascending, non-overlapping, adjacent windows merged.
 */
export function requiredWindows(schedule: Schedule, lat: number, lon: number, startSec: number, endSec: number): Float64Array {
  if (!(endSec > startSec)) return new Float64Array(0);
  if (schedule.kind === "always") return Float64Array.of(startSec, endSec);
  const light = daylightIntervals(schedule.sunAltitudeDeg, lat, lon, startSec - 2 * DAY_S, endSec + 2 * DAY_S);
  // Night = the complement of daylight, clipped to the period.
  const out: number[] = [];
  let cursor = startSec;
  for (let k = 0; k < light.length; k += 2) {
    const a = light[k];
    const b = light[k + 1];
    if (b <= cursor) continue;
    if (a >= endSec) break;
    if (a > cursor) out.push(cursor, a);
    cursor = Math.max(cursor, b);
  }
  if (cursor < endSec) out.push(cursor, endSec);
  return Float64Array.from(out);
}

/**
 * Daylight (sun's centre above `altitudeDeg`) as merged [rise, set] pairs in epoch seconds.
 * One suncalc getTimes call per solar day. Where the sun neither rises nor sets through the
 * altitude that day, the sun's geometric altitude at solar noon decides: above → daylight for the
 * whole solar day (midpoint to midpoint between neighbouring solar noons, so polar days join
 * without gaps), below → none (polar night).
 */
export function daylightIntervals(altitudeDeg: number, lat: number, lon: number, fromSec: number, toSec: number): Float64Array {
  const firstDay = Math.floor(fromSec / DAY_S) * DAY_S + DAY_S / 2;
  const days = Math.ceil((toSec + DAY_S - firstDay) / DAY_S) + 1;
  const noon = new Float64Array(days);
  const rise = new Float64Array(days);
  const set = new Float64Array(days);
  const polar = new Int8Array(days); // 0 rises and sets, 1 polar day, −1 polar night
  withOnlySunTimeRow(altitudeDeg, () => {
    for (let k = 0; k < days; k++) {
      const t = getTimes(new Date((firstDay + k * DAY_S) * 1000), lat, lon);
      noon[k] = t.solarNoon.getTime() / 1000;
      const r = t[RISE];
      const s = t[SET];
      if (r instanceof Date && s instanceof Date) {
        rise[k] = r.getTime() / 1000;
        set[k] = s.getTime() / 1000;
      } else {
        polar[k] = geometricAltitudeDeg(t.solarNoon, lat, lon) > altitudeDeg ? 1 : -1;
      }
    }
  });
  const merged: number[] = [];
  const add = (a: number, b: number) => {
    if (merged.length && a <= merged[merged.length - 1]) merged[merged.length - 1] = Math.max(merged[merged.length - 1], b);
    else merged.push(a, b);
  };
  for (let k = 0; k < days; k++) {
    if (polar[k] === 0) add(rise[k], set[k]);
    else if (polar[k] === 1) {
      const before = k > 0 ? (noon[k - 1] + noon[k]) / 2 : noon[k] - DAY_S / 2;
      const after = k + 1 < days ? (noon[k] + noon[k + 1]) / 2 : noon[k] + DAY_S / 2;
      add(before, after);
    }
  }
  return Float64Array.from(merged);
}

const RISE = "dusklineRise";
const SET = "dusklineSet";

// suncalc solves rise and set for every row of its exported `times` table on each call. For one
// synchronous computation the table holds only the altitude wanted (7× faster), then it is
// restored as it was, so no other caller sees the change.
function withOnlySunTimeRow(altitudeDeg: number, run: () => void): void {
  const saved = sunTimeRows.splice(0, sunTimeRows.length);
  sunTimeRows.push([altitudeDeg, RISE, SET]);
  try {
    run();
  } finally {
    sunTimeRows.splice(0, sunTimeRows.length, ...saved);
  }
}

/**
 * Geometric altitude of the sun's centre in degrees. suncalc's getPosition returns the apparent
 * altitude with Meeus 16.4 refraction (R = 1.02′ / tan(h + 10.26/(h + 5.10)), held at its h = 0
 * value below the horizon); undo that here so the comparison matches the rise/set altitude rows,
 * which are geometric.
 */
export function geometricAltitudeDeg(date: Date, lat: number, lon: number): number {
  const apparent = getPosition(date, lat, lon).altitude;
  const atHorizon = refractionDeg(0);
  if (apparent <= atHorizon) return apparent - atHorizon;
  let h = apparent - atHorizon;
  for (let i = 0; i < 20; i++) {
    const next = apparent - refractionDeg(h);
    if (Math.abs(next - h) < 1e-10) return next;
    h = next;
  }
  return h;
}

function refractionDeg(geometricDeg: number): number {
  const h = Math.max(geometricDeg, 0);
  return 1.02 / 60 / Math.tan((h + 10.26 / (h + 5.1)) * RAD);
}
