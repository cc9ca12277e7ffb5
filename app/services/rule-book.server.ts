// The organisation's rule book: the rule tables every layout uses, stored per organisation,
// seeded from the shipped defaults (data/rules/*.json) the first time they are read, confirmed
// or overridden by admins and consultants with the history kept. Definitions: docs/rule-book.md.
import { ZodError } from "zod";
import { RuleBookChange, RuleBookRule } from "../../db/models";
import { DEFAULT_RULES, type RuleTables } from "../../lib/markers";
import { numericValues, ruleEntries, withNumbers, withRules, type RuleEntry } from "../../lib/rulebook/book";
import { canonicalJson } from "../../lib/review/staleness";
import { citation, numberField, type RuleConfirmInput, type RuleSource } from "../../shared/rule-book";
import { db } from "../utils/db.server";
import { audit } from "./audit.server";
import { InputError, NotFoundError } from "./errors.server";
import { noticeStaleApprovals } from "./reviews.server";

export interface RuleBookActor {
  id: number | null;
  organisationId: number;
  name: string;
}

const DEFAULT_ENTRIES = ruleEntries(DEFAULT_RULES);

function entryOf(row: RuleBookRule): RuleEntry {
  return {
    ruleSet: row.ruleSet,
    values: row.ruleValues,
    source: {
      key: row.ruleKey,
      title: row.title,
      rule: row.ruleText,
      document: row.document,
      edition: row.edition,
      paragraph: row.paragraph,
      status: row.status,
      quote: row.quote,
      confirmedBy: row.confirmedByName,
      confirmedOn: row.confirmedOn,
    },
  };
}

function seedRow(organisationId: number, entry: RuleEntry) {
  const s = entry.source;
  return { organisationId, ruleKey: s.key, ruleSet: entry.ruleSet, title: s.title, ruleText: s.rule, ruleValues: entry.values, document: s.document, edition: s.edition, paragraph: s.paragraph, status: s.status, quote: s.quote, confirmedBy: null, confirmedByName: null, confirmedOn: null };
}

/** The organisation's rule rows, seeding any shipped rule it does not have yet (a new organisation, or a rule added in a release). */
async function ruleRows(organisationId: number): Promise<RuleBookRule[]> {
  db();
  const rows = await RuleBookRule.findAll({ where: { organisationId }, order: [["id", "ASC"]] });
  const have = new Set(rows.map((r) => r.ruleKey));
  const missing = DEFAULT_ENTRIES.filter((e) => !have.has(e.source.key));
  if (!missing.length) return rows;
  await RuleBookRule.bulkCreate(missing.map((e) => seedRow(organisationId, e)), { ignoreDuplicates: true });
  return RuleBookRule.findAll({ where: { organisationId }, order: [["id", "ASC"]] });
}

/** Every rule of the organisation's book, in the order of the shipped tables. */
export async function ruleBookEntries(organisationId: number): Promise<RuleEntry[]> {
  const rows = await ruleRows(organisationId);
  const order = new Map(DEFAULT_ENTRIES.map((e, i) => [e.source.key, i]));
  return rows
    .filter((r) => order.has(r.ruleKey))
    .map(entryOf)
    .sort((a, b) => order.get(a.source.key)! - order.get(b.source.key)!);
}

/**
 * One rule's source as the organisation's book has it, or as shipped while the book has not been
 * seeded yet: for a page that cites a single rule without reading and checking the whole book.
 */
export async function ruleSourceOf(organisationId: number, source: RuleSource): Promise<RuleSource> {
  db();
  const row = await RuleBookRule.findOne({ where: { organisationId, ruleKey: source.key } });
  return row ? entryOf(row).source : source;
}

/** The rule tables a layout of this organisation uses. */
export async function ruleTables(organisationId: number): Promise<RuleTables> {
  return withRules(DEFAULT_RULES, await ruleBookEntries(organisationId));
}

