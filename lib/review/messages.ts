// The e-mails a review sends, as plain text and HTML. Pure: the service supplies the facts.
import { REVIEW_DECISION_LABELS, type ReviewDecision } from "../../shared/review-schemas";

export type ReviewMessageKind = "submitted" | "approved" | "returned" | "stale";

export interface ReviewMessageFacts {
  kind: ReviewMessageKind;
  crossing: string;
  circuit: string;
  /** Verdict words of the latest study, or null when never studied. */
  verdict: string | null;
  decision: ReviewDecision | null;
  optionName: string | null;
  by: string;
  comment: string;
  staleReasons?: string[];
  link: string;
}

const VERDICT_WORDS: Record<string, string> = { go: "go", marginal: "marginal", "no-go": "no-go", "insufficient-data": "insufficient data" };

export function escapeHtml(s: string): string {
  return s.replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c]!);
}

export function reviewMessage(f: ReviewMessageFacts): { subject: string; text: string; html: string } {
  const name = `${f.crossing} (${f.circuit})`;
  const subject = {
    submitted: `Sign-off requested: ${name}`,
    approved: `Approved: ${name}`,
    returned: `Returned for rework: ${name}`,
    stale: `Approval out of date: ${name}`,
  }[f.kind];
  const lead = {
    submitted: `${f.by} submitted ${name} for your sign-off.`,
    approved: `${f.by} approved ${name}.`,
    returned: `${f.by} returned ${name} to you for rework.`,
    stale: `Your approval of ${name} no longer matches the crossing: what it was based on has changed.`,
  }[f.kind];
  const decision = f.decision ? REVIEW_DECISION_LABELS[f.decision] + (f.optionName && f.decision !== "do-not-proceed" ? `: ${f.optionName}` : "") : null;
  const facts: [string, string][] = [
    ["Crossing", name],
    ["Verdict", f.verdict ? VERDICT_WORDS[f.verdict] ?? f.verdict : "not studied"],
    ...(decision ? ([["Decision", decision]] as [string, string][]) : []),
    ...(f.comment ? ([[f.kind === "submitted" ? "Note" : "Comment", f.comment]] as [string, string][]) : []),
    ...(f.staleReasons?.length ? ([["What changed", f.staleReasons.join("; ")]] as [string, string][]) : []),
  ];
  const text = [lead, "", ...facts.map(([k, v]) => `${k}: ${v}`), "", `Open the crossing: ${f.link}`, "", "Duskline is a planning aid; the rule set, local codes, the aviation authority and licensed engineering judgement govern."].join("\n");
  const html = `<!doctype html><html><body style="font-family:sans-serif">
<p>${escapeHtml(lead)}</p>
<table>${facts.map(([k, v]) => `<tr><th align="left" style="padding-right:1em">${escapeHtml(k)}</th><td>${escapeHtml(v)}</td></tr>`).join("")}</table>
<p><a href="${escapeHtml(f.link)}">Open the crossing</a></p>
<p style="color:#666;font-size:small">Duskline is a planning aid; the rule set, local codes, the aviation authority and licensed engineering judgement govern.</p>
</body></html>`;
  return { subject, text, html };
}
