// The distribution of current over the known time of a study (docs/computation.md "Load-duration
// curve and exceeded-p currents"): the load-duration curve, the currents exceeded p of the time,
// and the time above a rating. Everything comes from one primitive — the known time spent below
// each of a row of evenly spaced levels — computed exactly for the chosen interpolation.

/** The known part of a series: intervals no longer than the gap limit, clipped to the period. */
export interface KnownSpan {
  t: Float64Array;
  amps: Float64Array;
  periodStart: number;
  periodEnd: number;
  maxGapSeconds: number;
  linear: boolean;
}

export interface LoadDurationPoint {
  currentA: number;
  shareExceeded: number;
}

/** The currents exceeded 10 %, 50 % and 90 % of the known time (p10 ≥ p50 ≥ p90). */
export interface ExceededCurrents {
  p10A: number;
  p50A: number;
  p90A: number;
}

export const LOAD_DURATION_LEVELS = 201;

/**
 * Known seconds strictly below each level lo + k·step (k = 0 … count − 1), and the known seconds.
 * Each linear ramp from u to v adds rate·(x − min)⁺ capped at its length, each held value a jump;
 * both are written as prefix sums over the levels, so one pass serves every level.
 */
export function timeBelowLevels(span: KnownSpan, lo: number, step: number, count: number): { knownSeconds: number; below: Float64Array } {
  const { t, amps, periodStart, periodEnd, maxGapSeconds, linear } = span;
  const slopeSum = new Float64Array(count + 1);
  const constSum = new Float64Array(count + 1);
  // First level index strictly above x (levels at or below x do not count time at x as below them).
  const firstAbove = (x: number) => Math.min(count, Math.max(0, Math.floor((x - lo) / step) + 1));
  let known = 0;
  for (let i = 0; i + 1 < t.length; i++) {
    const t0 = t[i];
    const t1 = t[i + 1];
    if (t1 - t0 > maxGapSeconds) continue;
    const a = t0 > periodStart ? t0 : periodStart;
    const b = t1 < periodEnd ? t1 : periodEnd;
    if (b <= a) continue;
    const dt = b - a;
    known += dt;
    const slope = linear ? (amps[i + 1] - amps[i]) / (t1 - t0) : 0;
    const ia = amps[i] + slope * (a - t0);
    const ib = amps[i] + slope * (b - t0);
    const low = ia < ib ? ia : ib;
    const high = ia < ib ? ib : ia;
    if (high - low <= 1e-12 * (1 + Math.abs(high))) {
      constSum[firstAbove(low)] += dt;
    } else {
      const rate = dt / (high - low);
      const jl = firstAbove(low);
      slopeSum[jl] += rate * step;
      constSum[jl] += rate * (lo - low);
      const jh = firstAbove(high);
      slopeSum[jh] -= rate * step;
      constSum[jh] += rate * (high - lo);
    }
  }
  const below = new Float64Array(count);
  let s = 0;
  let c = 0;
  for (let k = 0; k < count; k++) {
    s += slopeSum[k];
    c += constSum[k];
    below[k] = k * s + c;
  }
  return { knownSeconds: known, below };
}

/** The load-duration curve at LOAD_DURATION_LEVELS even levels from 0 A to the highest sample. */
export function loadDurationCurve(span: KnownSpan): { knownSeconds: number; points: LoadDurationPoint[] } {
  const top = highest(span.amps);
  const step = top > 0 ? top / (LOAD_DURATION_LEVELS - 1) : 1;
  const { knownSeconds, below } = timeBelowLevels(span, 0, step, LOAD_DURATION_LEVELS);
  const points = Array.from(below, (b, k) => ({ currentA: k * step, shareExceeded: shareExceeded(b, knownSeconds) }));
  return { knownSeconds, points };
}

/**
 * The current exceeded a share p of the known time: where the load-duration curve crosses p,
 * interpolated linearly between levels. A coarse pass over [lowest, highest sample] finds the two
 * levels either side; a second pass of the same resolution inside that bracket refines it, so the
 * answer is good to (range / 200²) even when the samples span a wide range.
 */
export function exceededCurrent(span: KnownSpan, p: number): number | null {
  let lo = lowest(span.amps);
  const hi = highest(span.amps);
  if (!(hi > lo)) return timeBelowLevels(span, lo, 1, 1).knownSeconds > 0 ? lo : null;
  let step = (hi - lo) / (LOAD_DURATION_LEVELS - 1);
  for (let pass = 0; pass < 2; pass++) {
    const { knownSeconds, below } = timeBelowLevels(span, lo, step, LOAD_DURATION_LEVELS);
    if (knownSeconds <= 0) return null;
    const e = (k: number) => shareExceeded(below[k], knownSeconds);
    // e(0) is 1 on the first pass (nothing is below the lowest sample); e falls as k rises.
    let k = 0;
    while (k + 1 < LOAD_DURATION_LEVELS && e(k + 1) >= p) k++;
    if (k + 1 === LOAD_DURATION_LEVELS) return lo + k * step; // held at the top for at least p of the time
    if (pass === 1) {
      const ek = e(k);
      const ek1 = e(k + 1);
      return lo + step * (k + (ek > ek1 ? (ek - p) / (ek - ek1) : 0));
    }
    lo += k * step;
    step /= LOAD_DURATION_LEVELS - 1;
  }
  return null; // not reached
}

export function exceededCurrents(span: KnownSpan): ExceededCurrents | null {
  const p10A = exceededCurrent(span, 0.1);
  const p50A = exceededCurrent(span, 0.5);
  const p90A = exceededCurrent(span, 0.9);
  return p10A === null || p50A === null || p90A === null ? null : { p10A, p50A, p90A };
}

/** Known seconds with the current strictly above a level (a rating). */
export function secondsAbove(span: KnownSpan, levelA: number): number {
  const from = levelA + Math.max(Math.abs(levelA) * Number.EPSILON, Number.MIN_VALUE);
  const { knownSeconds, below } = timeBelowLevels(span, from, 1, 1);
  return Math.max(0, knownSeconds - below[0]);
}

/**
 * The current exceeded a share p of the time, read off a stored load-duration curve (results saved
 * before the engine reported exceeded-p currents): linear between the curve's points.
 */
export function exceededFromCurve(points: readonly LoadDurationPoint[], p: number): number | null {
  if (points.length === 0) return null;
  if (points[0].shareExceeded < p) return points[0].currentA;
  for (let k = 0; k + 1 < points.length; k++) {
    const a = points[k];
    const b = points[k + 1];
    if (a.shareExceeded >= p && b.shareExceeded < p) {
      return a.currentA + ((a.shareExceeded - p) / (a.shareExceeded - b.shareExceeded)) * (b.currentA - a.currentA);
    }
  }
  return points[points.length - 1].currentA;
}

function shareExceeded(belowSeconds: number, knownSeconds: number): number {
  return knownSeconds > 0 ? Math.min(1, Math.max(0, 1 - belowSeconds / knownSeconds)) : 0;
}

function highest(a: Float64Array): number {
  let top = -Infinity;
  for (let i = 0; i < a.length; i++) if (a[i] > top) top = a[i];
  return a.length > 0 ? top : 0;
}

function lowest(a: Float64Array): number {
  let bottom = Infinity;
  for (let i = 0; i < a.length; i++) if (a[i] < bottom) bottom = a[i];
  return a.length > 0 ? bottom : 0;
}
