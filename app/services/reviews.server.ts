// A crossing's review and sign-off: moves decided by lib/review/machine, what an approval
// covered (lib/review/staleness), history, audit and notifications through the outbox.
// The crossing page and the API both call moveReview / reviewOf.
import { Op, type Transaction } from "sequelize";
import { Circuit, Crossing, CrossingReview, ReviewEvent, User } from "../../db/models";
import { decideMove } from "../../lib/review/machine";
import { reviewMessage, type ReviewMessageKind } from "../../lib/review/messages";
import { fingerprint, staleReasons, type ApprovalSnapshot } from "../../lib/review/staleness";
import { ruleEntries } from "../../lib/rulebook/book";
import type { Role } from "../../shared/roles";
import type { ReviewJson, ReviewMove, ReviewState } from "../../shared/review-schemas";
import { db } from "../utils/db.server";
import { appUrl } from "../utils/env.server";
import { audit } from "./audit.server";
import { crossingDetailsJson, getCircuit, getCrossing } from "./circuits.server";
import { markingPlan } from "./crossing-marking.server";
import { reliedReferences, supportLightsInUse } from "../../lib/crossings/plan";
import { ReviewMoveError } from "./errors.server";
import { crossingOptionsView, optionValues, listOptions } from "./lighting-options.server";
import { enqueueMail } from "./outbox.server";
import { emitWebhookEvent } from "./webhooks.server";
import { getPolicy } from "./policy.server";
import { latestStudyOfCrossing } from "./studies.server";

export interface ReviewActor {
  id: number | null;
  organisationId: number;
  name: string;
  role: Role;
}

/** Today's version of everything an approval covers, with the option `optionId` costed as today. */
async function currentSnapshot(organisationId: number, crossing: Crossing, optionId: number | null) {
  const circuit = await getCircuit(organisationId, crossing.circuitId);
  const marking = await markingPlan(crossing, circuit);
  const [view, study, policy, rows] = await Promise.all([
    crossingOptionsView(organisationId, crossing, marking),
    latestStudyOfCrossing(organisationId, crossing.id),
    getPolicy(organisationId),
    listOptions(organisationId, crossing.id),
  ]);
  const row = optionId == null ? null : rows.find((o) => o.id === optionId);
  const costed = row ? view.comparison.rows.find((r) => r.id === String(row.id)) : undefined;
  const { ruleSet, ...details } = crossingDetailsJson(crossing);
  const snapshot: ApprovalSnapshot = {
    studyId: study?.id ?? null,
    studyInputs: study ? fingerprint(study.inputs) : null,
    option:
      row && costed
        ? { id: row.id, name: row.name, fingerprint: fingerprint(optionValues(row)), presentValue: costed.totalPV, equivalentAnnualCost: costed.equivalentAnnualCost, currency: view.currency }
        : null,
    policy: fingerprint(policy),
    ruleSet,
    spanLength: { value: crossing.spanLengthValue, unit: crossing.spanLengthUnit },
    details: fingerprint(details),
    rules: Object.fromEntries(ruleEntries(marking.rules).map((e) => [e.source.key, { title: e.source.title, values: fingerprint(e.values) }])),
  };
  // The rules the layout and the wires' check relied on: only a change to one of these makes an approval stale.
  const supportLit = supportLightsInUse(marking.litSuitability, rows.map((o) => o.kind));
  const reliedKeys = new Set(reliedReferences(marking.plan, marking.litSuitability, supportLit).map((r) => r.key));
  const recommendedId = view.comparison.recommendation?.id ? Number(view.comparison.recommendation.id) : null;
  return { snapshot, reliedKeys, study, circuit, recommendedId, optionIds: new Set(rows.map((o) => o.id)), optionNames: new Map(rows.map((o) => [o.id, o.name])) };
}

/** What an approval records: today's snapshot with only the rules the layout relied on. */
function approvalSnapshot({ snapshot, reliedKeys }: { snapshot: ApprovalSnapshot; reliedKeys: Set<string> }): ApprovalSnapshot {
  return { ...snapshot, rules: Object.fromEntries(Object.entries(snapshot.rules ?? {}).filter(([key]) => reliedKeys.has(key))) };
}

function notFoundRow(organisationId: number, crossingId: number) {
  return CrossingReview.build({ crossingId, organisationId });
}

