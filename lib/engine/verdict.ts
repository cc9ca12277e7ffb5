// The verdict of docs/computation.md from the organisation's policy, with its reasons in words.
import type { PeriodFigures, Policy, PolicyOverrides, Verdict, VerdictStatus } from "../../shared/study-schemas";
import { policySchema } from "../../shared/study-schemas";

export type VerdictFigures = Pick<
  PeriodFigures,
  "totalHours" | "knownHours" | "coverage" | "requiredKnownHours" | "availability" | "longestDarkStretchHours"
>;

/** The organisation's policy with a study's or an API call's overrides on top. */
export function mergePolicy(base: Partial<Policy>, overrides: PolicyOverrides = {}): Policy {
  const defined = Object.fromEntries(Object.entries(overrides).filter(([, v]) => v !== undefined));
  return policySchema.parse({ ...base, ...defined });
}

/** Status and reasons for one period's figures. */
export function decideVerdict(f: VerdictFigures, policy: Policy): { status: VerdictStatus; reasons: string[] } {
  const reasons: string[] = [];
  if (f.knownHours < policy.minKnownHours) {
    reasons.push(
      `Only ${formatHours(f.knownHours)} of current history is known; at least ${formatHours(policy.minKnownHours)} are needed.`,
    );
  }
  const coverage = f.coverage ?? 0;
  if (coverage < policy.minCoverage) {
    reasons.push(
      `Coverage ${formatPercent(coverage, policy.minCoverage)} of the period is below the minimum of ${formatPercent(policy.minCoverage)}.`,
    );
  }
  if (f.availability === null) {
    reasons.push("No required (night) time has known current, so availability cannot be judged.");
  }
  if (reasons.length > 0 || f.availability === null) return { status: "insufficient-data", reasons };

  const availability = f.availability;
  const longestOk = f.longestDarkStretchHours <= policy.maxDarkStretchHours;
  const longestText = `longest dark stretch ${formatDuration(f.longestDarkStretchHours)}`;
  const limitText = `the ${formatDuration(policy.maxDarkStretchHours)} limit`;
  if (availability >= policy.goAvailability && longestOk) {
    reasons.push(`Availability ${formatPercent(availability, policy.goAvailability)} meets the go threshold of ${formatPercent(policy.goAvailability)}.`);
    reasons.push(capitalise(`${longestText} is within ${limitText}.`));
    return { status: "go", reasons };
  }
  if (availability < policy.goAvailability) {
    reasons.push(`Availability ${formatPercent(availability, policy.goAvailability)} is below the go threshold of ${formatPercent(policy.goAvailability)}.`);
  } else {
    reasons.push(`Availability ${formatPercent(availability, policy.goAvailability)} meets the go threshold of ${formatPercent(policy.goAvailability)}.`);
  }
  if (!longestOk) reasons.push(capitalise(`${longestText} exceeds ${limitText}.`));
  if (availability >= policy.marginalAvailability) {
    reasons.push(`Availability meets the marginal threshold of ${formatPercent(policy.marginalAvailability)}.`);
    return { status: "marginal", reasons };
  }
  reasons.push(
    `Availability ${formatPercent(availability, policy.marginalAvailability)} is also below the marginal threshold of ${formatPercent(policy.marginalAvailability)}.`,
  );
  return { status: "no-go", reasons };
}

const SEVERITY: Record<VerdictStatus, number> = { go: 0, marginal: 1, "no-go": 2, "insufficient-data": -1 };

export interface YearFigures extends VerdictFigures {
  year: number;
  complete: boolean;
}

/**
 * The study's verdict: over the worst complete calendar year when the period spans more than one
 * full year and holds at least one complete year with enough data; otherwise over the whole period.
 * "Worst" = most severe status, then lowest availability, then longest dark stretch.
 */
