// Audit entries in plain words: "Erin Engineer uploaded load profile "Winter 2025" (41,760 samples)".
// The stored entry keeps its machine-readable action and detail; this only reads them.
export interface AuditFacts {
  who: string;
  action: string;
  entity: string;
  entityId: string | null;
  detail: Record<string, unknown> | null;
}

const ENTITY_WORDS: Record<string, string> = {
  "load-profile": "load profile",
  "device-profile": "device profile",
  "lighting-option": "lighting option",
  "api-key": "API key",
};

const str = (value: unknown) => (typeof value === "string" || typeof value === "number" ? String(value) : undefined);
const quoted = (value: unknown) => (str(value) !== undefined ? `"${str(value)}"` : undefined);

/** The record as people name it: its name when the detail has one, else its kind and number. */
function recordName(facts: AuditFacts): string {
  const kind = ENTITY_WORDS[facts.entity] ?? facts.entity.replace(/-/g, " ");
  const name = quoted(facts.detail?.name) ?? quoted(facts.detail?.email);
  return name ? `${kind} ${name}` : `${kind} ${facts.entityId ?? ""}`.trim();
}

type Template = (facts: AuditFacts, record: string, d: Record<string, unknown>) => string;

const TEMPLATES: Record<string, Template> = {
  "created": (_f, r) => `created ${r}`,
  "updated": (_f, r) => `changed ${r}`,
  "deleted": (_f, r) => `deleted ${r}`,
  "uploaded": (_f, r, d) => `uploaded ${r}${d.samples !== undefined ? ` (${Number(d.samples).toLocaleString("en-GB")} samples)` : ""}`,
  "time-zone-changed": (_f, _r, d) => `set the organisation's time zone${d.from && d.to ? ` from ${str(d.from)} to ${str(d.to)}` : ""}`,
  "appended": (_f, r, d) => `appended data to ${r}${d.added !== undefined ? ` (${Number(d.added).toLocaleString("en-GB")} samples)` : ""}`,
  "replaced": (_f, r, d) => `replaced the data of ${r}${d.toVersion !== undefined ? ` (data version ${str(d.toVersion)})` : ""}`,
  "run": (_f, r, d) => `ran ${r}${d.crossingId !== undefined ? ` on crossing ${str(d.crossingId)}` : ""}${d.verdict ? `: verdict ${str(d.verdict)}` : ""}`,
  "details-updated": (_f, r) => `changed the span and marking details of ${r}`,
  "temperature-normals-updated": (_f, r, d) => (d.monthlyC ? `set the monthly normal temperatures of ${r}${d.source ? ` (source: ${str(d.source)})` : ""}` : `cleared the monthly normal temperatures of ${r}`),
  "invited": (_f, r, d) => `invited ${r}${d.role ? ` as ${str(d.role)}` : ""}`,
  "role-changed": (_f, r, d) => `changed the role of ${r}${d.from && d.to ? ` from ${str(d.from)} to ${str(d.to)}` : ""}`,
  "deactivated": (_f, r) => `deactivated ${r}`,
  "reactivated": (_f, r) => `reactivated ${r}`,
  "activated": (_f, r) => `activated ${r}`,
  "reset-requested": () => "asked for a password reset",
  "password-reset": () => "set a new password from a reset link",
  "invitation-accepted": () => "accepted the invitation and set a password",
  "retired": (_f, r) => `retired ${r}`,
  "restored": (_f, r) => `brought back ${r}`,
  "revoked": (_f, r) => `revoked ${r}`,
  "taken-over": (_f, r) => `took over ${r} (its creator had been deactivated)`,
  // Rule book (app/services/rule-book.server.ts): the detail names the rule and the source checked.
  "confirmed": (_f, r, d) => `confirmed ${r}${d.against ? ` against ${str(d.against)}` : ""}${d.confirmedOn ? ` (checked on ${str(d.confirmedOn)})` : ""}`,
  "overridden": (_f, r, d) => `changed the value of ${r}${d.against ? ` and confirmed it against ${str(d.against)}` : ""}${d.confirmedOn ? ` (checked on ${str(d.confirmedOn)})` : ""}`,
  // Review moves (app/services/reviews.server.ts); the detail names the crossing and carries the comment.
  "submit": (_f, r, d) => `submitted ${reviewed(r, d)} for sign-off${said(d)}`,
  "approve": (_f, r, d) => `approved ${reviewed(r, d)}${d.decision ? ` (${str(d.decision)?.replace(/-/g, " ")})` : ""}${said(d)}`,
  "return": (_f, r, d) => `returned ${reviewed(r, d)} for rework${said(d)}`,
  "reopen": (_f, r, d) => `reopened the review of ${reviewed(r, d)} to draft${said(d)}`,
  "stale": (_f, r, d) => `marked the approval of ${reviewed(r, d)} out of date${Array.isArray(d.reasons) ? `: ${d.reasons.join("; ")}` : ""}`,
};

function reviewed(record: string, d: Record<string, unknown>): string {
  return quoted(d.crossing) ? `crossing ${quoted(d.crossing)}` : record;
}
function said(d: Record<string, unknown>): string {
  return str(d.comment) ? `: "${str(d.comment)}"` : "";
}

/** One sentence for an audit entry; unknown actions still read as a sentence. */
export function describeAuditEntry(facts: AuditFacts): string {
  const verb = facts.action.includes(".") ? facts.action.slice(facts.action.indexOf(".") + 1) : facts.action;
  const record = recordName(facts);
  const template = TEMPLATES[verb];
  const what = template ? template(facts, record, facts.detail ?? {}) : `${verb.replace(/[-_.]/g, " ")} — ${record}`;
  return `${facts.who} ${what}.`;
}