async function reviewRow(organisationId: number, crossingId: number, transaction?: Transaction) {
  return (await CrossingReview.findOne({ where: { crossingId, organisationId }, transaction })) ?? notFoundRow(organisationId, crossingId);
}

/** The review object of the page and the API; staleness is computed now from the data. */
export async function reviewOf(organisationId: number, crossing: Crossing): Promise<ReviewJson> {
  db();
  const [row, events] = await Promise.all([
    reviewRow(organisationId, crossing.id),
    ReviewEvent.findAll({ where: { organisationId, crossingId: crossing.id }, order: [["id", "ASC"]] }),
  ]);
  let reasons: string[] = [];
  if (row.state === "approved" && row.snapshot) {
    const { snapshot } = await currentSnapshot(organisationId, crossing, row.optionId ?? null);
    reasons = staleReasons(row.snapshot, snapshot);
  }
  return {
    state: row.state ?? "draft",
    stale: reasons.length > 0,
    staleReasons: reasons,
    decision: row.decision ?? null,
    approvedBy: row.approvedByName ?? null,
    approvedAt: row.approvedAt?.toISOString() ?? null,
    submittedBy: row.submittedByName ?? null,
    studyId: row.studyId ?? null,
    optionId: row.optionId ?? null,
    history: events.map((e) => ({
      from: e.fromState,
      to: e.toState,
      action: e.action,
      by: e.actorName,
      at: e.createdAt.toISOString(),
      comment: e.comment,
      decision: e.decision,
      optionId: e.optionId,
    })),
  };
}

async function mailFacts(crossing: Crossing, circuit: Circuit, kind: ReviewMessageKind, facts: { verdict: string | null; decision: ReviewJson["decision"]; optionName: string | null; by: string; comment: string; staleReasons?: string[] }) {
  return reviewMessage({ kind, crossing: crossing.name, circuit: circuit.name, link: `${appUrl()}/crossings/${crossing.id}`, ...facts });
}

/** Makes one move (page or API), writing the state, its history, the audit entry and the e-mails in one transaction. */
export async function moveReview(actor: ReviewActor, crossingId: number, move: ReviewMove): Promise<ReviewJson> {
  const sequelize = db();
  const crossing = await getCrossing(actor.organisationId, crossingId);
  const before = await reviewRow(actor.organisationId, crossingId);
  const current = await currentSnapshot(actor.organisationId, crossing, null);
  const refuse = (message: string, status: 400 | 403 | 409 | 422, path?: string, state: ReviewState = before.state ?? "draft"): never => {
    throw new ReviewMoveError(message, status, state, path);
  };
  const check = (state: ReviewState) => {
    const outcome = decideMove(state, move.action, actor.role, { comment: move.comment, decision: move.decision, optionId: move.optionId });
    if (!outcome.ok) refuse(outcome.message, outcome.kind === "forbidden" ? 403 : outcome.kind === "illegal" ? 409 : 400, outcome.field ?? "form", state);
    return outcome as Extract<typeof outcome, { ok: true }>;
  };
  // Early answer without locks for the common refusals; decided again under the lock below.
  const first = check(before.state ?? "draft");

  let optionId: number | null = first.optionId;
  if (move.action === "submit" && !current.study) refuse("Run a feasibility study of this crossing before submitting it for sign-off.", 422, "form");
  if (move.action === "approve") {
    if (first.decision === "recommended") {
      if (current.recommendedId == null) refuse("No option is recommended for this crossing (none is rated go); choose another option or do not proceed.", 400, "decision");
      optionId = current.recommendedId;
    }
    if (first.decision === "other" && !current.optionIds.has(optionId!)) refuse(`Option ${optionId} is not an option of this crossing.`, 400, "optionId");
  }
  const approved = move.action === "approve" ? approvalSnapshot(await currentSnapshot(actor.organisationId, crossing, optionId)) : null;

  await sequelize.transaction(async (transaction) => {
    await CrossingReview.bulkCreate([{ crossingId, organisationId: actor.organisationId }], { ignoreDuplicates: true, transaction });
    const row = await CrossingReview.findOne({ where: { crossingId }, lock: transaction.LOCK.UPDATE, transaction });
    const outcome = check(row!.state);
    const now = new Date();
    const change: Partial<CrossingReview> = { state: outcome.to };
    if (move.action === "submit") Object.assign(change, { submittedBy: actor.id, submittedByName: actor.name, submittedAt: now, decision: null, optionId: null });
    if (move.action === "return") Object.assign(change, { decision: outcome.decision, optionId: null });
    if (move.action === "approve") {
      Object.assign(change, { decision: outcome.decision, optionId, studyId: approved!.studyId, snapshot: approved, approvedBy: actor.id, approvedByName: actor.name, approvedAt: now, staleNotifiedAt: null });
    }
    if (move.action === "reopen") Object.assign(change, { decision: null, optionId: null, studyId: null, snapshot: null, approvedBy: null, approvedByName: null, approvedAt: null, staleNotifiedAt: null });
    await row!.update(change, { transaction });
    await ReviewEvent.create(
      { organisationId: actor.organisationId, crossingId, action: move.action, fromState: outcome.from, toState: outcome.to, decision: outcome.decision, optionId, comment: outcome.comment, userId: actor.id, actorName: actor.name },
      { transaction },
    );
    await audit(actor, `review.${move.action}`, "crossing", crossingId, { from: outcome.from, to: outcome.to, decision: outcome.decision, optionId, comment: outcome.comment, crossing: crossing.name }, transaction);
    await emitWebhookEvent(
      actor.organisationId,
      "review.changed",
      { crossingId, crossing: crossing.name, action: move.action, from: outcome.from, to: outcome.to, decision: outcome.decision ?? null, url: `/api/v1/crossings/${crossingId}/review` },
      transaction,
    );

    const facts = { verdict: current.study?.verdict ?? null, decision: outcome.decision, optionName: optionId != null ? (current.optionNames.get(optionId) ?? null) : null, by: actor.name, comment: outcome.comment };
    const recipients: string[] = [];
    let kind: ReviewMessageKind | null = null;
    if (move.action === "submit") {
      kind = "submitted";
      const managers = await User.findAll({ where: { organisationId: actor.organisationId, role: "manager", active: true }, transaction });
      recipients.push(...managers.map((m) => m.email));
    } else if (move.action === "approve" || move.action === "return") {
      kind = move.action === "approve" ? "approved" : "returned";
      const submitter = row!.submittedBy ? await User.findOne({ where: { id: row!.submittedBy, active: true }, transaction }) : null;
      if (submitter) recipients.push(submitter.email);
    }
    if (kind) {
      const message = await mailFacts(crossing, current.circuit, kind, facts);
      for (const to of recipients) await enqueueMail({ organisationId: actor.organisationId, to, ...message }, transaction);
    }
  });
  return reviewOf(actor.organisationId, crossing);
}

