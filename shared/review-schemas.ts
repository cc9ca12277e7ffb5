import { z } from "zod";

export const REVIEW_STATES = ["draft", "submitted", "approved", "returned"] as const;
export type ReviewState = (typeof REVIEW_STATES)[number];

export const REVIEW_ACTIONS = ["submit", "approve", "return", "reopen"] as const;
export type ReviewAction = (typeof REVIEW_ACTIONS)[number];

export const REVIEW_DECISIONS = ["recommended", "other", "do-not-proceed"] as const;
export type ReviewDecision = (typeof REVIEW_DECISIONS)[number];

export const REVIEW_STATE_LABELS: Record<ReviewState, string> = {
  draft: "Draft",
  submitted: "Submitted for sign-off",
  approved: "Approved",
  returned: "Returned",
};

export const REVIEW_DECISION_LABELS: Record<ReviewDecision, string> = {
  recommended: "Fit the recommended option",
  other: "Fit another option",
  "do-not-proceed": "Do not proceed",
};

/** One move of a crossing's review, from the page form or the API (`POST /api/v1/crossings/{id}/review`). */
export const reviewMoveSchema = z.object({
  action: z.enum(REVIEW_ACTIONS, { error: "Choose submit, approve, return or reopen." }),
  comment: z.string().trim().max(4000, "Keep the comment under 4,000 characters.").optional().default(""),
  decision: z.enum(REVIEW_DECISIONS, { error: "Choose recommended, other or do-not-proceed." }).optional(),
  optionId: z.coerce.number().int().positive("Choose an option.").optional(),
});
export type ReviewMove = z.infer<typeof reviewMoveSchema>;

/** The review object of the API and the page. */
export interface ReviewJson {
  state: ReviewState;
  stale: boolean;
  staleReasons: string[];
  decision: ReviewDecision | null;
  approvedBy: string | null;
  approvedAt: string | null;
  submittedBy: string | null;
  studyId: number | null;
  optionId: number | null;
  history: { from: ReviewState; to: ReviewState; action: string; by: string; at: string; comment: string; decision: ReviewDecision | null; optionId: number | null }[];
}
