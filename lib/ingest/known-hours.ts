// Known hours of a stored profile inside a chosen period, estimated from its quality report's
// monthly coverage (docs/computation.md "Known hours before a study"): exact for whole months,
// pro rata inside a partly chosen month. Lets the study form warn before a run that could only
// end as insufficient data.

export interface MonthCoverage {
  /** YYYY-MM: a UTC calendar month in the stored quality report, a local one where a page says so. */
  month: string;
  /** Known time / the month's time inside the profile's span. */
  coverage: number;
}

const HOUR_MS = 3_600_000;

function monthBounds(month: string): [number, number] | null {
  const m = /^(\d{4})-(\d{2})$/.exec(month);
  if (!m) return null;
  const y = Number(m[1]);
  const k = Number(m[2]) - 1;
  return [Date.UTC(y, k, 1), Date.UTC(y, k + 1, 1)];
}

/**
 * Hours of the period [fromMs, toMs) and the known hours in it (only inside the profile's span);
 * coverage is known / period hours, as the study computes it. A missing bound means the profile's
 * own start or end; a period with no overlap has no span.
 */
export function knownHoursInPeriod(months: readonly MonthCoverage[], profileStartMs: number, profileEndMs: number, fromMs?: number, toMs?: number): { spanHours: number; knownHours: number; coverage: number | null } {
  const periodStart = fromMs ?? profileStartMs;
  const periodEnd = toMs ?? profileEndMs;
  const start = Math.max(profileStartMs, periodStart);
  const end = Math.min(profileEndMs, periodEnd);
  if (!(end > start)) return { spanHours: 0, knownHours: 0, coverage: null };
  let knownMs = 0;
  for (const { month, coverage } of months) {
    const bounds = monthBounds(month);
    if (!bounds) continue;
    const overlap = Math.min(bounds[1], end) - Math.max(bounds[0], start);
    if (overlap > 0) knownMs += coverage * overlap;
  }
  const spanHours = (periodEnd - periodStart) / HOUR_MS;
  const knownHours = knownMs / HOUR_MS;
  return { spanHours, knownHours, coverage: knownHours / spanHours };
}

/** Whether the policy's data minimums can be met, in words; null when they can. */
export function insufficientDataWarning(known: { spanHours: number; knownHours: number; coverage: number | null }, policy: { minKnownHours: number; minCoverage: number }): string | null {
  const fmt = (h: number) => Math.round(h).toLocaleString("en");
  if (known.spanHours === 0) return "The chosen period does not overlap the load profile: the verdict could only be insufficient data.";
  const problems: string[] = [];
  if (known.knownHours < policy.minKnownHours) problems.push(`about ${fmt(known.knownHours)} known hours of current, below the policy's minimum of ${fmt(policy.minKnownHours)}`);
  if (known.coverage !== null && known.coverage < policy.minCoverage) {
    problems.push(`coverage of about ${(known.coverage * 100).toFixed(1)} %, below the policy's minimum of ${(policy.minCoverage * 100).toFixed(0)} %`);
  }
  if (problems.length === 0) return null;
  return `The chosen period holds ${problems.join(" and ")}: the verdict could only be insufficient data. Choose a longer period or a profile with more data.`;
}
