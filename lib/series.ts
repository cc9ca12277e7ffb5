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

/** Median of the intervals between consecutive timestamps, in seconds (0 for < 2 samples). */
export function medianIntervalSeconds(t: Float64Array): number {
  if (t.length < 2) return 0;
  const d = new Float64Array(t.length - 1);
  for (let i = 1; i < t.length; i++) d[i - 1] = t[i] - t[i - 1];
  d.sort(); // typed-array sort is numeric
  const m = d.length >> 1;
  return d.length % 2 ? d[m] : (d[m - 1] + d[m]) / 2;
}

/** product.md §3: default max gap = 3 × the median sampling interval. */
export function defaultMaxGapSeconds(t: Float64Array): number {
  return 3 * medianIntervalSeconds(t);
}
