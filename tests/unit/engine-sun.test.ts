// Night windows (lib/engine/sun.ts) against an outside reference.
// Reference: astronomy-engine (npm), a general-purpose library checked against NOVAS and JPL
// Horizons to about ±1 arcminute, as docs/check-values.md "Sun" records.
import { describe, expect, it } from "vitest";
import * as Astronomy from "astronomy-engine";
import { daylightIntervals, geometricAltitudeDeg, requiredWindows } from "../../lib/engine/sun";

const DAY = 86_400;
const utc = (y: number, m: number, d: number, h = 0) => Date.UTC(y, m - 1, d, h) / 1000;

/** Reference night windows: successive times the sun's centre descends/ascends through `altitude` (no refraction). */
function referenceNights(lat: number, lon: number, altitude: number, start: number, end: number): number[] {
  const observer = new Astronomy.Observer(lat, lon, 0);
  const events: { t: number; down: boolean }[] = [];
  for (const direction of [-1, +1]) {
    let from = new Date(start * 1000);
    for (;;) {
      const hit = Astronomy.SearchAltitude(Astronomy.Body.Sun, observer, direction, from, (end - from.getTime() / 1000) / DAY, altitude);
      if (!hit) break;
      const t = hit.date.getTime() / 1000;
      if (t >= end) break;
      events.push({ t, down: direction === -1 });
      from = new Date((t + 60) * 1000);
    }
  }
  events.sort((a, b) => a.t - b.t);
  // Whether the period starts in the night: geometric altitude (Horizon without refraction).
  const geometric = Astronomy.Horizon(new Date(start * 1000), observer, ...raDec(start, observer), undefined).altitude;
  const out: number[] = [];
  let nightFrom: number | null = geometric < altitude ? start : null;
  for (const e of events) {
    if (e.down && nightFrom === null) nightFrom = e.t;
    if (!e.down && nightFrom !== null) {
      out.push(nightFrom, e.t);
      nightFrom = null;
    }
  }
  if (nightFrom !== null) out.push(nightFrom, end);
  return out;
}

function raDec(sec: number, observer: Astronomy.Observer): [number, number] {
  const eq = Astronomy.Equator(Astronomy.Body.Sun, new Date(sec * 1000), observer, true, true);
  return [eq.ra, eq.dec];
}

const total = (w: ArrayLike<number>) => {
  let s = 0;
  for (let k = 0; k < w.length; k += 2) s += w[k + 1] - w[k];
  return s;
};

