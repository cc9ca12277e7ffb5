import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { availableMoves, decideMove } from "../../lib/review/machine";
import { ROLES, type Role } from "../../shared/roles";
import { REVIEW_ACTIONS, REVIEW_STATES, type ReviewAction, type ReviewState } from "../../shared/review-schemas";

// The rules as the issue states them, written out move by move (not derived from the machine).
const LEGAL: Record<string, ReviewState> = {
  "draft submit engineer": "submitted",
  "draft submit consultant": "submitted",
  "submitted approve manager": "approved",
  "submitted return manager": "returned",
  "returned reopen engineer": "draft",
  "returned reopen consultant": "draft",
  "approved reopen manager": "draft",
};
// Roles that may make the action from some state; any other role is refused with 403 wherever it tries.
const ACTION_ROLES: Record<ReviewAction, Role[]> = {
  submit: ["engineer", "consultant"],
  approve: ["manager"],
  return: ["manager"],
  reopen: ["engineer", "consultant", "manager"],
};
const FULL = { comment: "Looks right.", decision: "recommended" as const };

describe("review state machine: every state × action × role", () => {
  for (const state of REVIEW_STATES) {
    for (const action of REVIEW_ACTIONS) {
      for (const role of ROLES) {
        const key = `${state} ${action} ${role}`;
        it(key, () => {
          const outcome = decideMove(state, action, role, FULL);
          if (LEGAL[key]) {
            expect(outcome).toMatchObject({ ok: true, from: state, to: LEGAL[key] });
            return;
          }
          expect(outcome.ok).toBe(false);
          if (outcome.ok) return;
          if (role === "admin") {
            expect(outcome.kind).toBe("forbidden");
            expect(outcome.message).toMatch(/^Administrators .* take no part in review: only /);
          } else if (!ACTION_ROLES[action].includes(role)) {
            expect(outcome.kind).toBe("forbidden");
            expect(outcome.message).toMatch(/only (a manager|an engineer or a consultant) may/);
          } else if (!Object.keys(LEGAL).some((k) => k.startsWith(`${state} ${action} `))) {
            expect(outcome.kind).toBe("illegal");
            expect(outcome.message).toContain(`The review is ${state}`);
          } else {
            // The move exists from this state but for another role (reopen of an approved crossing by an engineer…).
            expect(outcome.kind).toBe("forbidden");
            expect(outcome.message).toContain("only ");
          }
        });
      }
    }
  }

  it("availableMoves lists exactly the legal moves of each role", () => {
    for (const state of REVIEW_STATES) {
      for (const role of ROLES) {
        const expected = REVIEW_ACTIONS.filter((a) => LEGAL[`${state} ${a} ${role}`]);
        expect(availableMoves(state, role)).toEqual(expected);
      }
    }
  });

  it("names who may do what in refusals", () => {
    const r = decideMove("submitted", "approve", "engineer", FULL);
    expect(r).toMatchObject({ ok: false, kind: "forbidden" });
    expect(!r.ok && r.message).toBe("As an engineer you may not approve: only a manager may approve a submitted crossing (with a decision and a comment).");
    const reopen = decideMove("approved", "reopen", "consultant", FULL);
    expect(!reopen.ok && reopen.message).toBe("As a consultant you may not reopen here: only a manager may reopen an approved crossing to draft (with a reason).");
    const twice = decideMove("approved", "approve", "manager", FULL);
    expect(twice).toMatchObject({ ok: false, kind: "illegal", message: 'The review is approved; "approve" is possible only from submitted.' });
  });
});

describe("what each move must carry", () => {
  it("submit needs a note", () => {
    expect(decideMove("draft", "submit", "engineer", { comment: "  " })).toMatchObject({ ok: false, kind: "invalid", field: "comment" });
    expect(decideMove("draft", "submit", "engineer", { comment: "Ready" })).toMatchObject({ ok: true, comment: "Ready", decision: null });
  });
  it("approve needs a comment and a decision; another option needs its id", () => {
    expect(decideMove("submitted", "approve", "manager", { comment: "", decision: "recommended" })).toMatchObject({ ok: false, field: "comment" });
    expect(decideMove("submitted", "approve", "manager", { comment: "ok" })).toMatchObject({ ok: false, kind: "invalid", field: "decision" });
    expect(decideMove("submitted", "approve", "manager", { comment: "ok", decision: "other" })).toMatchObject({ ok: false, field: "optionId" });
    expect(decideMove("submitted", "approve", "manager", { comment: "ok", decision: "other", optionId: 7 })).toMatchObject({ ok: true, decision: "other", optionId: 7 });
    expect(decideMove("submitted", "approve", "manager", { comment: "no", decision: "do-not-proceed", optionId: 7 })).toMatchObject({ ok: true, decision: "do-not-proceed", optionId: null });
  });
  it("return needs a comment", () => {
    expect(decideMove("submitted", "return", "manager", { comment: "" })).toMatchObject({ ok: false, field: "comment" });
    expect(decideMove("submitted", "return", "manager", { comment: "Re-run with the new profile" })).toMatchObject({ ok: true, to: "returned", optionId: null });
  });
  it("reopening an approval needs a reason; taking back a returned crossing does not", () => {
    expect(decideMove("approved", "reopen", "manager", { comment: "" })).toMatchObject({ ok: false, field: "comment" });
    expect(decideMove("returned", "reopen", "engineer", { comment: "" })).toMatchObject({ ok: true, to: "draft" });
  });
  it("any sequence of moves stays inside the four states and only follows legal edges", () => {
    fc.assert(
      fc.property(fc.array(fc.tuple(fc.constantFrom(...REVIEW_ACTIONS), fc.constantFrom(...ROLES)), { maxLength: 30 }), (moves) => {
        let state: ReviewState = "draft";
        for (const [action, role] of moves) {
          const r = decideMove(state, action, role, { comment: "c", decision: "recommended" });
          if (r.ok) {
            expect(LEGAL[`${state} ${action} ${role}`]).toBe(r.to);
            state = r.to;
          }
        }
        expect(REVIEW_STATES).toContain(state);
      }),
    );
  });
});
