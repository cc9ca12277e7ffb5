// The clock of the hour × month grid (docs/computation.md "Hour × month grid"): local clock time
// in the circuit's IANA time zone, daylight saving included, or — when no zone is given (the
// stateless API without `timeZone`, studies saved before zones) — local mean solar time from
// the longitude. Zone offsets come from Intl through the ingest's ZoneResolver; this module
// only finds where they change inside the period.
import { zoneResolver } from "../ingest/timestamps";

const DAY_S = 86_400;

export interface GridClock {
  /** [t0, offset0, t1, offset1, …]: from UTC second t_k on, local = UTC + offset_k (seconds). t0 = −∞. */
  offsets: Float64Array;
  /** The clock in words, for the page. */
  basis: string;
}

const signed = (hours: number) => `${hours >= 0 ? "+" : "−"} ${Math.abs(hours).toFixed(2)} h`;

/** Local mean solar time: UTC + longitude / 15 h all year. */
export function solarClock(lonDeg: number): GridClock {
  return {
    offsets: Float64Array.of(-Infinity, lonDeg * 240),
    basis: `Local mean solar time (UTC ${signed(lonDeg / 15)}, from longitude ${lonDeg}°); months by the same clock`,
  };
}

/**
 * Local clock time in `zone` over [start, end] (epoch seconds): the offset at the start, then each
 * change, found day by day and then to the second by bisection (the tz database never changes a
 * zone's offset twice within a day).
 */
export function zoneClock(zone: string, start: number, end: number): GridClock {
  const resolver = zoneResolver(zone);
  const at = (t: number) => resolver.offsetAt(t);
  const out: number[] = [-Infinity, at(start)];
  let prevT = start;
  let prevOffset = out[1];
  for (let t = Math.min(start + DAY_S, end); ; t = Math.min(t + DAY_S, end)) {
    const offset = at(t);
    if (offset !== prevOffset) {
      // The change lies in (prevT, t]: find its first second.
      let lo = prevT;
      let hi = t;
      while (hi - lo > 1) {
        const mid = Math.floor((lo + hi) / 2);
        if (at(mid) === prevOffset) lo = mid;
        else hi = mid;
      }
      out.push(hi, offset);
      prevOffset = offset;
    }
    prevT = t;
    if (t >= end) break;
  }
  return { offsets: Float64Array.from(out), basis: `Local clock time in ${zone} (daylight saving included); months by the same clock` };
}

/** The offset (local − UTC, seconds) the clock has at UTC second `t`. */
export function offsetAt(clock: GridClock, t: number): number {
  const o = clock.offsets;
  let k = 0;
  while (k + 2 < o.length && o[k + 2] <= t) k += 2;
  return o[k + 1];
}