describe("night windows vs astronomy-engine", () => {
  it("mid-latitude, whole year 2025: every sunset and sunrise within a minute, same night hours", () => {
    const [lat, lon] = [35.2, -97.4];
    const start = utc(2025, 1, 1);
    const end = utc(2026, 1, 1);
    const ours = requiredWindows({ kind: "night", sunAltitudeDeg: -0.833 }, lat, lon, start, end);
    const ref = referenceNights(lat, lon, -0.833, start, end);
    expect(ours.length).toBe(ref.length);
    let worst = 0;
    for (let k = 0; k < ours.length; k++) worst = Math.max(worst, Math.abs(ours[k] - ref[k]));
    // docs/check-values.md "Sun": expected agreement of rise/set times within about a minute.
    expect(worst).toBeLessThan(60);
    expect(Math.abs(total(ours) - total(ref)) / 3600).toBeLessThan(0.5); // hours over the year
  });

  it("69.65° N: polar night and midnight sun, night hours over a year agree", () => {
    const [lat, lon] = [69.65, 18.96];
    const start = utc(2025, 1, 1);
    const end = utc(2026, 1, 1);
    const ours = requiredWindows({ kind: "night", sunAltitudeDeg: -0.833 }, lat, lon, start, end);
    const ref = referenceNights(lat, lon, -0.833, start, end);
    expect(ours.length).toBe(ref.length);
    // At 69.65° the sun crosses the altitude at a shallow angle, so small differences in the solar
    // model become seconds of time; on the days it only grazes the altitude (the first night after
    // the midnight sun) a single event is ill-conditioned. Whole-year night hours agree within an
    // hour (of ~4,200 h), every event within 2 minutes except at most two grazing ones (30 minutes).
    expect(Math.abs(total(ours) - total(ref)) / 60).toBeLessThan(60);
    const offMinutes = Array.from(ours, (x, k) => Math.abs(x - ref[k]) / 60);
    expect(offMinutes.filter((m) => m > 2).length).toBeLessThanOrEqual(2);
    expect(Math.max(...offMinutes)).toBeLessThan(30);
  });

  it("no sunrise at 69.65° N on 21 December: the whole day is required", () => {
    // docs/check-values.md "Sun": no sunrise at 69.65° N on 21 December.
    const [lat, lon] = [69.65, 18.96];
    const day = utc(2025, 12, 21);
    const w = requiredWindows({ kind: "night", sunAltitudeDeg: -0.833 }, lat, lon, day, day + DAY);
    expect(Array.from(w)).toEqual([day, day + DAY]);
    const observer = new Astronomy.Observer(lat, lon, 0);
    const rise = Astronomy.SearchAltitude(Astronomy.Body.Sun, observer, +1, new Date(day * 1000), 1, -0.833);
    expect(rise).toBeNull();
  });

  it("no civil dusk at 64.8° N on 21 June: no window at −6° for that solar day", () => {
    // docs/check-values.md "Sun": no civil dusk at 64.8° N on 21 June; civil twilight = −6°
    // [published: NOAA "Solar Calculation Details"; US Naval Observatory].
    const [lat, lon] = [64.8, -147.7];
    const noonUtc = utc(2025, 6, 21, 12) - (lon / 360) * DAY; // local mean noon in UTC
    const w = requiredWindows({ kind: "night", sunAltitudeDeg: -6 }, lat, lon, noonUtc - DAY / 2, noonUtc + DAY / 2);
    expect(w.length).toBe(0);
    // …while at the standard −0.833° there is a short night.
    const sunset = requiredWindows({ kind: "night", sunAltitudeDeg: -0.833 }, lat, lon, noonUtc - DAY / 2, noonUtc + DAY / 2);
    expect(sunset.length).toBeGreaterThan(0);
    const observer = new Astronomy.Observer(lat, lon, 0);
    expect(Astronomy.SearchAltitude(Astronomy.Body.Sun, observer, -1, new Date(noonUtc * 1000), 1, -6)).toBeNull();
  });

  it("a custom altitude widens the night and leaves suncalc's own table as it was", async () => {
    const { times } = await import("suncalc");
    const before = JSON.stringify(times);
    const start = utc(2025, 3, 1);
    const end = utc(2025, 4, 1);
    const standard = total(requiredWindows({ kind: "night", sunAltitudeDeg: -0.833 }, 35.2, -97.4, start, end));
    const early = total(requiredWindows({ kind: "night", sunAltitudeDeg: 2 }, 35.2, -97.4, start, end));
    expect(early).toBeGreaterThan(standard + 31 * 15 * 60); // ≥ 15 min more per night
    expect(JSON.stringify(times)).toBe(before);
  });

  it("schedule always: one window over the whole period", () => {
    expect(Array.from(requiredWindows({ kind: "always" }, 0, 0, 100, 500))).toEqual([100, 500]);
  });

  it("polar day at 69.65° N in June: daylight covers the whole solar day without gaps", () => {
    const start = utc(2025, 6, 10);
    const light = daylightIntervals(-0.833, 69.65, 18.96, start, start + 10 * DAY);
    expect(light.length).toBe(2); // one merged interval
    expect(light[0]).toBeLessThanOrEqual(start);
    expect(light[1]).toBeGreaterThanOrEqual(start + 10 * DAY);
  });
});

describe("solar position", () => {
  const jdeToDate = (jd: number, deltaTSeconds: number) => new Date(((jd - 2440587.5) * DAY - deltaTSeconds) * 1000);

  it("Meeus Example 25.a via astronomy-engine: apparent declination −7.78507°, right ascension 198.38083°", () => {
    // [published: Meeus, Astronomical Algorithms, 2nd ed., Example 25.a] JDE 2448908.5 (1992 Oct 13.0 TT).
    // Example 25.a uses the low-accuracy method; the full theory (Example 25.b) differs by ~0.003°,
    // and the observer's parallax adds < 0.003°, hence the 0.006° tolerance.
    const time = Astronomy.AstroTime.FromTerrestrialTime(2448908.5 - 2451545.0);
    const eq = Astronomy.Equator(Astronomy.Body.Sun, time, new Astronomy.Observer(0, 0, 0), true, true);
    expect(Math.abs(eq.dec - -7.78507)).toBeLessThan(0.006);
    expect(Math.abs(eq.ra * 15 - 198.38083)).toBeLessThan(0.006);
  });

  it("suncalc's position (the app's sun code) gives Meeus 25.a's declination: altitude seen from the pole", () => {
    // At the North Pole the geometric altitude equals the declination. suncalc applies ΔT itself, so
    // pass UT = TT − ΔT; ΔT ≈ 59 s in 1992 [from memory; a minute off moves δ by < 0.0003°].
    const date = jdeToDate(2448908.5, 59);
    expect(Math.abs(geometricAltitudeDeg(date, 90, 0) - -7.78507)).toBeLessThan(0.001);
    expect(Math.abs(geometricAltitudeDeg(date, -90, 0) - 7.78507)).toBeLessThan(0.001);
  });

  it("geometric altitude undoes suncalc's refraction and matches astronomy-engine", () => {
    const observer = new Astronomy.Observer(35.2, -97.4, 0);
    for (const hour of [0, 6, 12, 13, 18, 23]) {
      const date = new Date(Date.UTC(2025, 2, 20, hour));
      const [ra, dec] = raDec(date.getTime() / 1000, observer);
      const ref = Astronomy.Horizon(date, observer, ra, dec, undefined).altitude;
      expect(Math.abs(geometricAltitudeDeg(date, 35.2, -97.4) - ref)).toBeLessThan(0.02);
    }
  });
});
