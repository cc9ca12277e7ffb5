// What an approval records, and what has changed since: an approval is stale as soon as any
// part of what was approved differs from today's. Computed on read by comparing fingerprints,
// so it can never drift from the data.
import { createHash } from "node:crypto";

/** Exactly what a manager approved. Fingerprints are of canonical JSON, so key order never matters. */
export interface ApprovalSnapshot {
  studyId: number | null;
  studyInputs: string | null;
  option: { id: number; name: string; fingerprint: string; presentValue: number; equivalentAnnualCost: number; currency: string } | null;
  policy: string;
  ruleSet: string;
  spanLength: { value: number; unit: string };
  details: string;
  /** Rule-book rules the layout relied on: key → title and a fingerprint of the values (absent in approvals made before the rule book). */
  rules?: Record<string, { title: string; values: string }>;
}

/** JSON with object keys sorted at every level (arrays keep their order). */
export function canonicalJson(value: unknown): string {
  if (value === undefined) return "null";
  if (value === null || typeof value !== "object") return JSON.stringify(value);
  if (Array.isArray(value)) return `[${value.map(canonicalJson).join(",")}]`;
  const entries = Object.entries(value as Record<string, unknown>)
    .filter(([, v]) => v !== undefined)
    .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0));
  return `{${entries.map(([k, v]) => `${JSON.stringify(k)}:${canonicalJson(v)}`).join(",")}}`;
}

export function fingerprint(value: unknown): string {
  return createHash("sha256").update(canonicalJson(value)).digest("hex").slice(0, 32);
}

const RULE_SET_WORDS: Record<string, string> = { faa: "FAA", icao: "ICAO" };

/**
 * Why an approval no longer holds, in words; empty when it still does. `current.option` is the
 * approved option as it is today (null when it has been deleted).
 */
export function staleReasons(approved: ApprovalSnapshot, current: ApprovalSnapshot): string[] {
  const reasons: string[] = [];
  if (approved.studyId !== current.studyId) {
    reasons.push(
      current.studyId == null
        ? `study #${approved.studyId} is no longer the crossing's latest study`
        : approved.studyId == null
          ? `study #${current.studyId} has run since the approval`
          : `a newer study (#${current.studyId}) has run since study #${approved.studyId} was approved`,
    );
  } else if (approved.studyInputs !== current.studyInputs) {
    reasons.push(`the inputs of study #${approved.studyId} have changed`);
  }
  if (approved.option) {
    if (!current.option) reasons.push(`the approved option "${approved.option.name}" has been deleted`);
    else if (approved.option.fingerprint !== current.option.fingerprint) reasons.push(`the approved option "${approved.option.name}" has been edited`);
    else if (approved.option.equivalentAnnualCost !== current.option.equivalentAnnualCost || approved.option.presentValue !== current.option.presentValue) {
      reasons.push(`the cost of the approved option "${approved.option.name}" has changed`);
    }
  }
  if (approved.policy !== current.policy) reasons.push("the organisation's verdict policy has changed");
  if (approved.ruleSet !== current.ruleSet) {
    reasons.push(`the rule set has changed from ${RULE_SET_WORDS[approved.ruleSet] ?? approved.ruleSet} to ${RULE_SET_WORDS[current.ruleSet] ?? current.ruleSet}`);
  }
  if (approved.spanLength.value !== current.spanLength.value || approved.spanLength.unit !== current.spanLength.unit) {
    reasons.push(`the span length has changed from ${approved.spanLength.value} ${approved.spanLength.unit} to ${current.spanLength.value} ${current.spanLength.unit}`);
  }
  if (approved.details !== current.details) reasons.push("the span and marking details have changed");
  for (const [key, rule] of Object.entries(approved.rules ?? {})) {
    const now = current.rules?.[key];
    if (now && now.values !== rule.values) reasons.push(`the rule book's value of "${rule.title}" (${key}), which the layout relied on, has changed`);
  }
  return reasons;
}
