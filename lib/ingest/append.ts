// Appending a newer export to a load profile (docs/computation.md "Appending data"). The rule:
// the newer upload wins over its whole time span — every stored sample from the first to the last
// timestamp of the new file is replaced by the new file's samples; stored samples outside that
// span are kept. A re-export of a corrected month therefore replaces that month cleanly instead
// of interleaving old and new samples.
import { PHASES, type Phase, type ProfileSeries } from "../series";
import type { QualityCounts } from "./quality";

export interface MergedSeries {
  series: ProfileSeries;
  /** Stored samples dropped because the new upload covers their time. */
  replaced: number;
  /** Samples of the new upload. */
  added: number;
}

/** Phases present in a series, in A-B-C order. */
export function phasesOf(series: ProfileSeries): Phase[] {
  return PHASES.filter((p) => series.phases[p]);
}

/** Merges `incoming` into `stored` by the newer-wins rule. Both must hold the same phases. */
export function mergeNewerWins(stored: ProfileSeries, incoming: ProfileSeries): MergedSeries {
  const phases = phasesOf(stored);
  const n = incoming.t.length;
  if (n === 0) return { series: stored, replaced: 0, added: 0 };
  const from = incoming.t[0];
  const to = incoming.t[n - 1];
  // Stored samples before the span, the new ones, then stored samples after it (t ascends).
  let before = 0;
  while (before < stored.t.length && stored.t[before] < from) before++;
  let after = before;
  while (after < stored.t.length && stored.t[after] <= to) after++;
  const replaced = after - before;
  const total = before + n + (stored.t.length - after);
  const t = new Float64Array(total);
  t.set(stored.t.subarray(0, before), 0);
  t.set(incoming.t, before);
  t.set(stored.t.subarray(after), before + n);
  const out: Partial<Record<Phase, Float32Array>> = {};
  for (const p of phases) {
    const a = new Float32Array(total);
    a.set(stored.phases[p]!.subarray(0, before), 0);
    a.set(incoming.phases[p]!, before);
    a.set(stored.phases[p]!.subarray(after), before + n);
    out[p] = a;
  }
  return { series: { t, phases: out }, replaced, added: n };
}

/** Counts of the combined history: the stored report's plus the new upload's. */
export function addCounts(stored: QualityCounts, incoming: QualityCounts): QualityCounts {
  const invalid = { ...stored.invalid };
  for (const [reason, count] of Object.entries(incoming.invalid) as [keyof QualityCounts["invalid"], number][]) invalid[reason] = (invalid[reason] ?? 0) + count;
  let perPhaseInvalid: QualityCounts["perPhaseInvalid"];
  if (stored.perPhaseInvalid || incoming.perPhaseInvalid) {
    perPhaseInvalid = {};
    for (const source of [stored.perPhaseInvalid ?? {}, incoming.perPhaseInvalid ?? {}]) {
      for (const [phase, tally] of Object.entries(source) as [Phase, Record<string, number>][]) {
        const target = ((perPhaseInvalid as Record<string, Record<string, number>>)[phase] ??= {});
        for (const [reason, count] of Object.entries(tally)) target[reason] = (target[reason] ?? 0) + count;
      }
    }
  }
  return {
    rowsRead: stored.rowsRead + incoming.rowsRead,
    invalid,
    duplicates: stored.duplicates + incoming.duplicates,
    outOfOrder: stored.outOfOrder + incoming.outOfOrder,
    ...(perPhaseInvalid ? { perPhaseInvalid } : {}),
  };
}
