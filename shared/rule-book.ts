// The rule book's words: what a rule's source looks like, how its status is said in plain
// words, and which editions of a document have been replaced. Used by lib/markers (the values),
// the rule-book service and pages, and the crossing page. Definitions in docs/rule-book.md.
import { z } from "zod";

/** How sure the organisation is of a rule; never "from memory" on a page (docs/rule-book.md). */
export const RULE_STATUSES = ["published", "common practice", "unconfirmed"] as const;
export type RuleStatus = (typeof RULE_STATUSES)[number];

/** Where a rule comes from, and who confirmed it; every rule-table entry carries these fields. */
export const ruleSourceSchema = z.object({
  key: z.string().regex(/^[a-z0-9.-]+$/),
  title: z.string(),
  rule: z.string(),
  document: z.string(),
  edition: z.string().nullable(),
  paragraph: z.string().nullable(),
  status: z.enum(RULE_STATUSES),
  /** First words of the quoted text the value was checked against. */
  quote: z.string().nullable(),
  confirmedBy: z.string().nullable().default(null),
  /** ISO date (YYYY-MM-DD) of the confirmation. */
  confirmedOn: z.string().nullable().default(null),
});
export type RuleSource = z.infer<typeof ruleSourceSchema>;
export const RULE_SOURCE_FIELDS = Object.keys(ruleSourceSchema.shape) as (keyof RuleSource)[];

interface EditionFacts {
  current: string;
  /** Edition → when it was replaced. */
  replaced: Record<string, string>;
}

/** Editions known to Duskline (docs/rule-book.md). A document not listed is not judged. */
export const EDITIONS: Record<string, EditionFacts> = {
  "AC 70/7460-1": { current: "M", replaced: { K: "December 2015", L: "2020" } },
};

/** "AC 70/7460-1K ¶34.a(1)"; a one-letter edition is written as the circular's suffix. */
export function citation(source: Pick<RuleSource, "document" | "edition" | "paragraph">): string {
  const edition = source.edition ? (/^[A-Z]$/.test(source.edition) ? source.edition : ` (${source.edition})`) : "";
  return `${source.document}${edition}${source.paragraph ? ` ${source.paragraph}` : ""}`;
}

function replacedNote(source: Pick<RuleSource, "document" | "edition">): string | null {
  const facts = EDITIONS[source.document];
  const when = source.edition ? facts?.replaced[source.edition] : undefined;
  return when ? `edition ${source.edition} was replaced in ${when} (the current edition is ${facts!.current})` : null;
}

/** A rule's status in plain words, as pages and reports show it. */
export function statusWords(source: RuleSource): string {
  const cited = citation(source);
  const quote = source.quote ? ` (“${source.quote}…”)` : "";
  if (source.confirmedBy && source.confirmedOn) return `confirmed by ${source.confirmedBy} on ${source.confirmedOn} against ${cited}${quote}`;
  const replaced = replacedNote(source);
  switch (source.status) {
    case "published":
      return `published: checked against ${cited}${quote}${replaced ? `; ${replaced}, so confirm it against the current edition` : ""}`;
    case "common practice":
      return "common practice: a trade rule of thumb, not taken from a document";
    case "unconfirmed":
      return `unconfirmed: not yet checked against the text of ${cited}; confirm it in the rule book`;
  }
}

/** True when the rule still needs someone to check it against the current text. */
export function needsConfirmation(source: RuleSource): boolean {
  if (source.confirmedBy) return false;
  return source.status === "unconfirmed" || replacedNote(source) !== null;
}

/** Sentences about the editions a set of rules cites: replaced editions, and several editions of one document. */
export function editionFindings(sources: RuleSource[]): string[] {
  const findings: string[] = [];
  const byDocument = new Map<string, Set<string>>();
  for (const s of sources) {
    if (!s.edition) continue;
    byDocument.set(s.document, (byDocument.get(s.document) ?? new Set()).add(s.edition));
  }
  for (const [document, editions] of byDocument) {
    const list = [...editions].sort();
    if (list.length > 1) findings.push(`The rules used mix editions ${list.join(" and ")} of ${document}; confirm them against one current edition.`);
    for (const edition of list) {
      const replaced = replacedNote({ document, edition });
      if (replaced) findings.push(`Rules cite ${document}${edition}: ${replaced}.`);
    }
  }
  return findings;
}

const ISO_DATE = /^\d{4}-\d{2}-\d{2}$/;
const realDate = (v: string) => ISO_DATE.test(v) && new Date(`${v}T00:00:00Z`).toISOString().slice(0, 10) === v;

/** Confirming a rule against one's own copy of the text, optionally correcting its numbers. */
export const ruleConfirmSchema = z.object({
  edition: z.string().trim().min(1, "Give the edition you checked against (e.g. M).").max(100, "Keep the edition under 100 characters."),
  paragraph: z.string().trim().min(1, "Give the paragraph you checked (e.g. ¶3.5.1.3).").max(200, "Keep the paragraph under 200 characters."),
  confirmedOn: z
    .string({ error: "Give the date of the check as YYYY-MM-DD." })
    .refine(realDate, "Give the date of the check as YYYY-MM-DD.")
    .refine((v) => !realDate(v) || Date.parse(`${v}T00:00:00Z`) <= Date.now() + 86_400_000, "The date of the check cannot be in the future."),
  quote: z.string().trim().max(300, "Keep the quotation's first words under 300 characters.").optional(),
  note: z.string().trim().max(2000, "Keep the note under 2,000 characters.").optional(),
  /** New numbers by value path; a path the rule does not have is refused. */
  numbers: z.record(z.string(), z.number({ error: "Enter a number." }).finite("Enter a number.")).default({}),
});
export type RuleConfirmInput = z.infer<typeof ruleConfirmSchema>;

/** Form field of a rule's number: "maxSpacing.value" → "value_maxSpacing_value". */
export const numberField = (path: string) => `value_${path.replace(/\./g, "_")}`;

/** The confirm form's fields → the schema's input, still text (parseForm decodes the numbers). */
export function ruleConfirmFromForm(form: Record<string, string>, paths: string[]): Record<string, unknown> {
  const numbers: Record<string, string> = {};
  for (const path of paths) {
    const text = form[numberField(path)];
    if (text !== undefined) numbers[path] = text;
  }
  const optional = (v: string | undefined) => (v && v.trim() ? v : undefined);
  return { edition: form.edition ?? "", paragraph: form.paragraph ?? "", confirmedOn: form.confirmedOn ?? "", quote: optional(form.quote), note: optional(form.note), numbers };
}