export function studyVerdict(
  whole: VerdictFigures,
  years: YearFigures[],
  period: { start: number; end: number },
  policy: Policy,
  /** Where a calendar year begins and ends (UTC seconds): the circuit's calendar; UTC years by default. */
  yearBounds: (year: number) => { start: number; end: number } | null = (year) => ({ start: Date.UTC(year, 0, 1) / 1000, end: Date.UTC(year + 1, 0, 1) / 1000 }),
): Verdict {
  const wholeBasis = {
    kind: "whole-period" as const,
    label: `Whole analysed period (${isoDay(period.start)} to ${isoDay(period.end)})`,
    start: new Date(period.start * 1000).toISOString(),
    end: new Date(period.end * 1000).toISOString(),
  };
  const spansMoreThanAYear = period.end - period.start > 366 * 86_400;
  const complete = years.filter((y) => y.complete);
  if (spansMoreThanAYear && complete.length > 0) {
    const judged = complete.map((y) => ({ y, v: decideVerdict(y, policy) }));
    const usable = judged.filter((j) => j.v.status !== "insufficient-data");
    if (usable.length > 0) {
      usable.sort(
        (p, q) =>
          SEVERITY[q.v.status] - SEVERITY[p.v.status] ||
          (p.y.availability ?? 1) - (q.y.availability ?? 1) ||
          q.y.longestDarkStretchHours - p.y.longestDarkStretchHours,
      );
      const worst = usable[0];
      const yearSpan = yearBounds(worst.y.year) ?? { start: Date.UTC(worst.y.year, 0, 1) / 1000, end: Date.UTC(worst.y.year + 1, 0, 1) / 1000 };
      const yearList = complete.map((c) => c.year).join(", ");
      const reasons = [
        complete.length > 1
          ? `Judged on ${worst.y.year}, the worst of the complete calendar years ${yearList}.`
          : `Judged on ${worst.y.year}, the only complete calendar year in the period.`,
        ...worst.v.reasons,
      ];
      const skipped = judged.filter((j) => j.v.status === "insufficient-data").map((j) => j.y.year);
      if (skipped.length > 0) {
        reasons.push(`Not enough data to judge ${skipped.join(", ")} on its own.`);
      }
      return {
        status: worst.v.status,
        reasons,
        basis: {
          kind: "worst-complete-year",
          label: `Worst complete calendar year: ${worst.y.year}`,
          start: new Date(yearSpan.start * 1000).toISOString(),
          end: new Date(yearSpan.end * 1000).toISOString(),
          year: worst.y.year,
        },
      };
    }
  }
  const v = decideVerdict(whole, policy);
  return { status: v.status, reasons: [`Judged on the ${wholeBasis.label.charAt(0).toLowerCase()}${wholeBasis.label.slice(1)}.`, ...v.reasons], basis: wholeBasis };
}

/**
 * A share as a percentage with two decimals, or more when two decimals would make the value look
 * equal to the threshold it is compared with (99.896 % is not "99.90 %" next to "99.9 %").
 */
export function formatPercent(share: number, comparedWith?: number): string {
  let digits = 2;
  if (comparedWith !== undefined && share !== comparedWith) {
    while (digits < 6 && round(share * 100, digits) === round(comparedWith * 100, digits)) digits++;
  }
  return `${trimZeros((share * 100).toFixed(digits), comparedWith === undefined)} %`;
}

function trimZeros(text: string, trim: boolean): string {
  return trim && text.includes(".") ? text.replace(/0+$/, "").replace(/\.$/, "") : text;
}

function round(x: number, digits: number): number {
  const f = 10 ** digits;
  return Math.round(x * f) / f;
}

function formatHours(h: number): string {
  return `${Math.round(h).toLocaleString("en-US")} h`;
}

function formatDuration(h: number): string {
  if (h < 1) return `${Number((h * 60).toFixed(1))} min`;
  return `${Number(h.toFixed(2))} h`;
}

function capitalise(s: string): string {
  return s.charAt(0).toUpperCase() + s.slice(1);
}

function isoDay(sec: number): string {
  return new Date(sec * 1000).toISOString().slice(0, 10);
}
