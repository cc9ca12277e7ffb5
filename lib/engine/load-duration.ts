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

/** A row of evenly spaced levels lo + k·step, k = 0 … count − 1. */
export interface LevelGrid {
  lo: number;
  step: number;
  count: number;
}

/**
 * Known seconds strictly below each level of each grid, and the known seconds, in one pass.
 * Each linear ramp from u to v adds rate·(x − min)⁺ capped at its length, each held value a jump;
 * both are written as prefix sums over the levels, so one pass serves every level of every grid.
 */
export function timeBelowGrids(span: KnownSpan, grids: readonly LevelGrid[]): { knownSeconds: number; below: Float64Array[] } {
  const { t, amps, periodStart, periodEnd, maxGapSeconds, linear } = span;
  const G = grids.length;
  const slopeSums = grids.map((g) => new Float64Array(g.count + 1));
  const constSums = grids.map((g) => new Float64Array(g.count + 1));
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
    const flat = high - low <= 1e-12 * (1 + Math.abs(high));
    const rate = flat ? 0 : dt / (high - low);
    for (let g = 0; g < G; g++) {
      const { lo, step, count } = grids[g];
      // First level index strictly above x (levels at or below x do not count time at x as below them).
      const jl = Math.min(count, Math.max(0, Math.floor((low - lo) / step) + 1));
      if (flat) {
        constSums[g][jl] += dt;
        continue;
      }
      const jh = Math.min(count, Math.max(0, Math.floor((high - lo) / step) + 1));
      const ss = slopeSums[g];
      const cs = constSums[g];
      ss[jl] += rate * step;
      cs[jl] += rate * (lo - low);
      ss[jh] -= rate * step;
      cs[jh] += rate * (high - lo);
    }
  }
  const below = grids.map((g, k) => {
    const out = new Float64Array(g.count);
    let s = 0;
    let c = 0;
    for (let j = 0; j < g.count; j++) {
      s += slopeSums[k][j];
      c += constSums[k][j];
      out[j] = j * s + c;
    }
    return out;
  });
  return { knownSeconds: known, below };
}

export function timeBelowLevels(span: KnownSpan, lo: number, step: number, count: number): { knownSeconds: number; below: Float64Array } {
  const { knownSeconds, below } = timeBelowGrids(span, [{ lo, step, count }]);
  return { knownSeconds, below: below[0] };
}

const EXCEEDED_SHARES = [0.1, 0.5, 0.9] as const;

/**
 * The load-duration curve at LOAD_DURATION_LEVELS even levels from 0 A to the highest sample, and
 * the currents exceeded 10 / 50 / 90 % of the known time, in two passes over the samples.
 *
 * The current exceeded a share p is where the curve crosses p, interpolated linearly between
 * levels. The first pass also draws the curve at the same resolution over [lowest, highest sample]
 * and finds the two levels either side of each p; the second redraws it inside each bracket, so
 * the answer is good to (range / 200²) even when the samples span a wide range.
 */