/**
 * Called after anything an approval covers may have changed (a study run, an option edited or
 * deleted, the policy, the span or its details). An approval that has gone stale gets a history
 * entry, an audit entry and one e-mail to its approver. Staleness itself is always computed on
 * read, so a failure here loses only the notice, never the stale mark; it never fails the change.
 */
export async function noticeStaleApprovals(organisationId: number, crossingId?: number): Promise<void> {
  try {
    const sequelize = db();
    const rows = await CrossingReview.findAll({
      where: { organisationId, state: "approved", staleNotifiedAt: null, ...(crossingId ? { crossingId } : {}) },
      include: [{ model: Crossing, required: true }],
    });
    for (const row of rows) {
      const crossing = (row as unknown as { Crossing: Crossing }).Crossing;
      const current = await currentSnapshot(organisationId, crossing, row.optionId ?? null);
      const reasons = row.snapshot ? staleReasons(row.snapshot, current.snapshot) : [];
      if (!reasons.length) continue;
      await sequelize.transaction(async (transaction) => {
        const locked = await CrossingReview.findOne({ where: { crossingId: row.crossingId, state: "approved", staleNotifiedAt: null }, lock: transaction.LOCK.UPDATE, transaction });
        if (!locked) return;
        await locked.update({ staleNotifiedAt: new Date() }, { transaction });
        const comment = `Approval out of date: ${reasons.join("; ")}.`;
        await ReviewEvent.create(
          { organisationId, crossingId: row.crossingId, action: "stale", fromState: "approved", toState: "approved", decision: locked.decision ?? null, optionId: locked.optionId ?? null, comment, userId: null, actorName: "Duskline" },
          { transaction },
        );
        await audit({ id: null, organisationId }, "review.stale", "crossing", row.crossingId, { reasons, crossing: crossing.name }, transaction);
        await emitWebhookEvent(organisationId, "approval.stale", { crossingId: row.crossingId, crossing: crossing.name, reasons, url: `/api/v1/crossings/${row.crossingId}/review` }, transaction);
        const approver = locked.approvedBy ? await User.findOne({ where: { id: locked.approvedBy, active: true }, transaction }) : null;
        if (approver) {
          const message = await mailFacts(crossing, current.circuit, "stale", {
            verdict: current.study?.verdict ?? null,
            decision: locked.decision ?? null,
            optionName: locked.snapshot?.option?.name ?? null,
            by: "Duskline",
            comment: "",
            staleReasons: reasons,
          });
          await enqueueMail({ organisationId, to: approver.email, ...message }, transaction);
        }
      });
    }
  } catch (error) {
    console.error("[review] could not record stale approvals", error);
  }
}

