// A crossing's review as a state machine: which move is possible from which state, by whom, and
// what it must carry. Pure: the service loads the state and the actor's role, asks here, and
// writes what comes back.
//
// Administrators do not take part (docs/decisions/004-review-roles.md): sign-off is the
// manager's, preparation the engineer's or consultant's, whatever `hasRole` allows elsewhere.
import type { Role } from "../../shared/roles";
import type { ReviewAction, ReviewDecision, ReviewState } from "../../shared/review-schemas";

interface Edge {
  from: ReviewState;
  action: ReviewAction;
  to: ReviewState;
  roles: readonly Role[];
  /** Said in refusals: "only <who> may <what>". */
  who: string;
  what: string;
}

const PREPARERS = ["engineer", "consultant"] as const;
const SIGNERS = ["manager"] as const;

export const REVIEW_EDGES: readonly Edge[] = [
  { from: "draft", action: "submit", to: "submitted", roles: PREPARERS, who: "an engineer or a consultant", what: "submit a draft for sign-off (with a note)" },
  { from: "submitted", action: "approve", to: "approved", roles: SIGNERS, who: "a manager", what: "approve a submitted crossing (with a decision and a comment)" },
  { from: "submitted", action: "return", to: "returned", roles: SIGNERS, who: "a manager", what: "return a submitted crossing (with a comment)" },
  { from: "returned", action: "reopen", to: "draft", roles: PREPARERS, who: "an engineer or a consultant", what: "take a returned crossing back to draft" },
  { from: "approved", action: "reopen", to: "draft", roles: SIGNERS, who: "a manager", what: "reopen an approved crossing to draft (with a reason)" },
];

export interface MoveInput {
  comment: string;
  decision?: ReviewDecision;
  optionId?: number;
}

export type MoveOutcome =
  | { ok: true; from: ReviewState; to: ReviewState; decision: ReviewDecision | null; optionId: number | null; comment: string }
  /** forbidden → 403 (the role may never make this move here); illegal → 409 (not from this state); invalid → 400 (missing note, decision…). */
  | { ok: false; kind: "forbidden" | "illegal" | "invalid"; message: string; field?: "comment" | "decision" | "optionId" };

const ROLE_WORDS: Record<Role, string> = { admin: "an administrator", engineer: "an engineer", consultant: "a consultant", manager: "a manager" };

function describe(action: ReviewAction): string {
  return REVIEW_EDGES.filter((e) => e.action === action)
    .map((e) => `only ${e.who} may ${e.what}`)
    .join("; ");
}

/** Moves the role may make from the state (for the page's buttons). */
export function availableMoves(state: ReviewState, role: Role): ReviewAction[] {
  return REVIEW_EDGES.filter((e) => e.from === state && e.roles.includes(role)).map((e) => e.action);
}

/** Decides one move. The order of refusals: role (403) before state (409) before content (400). */
export function decideMove(state: ReviewState, action: ReviewAction, role: Role, input: MoveInput): MoveOutcome {
  const edges = REVIEW_EDGES.filter((e) => e.action === action);
  if (role === "admin") {
    return { ok: false, kind: "forbidden", message: `Administrators manage the organisation and take no part in review: ${describe(action)}.` };
  }
  if (!edges.some((e) => e.roles.includes(role))) {
    return { ok: false, kind: "forbidden", message: `As ${ROLE_WORDS[role]} you may not ${action}: ${describe(action)}.` };
  }
  const edge = edges.find((e) => e.from === state);
  if (!edge) {
    const froms = edges.map((e) => e.from).join(" or ");
    return { ok: false, kind: "illegal", message: `The review is ${state}; "${action}" is possible only from ${froms}.` };
  }
  if (!edge.roles.includes(role)) {
    return { ok: false, kind: "forbidden", message: `As ${ROLE_WORDS[role]} you may not ${action} here: only ${edge.who} may ${edge.what}.` };
  }
  const comment = input.comment.trim();
  const needsComment = action !== "reopen" || state === "approved";
  if (needsComment && !comment) {
    const what = action === "submit" ? "a note for the manager" : action === "reopen" ? "the reason for reopening" : "a comment";
    return { ok: false, kind: "invalid", message: `Write ${what}.`, field: "comment" };
  }
  let decision: ReviewDecision | null = null;
  let optionId: number | null = null;
  if (action === "approve") {
    if (!input.decision) return { ok: false, kind: "invalid", message: "Choose a decision: fit the recommended option, fit another option, or do not proceed.", field: "decision" };
    decision = input.decision;
    if (decision === "other") {
      if (input.optionId == null) return { ok: false, kind: "invalid", message: "Choose which option to fit.", field: "optionId" };
      optionId = input.optionId;
    }
  } else if (action === "return" && input.decision) {
    // A return may say which way the manager leans; it records no option.
    decision = input.decision;
  }
  return { ok: true, from: state, to: edge.to, decision, optionId, comment };
}

/** For someone with no move here: who may move the review on from this state. */
export function whoMayMove(state: ReviewState): string {
  const edges = REVIEW_EDGES.filter((e) => e.from === state);
  return `The review is ${state}: ${edges.map((e) => `${e.who} may ${e.what}`).join("; ")}.`;
}