export function loadDistribution(
  span: KnownSpan,
  ratingA?: number,
): { knownSeconds: number; points: LoadDurationPoint[]; exceeded: ExceededCurrents | null; secondsAboveRating: number | null } {
  const N = LOAD_DURATION_LEVELS;
  const lowestA = lowest(span.amps);
  const highestA = highest(span.amps);
  const top = Math.max(0, highestA);
  const curveGrid = { lo: 0, step: top > 0 ? top / (N - 1) : 1, count: N };
  const spread = highestA > lowestA;
  const coarse = { lo: lowestA, step: spread ? (highestA - lowestA) / (N - 1) : 1, count: spread ? N : 1 };
  // The rating rides along as a one-level grid just above it ("above" is strict).
  const ratingGrid = ratingA === undefined ? [] : [{ lo: strictlyAbove(ratingA), step: 1, count: 1 }];
  const first = timeBelowGrids(span, [curveGrid, coarse, ...ratingGrid]);
  const known = first.knownSeconds;
  const secondsAboveRating = ratingA === undefined ? null : Math.max(0, known - first.below[2][0]);
  const points = Array.from(first.below[0], (b, k) => ({ currentA: k * curveGrid.step, shareExceeded: shareExceeded(b, known) }));
  if (known <= 0) return { knownSeconds: known, points, exceeded: null, secondsAboveRating };
  if (!spread) return { knownSeconds: known, points, exceeded: { p10A: lowestA, p50A: lowestA, p90A: lowestA }, secondsAboveRating };

  // Bracket of each p on the coarse grid: e(k) ≥ p > e(k + 1); e(0) = 1 (nothing below the lowest).
  const brackets = EXCEEDED_SHARES.map((p) => bracketOf(first.below[1], known, p));
  const fine = brackets.map((k) => ({ lo: coarse.lo + k * coarse.step, step: coarse.step / (N - 1), count: N }));
  const second = timeBelowGrids(span, fine);
  const values = EXCEEDED_SHARES.map((p, i) => {
    if (brackets[i] === N - 1) return highestA; // held at the top for at least p of the time
    const grid = fine[i];
    const below = second.below[i];
    const k = bracketOf(below, known, p);
    if (k === N - 1) return grid.lo + k * grid.step;
    const ek = shareExceeded(below[k], known);
    const ek1 = shareExceeded(below[k + 1], known);
    return grid.lo + grid.step * (k + (ek > ek1 ? (ek - p) / (ek - ek1) : 0));
  });
  return { knownSeconds: known, points, exceeded: { p10A: values[0], p50A: values[1], p90A: values[2] }, secondsAboveRating };
}

/** Largest k with the share exceeded at level k at least p (levels ascending, shares falling). */
function bracketOf(below: Float64Array, known: number, p: number): number {
  let k = 0;
  while (k + 1 < below.length && shareExceeded(below[k + 1], known) >= p) k++;
  return k;
}

/** The load-duration curve alone (see loadDistribution). */
export function loadDurationCurve(span: KnownSpan): { knownSeconds: number; points: LoadDurationPoint[] } {
  const { knownSeconds, points } = loadDistribution(span);
  return { knownSeconds, points };
}

/** The current exceeded a share p of the known time (one share; tests and one-off use). */
export function exceededCurrent(span: KnownSpan, p: number): number | null {
  const N = LOAD_DURATION_LEVELS;
  const lo0 = lowest(span.amps);
  const hi = highest(span.amps);
  if (!(hi > lo0)) return timeBelowLevels(span, lo0, 1, 1).knownSeconds > 0 ? lo0 : null;
  let lo = lo0;
  let step = (hi - lo0) / (N - 1);
  for (let pass = 0; pass < 2; pass++) {
    const { knownSeconds, below } = timeBelowLevels(span, lo, step, N);
    if (knownSeconds <= 0) return null;
    const k = bracketOf(below, knownSeconds, p);
    if (k === N - 1) return pass === 0 ? hi : lo + k * step;
    if (pass === 1) {
      const ek = shareExceeded(below[k], knownSeconds);
      const ek1 = shareExceeded(below[k + 1], knownSeconds);
      return lo + step * (k + (ek > ek1 ? (ek - p) / (ek - ek1) : 0));
    }
    lo += k * step;
    step /= N - 1;
  }
  return null; // not reached
}

export function exceededCurrents(span: KnownSpan): ExceededCurrents | null {
  return loadDistribution(span).exceeded;
}

/** Known seconds with the current strictly above a level (a rating). */
export function secondsAbove(span: KnownSpan, levelA: number): number {
  const { knownSeconds, below } = timeBelowLevels(span, strictlyAbove(levelA), 1, 1);
  return Math.max(0, knownSeconds - below[0]);
}

/** The next level up: "at or above" it means strictly above `levelA`. */
function strictlyAbove(levelA: number): number {
  return levelA + Math.max(Math.abs(levelA) * Number.EPSILON, Number.MIN_VALUE);
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