/** Why an approved review (loaded with its Crossing) no longer matches today's data; empty when it still does. */
async function staleReasonsOf(organisationId: number, row: CrossingReview): Promise<string[]> {
  if (row.state !== "approved" || !row.snapshot) return [];
  const crossing = (row as unknown as { Crossing: Crossing }).Crossing;
  return staleReasons(row.snapshot, (await currentSnapshot(organisationId, crossing, row.optionId ?? null)).snapshot);
}

export interface ReviewSummary {
  state: ReviewState;
  stale: boolean;
  staleReasons: string[];
  decision: ReviewJson["decision"];
}

/** Each crossing's review state and staleness (crossings never reviewed are absent: draft). */
export async function reviewSummaries(organisationId: number): Promise<Map<number, ReviewSummary>> {
  db();
  const rows = await CrossingReview.findAll({ where: { organisationId }, include: [{ model: Crossing, required: true }] });
  const out = new Map<number, ReviewSummary>();
  for (const row of rows) {
    const reasons = await staleReasonsOf(organisationId, row);
    out.set(row.crossingId, { state: row.state ?? "draft", stale: reasons.length > 0, staleReasons: reasons, decision: row.decision ?? null });
  }
  return out;
}

export interface ReviewWorkItem {
  crossingId: number;
  crossing: string;
  circuit: string;
  state: ReviewState;
  by: string | null;
  at: string | null;
  staleReasons: string[];
}

/** What waits for a person: managers — awaiting a decision and stale approvals; engineers and consultants — returned to them. */
export async function reviewWork(user: ReviewActor) {
  db();
  const include = [{ model: Crossing, required: true, include: [{ model: Circuit, attributes: ["name"] }] }];
  const item = (row: CrossingReview, reasons: string[] = []): ReviewWorkItem => {
    const crossing = (row as unknown as { Crossing: Crossing & { Circuit?: Circuit } }).Crossing;
    return {
      crossingId: row.crossingId,
      crossing: crossing.name,
      circuit: crossing.Circuit?.name ?? "",
      state: row.state,
      by: row.state === "approved" ? (row.approvedByName ?? null) : (row.submittedByName ?? null),
      at: (row.state === "approved" ? row.approvedAt : row.submittedAt)?.toISOString() ?? null,
      staleReasons: reasons,
    };
  };
  if (user.role === "manager") {
    const [awaiting, approved] = await Promise.all([
      CrossingReview.findAll({ where: { organisationId: user.organisationId, state: "submitted" }, include, order: [["submittedAt", "ASC"]] }),
      CrossingReview.findAll({ where: { organisationId: user.organisationId, state: "approved", snapshot: { [Op.ne]: null } }, include, order: [["approvedAt", "DESC"]] }),
    ]);
    const stale: ReviewWorkItem[] = [];
    for (const row of approved) {
      const reasons = await staleReasonsOf(user.organisationId, row);
      if (reasons.length) stale.push(item(row, reasons));
    }
    return { awaiting: awaiting.map((r) => item(r)), stale, returned: [] as ReviewWorkItem[] };
  }
  if ((user.role === "engineer" || user.role === "consultant") && user.id != null) {
    const returned = await CrossingReview.findAll({ where: { organisationId: user.organisationId, state: "returned", submittedBy: user.id }, include, order: [["updatedAt", "DESC"]] });
    return { awaiting: [] as ReviewWorkItem[], stale: [] as ReviewWorkItem[], returned: returned.map((r) => item(r)) };
  }
  return { awaiting: [] as ReviewWorkItem[], stale: [] as ReviewWorkItem[], returned: [] as ReviewWorkItem[] };
}
