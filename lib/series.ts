// The in-memory shape of a load profile, shared by ingest (lib/ingest), storage
// (db/ BLOB encoding) and the feasibility engine (lib/engine).

export const PHASES = ["A", "B", "C"] as const;
export type Phase = (typeof PHASES)[number];

/**
 * One uploaded current history. `t` holds epoch seconds (UTC), sorted ascending,
 * no duplicates; each phase array has the same length as `t` and holds amperes,
 * with NaN where that phase's sample was invalid at that timestamp.
 * A timestamp is kept when at least one mapped phase is valid.
 */
export interface ProfileSeries {
  t: Float64Array;
  phases: Partial<Record<Phase, Float32Array>>;
}

/** One channel of valid samples only: epoch seconds ascending and amperes. */
export interface Series {
  t: Float64Array;
  amps: Float64Array;
}

export type PhaseChoice = Phase | "min";

/**
 * Pick the channel a device hangs on. `min` takes the smallest valid phase value at
 * each timestamp (the conservative choice when the device phase is not known).
 * NaN samples are dropped, so the result holds valid samples only.
 */
export function selectPhase(profile: ProfileSeries, choice: PhaseChoice): Series {
  const n = profile.t.length;
  const channels: Float32Array[] =
    choice === "min"
      ? (Object.values(profile.phases).filter(Boolean) as Float32Array[])
      : profile.phases[choice]
        ? [profile.phases[choice] as Float32Array]
        : [];
  if (channels.length === 0) {
    throw new Error(`Phase ${choice} is not in this profile (it has ${Object.keys(profile.phases).join(", ") || "none"}).`);
  }
  const t = new Float64Array(n);
  const amps = new Float64Array(n);
  let k = 0;
  for (let i = 0; i < n; i++) {
    let v = Infinity;
    for (const ch of channels) {
      const x = ch[i];
      if (x === x && x < v) v = x; // x === x skips NaN
    }
    if (v !== Infinity) {
      t[k] = profile.t[i];
      amps[k] = v;
      k++;
    }
  }
  return { t: t.subarray(0, k), amps: amps.subarray(0, k) };
}

/**
 * Median of the intervals between consecutive timestamps, in seconds (0 for < 2 samples); exactly
 * the middle of the sorted intervals (mean of the two middle ones for an even count).
 * Regular sampling, the usual case, has one interval in more than half the places, and that value
 * is then the median: found in two passes without sorting or allocating. Otherwise quickselect.
 */
export function medianIntervalSeconds(t: Float64Array): number {
  const count = t.length - 1;
  if (count < 1) return 0;
  // Boyer–Moore majority vote, then a count to confirm it (a majority fills both middle places).
  let candidate = 0;
  let votes = 0;
  for (let i = 1; i <= count; i++) {
    const d = t[i] - t[i - 1];
    if (votes === 0) {
      candidate = d;
      votes = 1;
    } else if (d === candidate) votes++;
    else votes--;
  }
  // (NaN never equals itself and ±0 compare equal: leave those cases to the general path.)
  if (candidate === candidate && candidate !== 0) {
    let same = 0;
    for (let i = 1; i <= count; i++) if (t[i] - t[i - 1] === candidate) same++;
    if (same * 2 > count) return candidate;
  }
  return medianBySelection(t);
}

function medianBySelection(t: Float64Array): number {
  const count = t.length - 1;
  const d = new Float64Array(count);
  let plain = true; // no NaN and no −0, so === equality is identity and selection matches a sort
  for (let i = 1; i <= count; i++) {
    const x = t[i] - t[i - 1];
    d[i - 1] = x;
    if (x !== x || (x === 0 && 1 / x < 0)) plain = false;
  }
  const m = count >> 1;
  if (!plain) {
    d.sort(); // typed-array sort is numeric (−0 before +0, NaN last)
    return count % 2 ? d[m] : (d[m - 1] + d[m]) / 2;
  }
  const upper = selectInPlace(d, m);
  if (count % 2) return upper;
  // After selection every value before m is ≤ d[m]; the lower middle is the largest of them.
  let lower = d[0];
  for (let i = 1; i < m; i++) if (d[i] > lower) lower = d[i];
  return (lower + upper) / 2;
}

/**
 * Hoare's selection: reorders `a` so a[k] holds the k-th smallest value, smaller or equal values
 * before it and larger or equal after it. Falls back to sorting the remaining range if the pivots
 * keep missing (adversarial input), so the time stays O(n log n) at worst.
 */
function selectInPlace(a: Float64Array, k: number): number {
  let lo = 0;
  let hi = a.length - 1;
  let rounds = 2 * Math.ceil(Math.log2(a.length + 1)) + 8;
  while (hi > lo) {
    if (rounds-- === 0) {
      a.subarray(lo, hi + 1).sort();
      return a[k];
    }
    // Median of three as the pivot.
    const mid = lo + ((hi - lo) >> 1);
    let x = a[lo];
    let y = a[mid];
    let z = a[hi];
    if (x > y) [x, y] = [y, x];
    if (y > z) [y, z] = [z, y];
    if (x > y) [x, y] = [y, x];
    const pivot = y;
    let i = lo;
    let j = hi;
    while (i <= j) {
      while (a[i] < pivot) i++;
      while (a[j] > pivot) j--;
      if (i <= j) {
        const swap = a[i];
        a[i] = a[j];
        a[j] = swap;
        i++;
        j--;
      }
    }
    // Now a[lo..j] ≤ pivot, a[i..hi] ≥ pivot and anything between equals the pivot.
    if (k <= j) hi = j;
    else if (k >= i) lo = i;
    else return a[k];
  }
  return a[k];
}

/** docs/computation.md: default max gap = 3 × the median sampling interval. */
export function defaultMaxGapSeconds(t: Float64Array): number {
  return 3 * medianIntervalSeconds(t);
}