/** One rule with its history, newest first. */
export async function ruleWithHistory(organisationId: number, key: string) {
  const rows = await ruleRows(organisationId);
  const row = rows.find((r) => r.ruleKey === key);
  if (!row) throw new NotFoundError(`Rule ${key}`);
  const changes = await RuleBookChange.findAll({ where: { organisationId, ruleId: row.id }, order: [["id", "DESC"]] });
  return {
    entry: entryOf(row),
    history: changes.map((c) => ({
      action: c.action,
      by: c.actorName,
      at: c.createdAt.toISOString(),
      confirmedOn: c.confirmedOn,
      valuesBefore: c.valuesBefore,
      valuesAfter: c.valuesAfter,
      statusBefore: c.statusBefore,
      sourceBefore: c.sourceBefore,
      sourceAfter: c.sourceAfter,
      note: c.note,
    })),
  };
}

/**
 * Confirms a rule against the confirmer's copy of the text (edition, paragraph, date, who), and
 * overrides its numbers where the input changes them (the old values kept in the history).
 * Audited; an approval that relied on a changed value goes stale.
 */
export async function confirmRule(actor: RuleBookActor, key: string, input: RuleConfirmInput): Promise<{ overridden: boolean }> {
  const sequelize = db();
  const rows = await ruleRows(actor.organisationId);
  if (!rows.some((r) => r.ruleKey === key)) throw new NotFoundError(`Rule ${key}`);
  let overridden = false;
  await sequelize.transaction(async (transaction) => {
    const row = (await RuleBookRule.findOne({ where: { organisationId: actor.organisationId, ruleKey: key }, lock: transaction.LOCK.UPDATE, transaction }))!;
    const paths = new Set(numericValues(row.ruleValues).map((n) => n.path));
    const unknown = Object.keys(input.numbers).find((p) => !paths.has(p));
    if (unknown) throw new InputError(`The rule has no number "${unknown}".`, numberField(unknown), 400);
    const values = withNumbers(row.ruleValues, input.numbers);
    overridden = canonicalJson(values) !== canonicalJson(row.ruleValues);
    const source: RuleSource = { ...entryOf(row).source, edition: input.edition, paragraph: input.paragraph, quote: input.quote ?? null, status: "published", confirmedBy: actor.name, confirmedOn: input.confirmedOn };
    if (overridden) checkTables(rows, key, values, source, Object.keys(input.numbers));
    const before = entryOf(row);
    await row.update(
      { ruleValues: values, edition: source.edition, paragraph: source.paragraph, quote: source.quote, status: "published", confirmedBy: actor.id, confirmedByName: actor.name, confirmedOn: input.confirmedOn },
      { transaction },
    );
    await RuleBookChange.create(
      {
        organisationId: actor.organisationId,
        ruleId: row.id,
        action: overridden ? "override" : "confirm",
        valuesBefore: before.values,
        valuesAfter: values,
        statusBefore: before.source.status,
        sourceBefore: citation(before.source),
        sourceAfter: citation(source),
        confirmedOn: input.confirmedOn,
        note: input.note ?? null,
        userId: actor.id,
        actorName: actor.name,
      },
      { transaction },
    );
    await audit(
      actor,
      overridden ? "rule.overridden" : "rule.confirmed",
      "rule",
      key,
      { name: row.title, key, against: citation(source), confirmedOn: input.confirmedOn, ...(overridden ? { before: before.values, after: values } : {}) },
      transaction,
    );
  });
  if (overridden) await noticeStaleApprovals(actor.organisationId);
  return { overridden };
}

/** The whole book must still make valid tables with the new values (e.g. ICAO diameters in increasing order). */
function checkTables(rows: RuleBookRule[], key: string, values: Record<string, unknown>, source: RuleSource, changed: string[]) {
  const entries = rows.map((r) => (r.ruleKey === key ? { ruleSet: r.ruleSet, values, source } : entryOf(r)));
  try {
    withRules(DEFAULT_RULES, entries);
  } catch (error) {
    if (!(error instanceof ZodError)) throw error;
    const issue = error.issues[0];
    const path = issue.path.map(String);
    const field = changed.find((p) => path.join(".").endsWith(p)) ?? changed[0];
    throw new InputError(`The new value is not accepted: ${issue.message}.`, field ? numberField(field) : "form", 400);
  }
}
