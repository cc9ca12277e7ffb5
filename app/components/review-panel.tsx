import { useFetcher } from "react-router";
import { REVIEW_DECISION_LABELS, REVIEW_STATE_LABELS, type ReviewAction, type ReviewJson } from "../../shared/review-schemas";
import { formatUtc } from "../../shared/format";
import { ReportLinks } from "./report-links";

const ACTION_LABELS: Record<ReviewAction, string> = {
  submit: "Submit for sign-off",
  approve: "Approve",
  return: "Return for rework",
  reopen: "Reopen to draft",
};
const COMMENT_LABEL: Record<string, string> = {
  draft: "Note for the manager",
  submitted: "Comment",
  approved: "Reason for reopening",
  returned: "Comment (optional)",
};
const STATE_STYLE: Record<string, string> = {
  draft: "border-night-600 text-night-200",
  submitted: "border-amber-glow/60 text-amber-glow",
  approved: "border-verdict-go/60 text-verdict-go",
  returned: "border-verdict-nogo/60 text-verdict-nogo",
};

interface Props {
  crossingId: number;
  review: ReviewJson;
  moves: ReviewAction[];
  options: { id: number; name: string }[];
  recommended: string | null;
  whoMay: string;
}

/** Review and sign-off of a crossing: state, stale warning, the moves this person may make, history. */
export function ReviewPanel({ crossingId, review, moves, options, recommended, whoMay }: Props) {
  const fetcher = useFetcher<{ ok: boolean; errors: Record<string, string> }>();
  const errors = fetcher.data && !fetcher.data.ok ? fetcher.data.errors : {};
  const busy = fetcher.state !== "idle";
  const optionName = (id: number | null) => options.find((o) => o.id === id)?.name ?? (id != null ? `option #${id}` : null);
  return (
    <section className="card flex flex-col gap-4" aria-labelledby="review-heading" data-testid="review-panel">
      <div className="flex flex-wrap items-center gap-3">
        <h2 id="review-heading">Review and sign-off</h2>
        <span data-testid="review-state" className={`rounded-full border px-2.5 py-0.5 text-sm font-semibold ${STATE_STYLE[review.state]}`}>
          {REVIEW_STATE_LABELS[review.state]}
          {review.stale ? " · stale" : ""}
        </span>
      </div>
      {review.state === "approved" && (
        <p className="text-sm text-night-200">
          {review.decision ? REVIEW_DECISION_LABELS[review.decision] : ""}
          {review.decision !== "do-not-proceed" && optionName(review.optionId) ? `: ${optionName(review.optionId)}` : ""} — approved by {review.approvedBy}
          {review.approvedAt ? ` on ${formatUtc(review.approvedAt)}` : ""}, on study #{review.studyId}.
        </p>
      )}
      {review.state === "approved" && review.studyId != null && (
        <div className="flex flex-wrap gap-2" data-testid="approved-report">
          <ReportLinks studyId={review.studyId} />
        </div>
      )}
      {review.stale && (
        <div role="alert" data-testid="review-stale" className="rounded-md border border-verdict-marginal/60 px-3 py-2 text-sm text-verdict-marginal">
          This approval is out of date: {review.staleReasons.join("; ")}. Reopen it and submit again.
        </div>
      )}
      {moves.length > 0 ? (
        <fetcher.Form method="post" action={`/crossings/${crossingId}/review`} className="flex max-w-xl flex-col gap-3" noValidate>
          {errors.form && (
            <p role="alert" className="field-error">
              {errors.form}
            </p>
          )}
          {moves.includes("approve") && (
            <fieldset className="flex flex-col gap-1">
              <legend className="mb-1 text-sm">Decision</legend>
              <label className="flex items-center gap-2 text-sm">
                <input type="radio" name="decision" value="recommended" defaultChecked={!!recommended} disabled={!recommended} />
                {REVIEW_DECISION_LABELS.recommended}
                {recommended ? ` (${recommended})` : " — none is recommended"}
              </label>
              <label className="flex items-center gap-2 text-sm">
                <input type="radio" name="decision" value="other" />
                {REVIEW_DECISION_LABELS.other}:
                <select name="optionId" aria-label="Option to fit" className="rounded border border-night-600 bg-night-950 px-2 py-1" defaultValue="">
                  <option value="">choose…</option>
                  {options.map((o) => (
                    <option key={o.id} value={o.id}>
                      {o.name}
                    </option>
                  ))}
                </select>
              </label>
              <label className="flex items-center gap-2 text-sm">
                <input type="radio" name="decision" value="do-not-proceed" defaultChecked={!recommended} />
                {REVIEW_DECISION_LABELS["do-not-proceed"]}
              </label>
              {(errors.decision || errors.optionId) && (
                <span role="alert" className="field-error">
                  {errors.decision ?? errors.optionId}
                </span>
              )}
            </fieldset>
          )}
          <div className="flex flex-col gap-1">
            <label htmlFor="review-comment">{COMMENT_LABEL[review.state]}</label>
            <textarea id="review-comment" name="comment" rows={3} className="rounded border border-night-600 bg-night-950 px-2 py-1" aria-describedby={errors.comment ? "review-comment-error" : undefined} />
            {errors.comment && (
              <span id="review-comment-error" role="alert" className="field-error">
                {errors.comment}
              </span>
            )}
          </div>
          <div className="flex flex-wrap gap-2">
            {moves.map((m) => (
              <button key={m} type="submit" name="action" value={m} className={m === "return" || m === "reopen" ? "btn-quiet" : "btn"} disabled={busy}>
                {ACTION_LABELS[m]}
              </button>
            ))}
          </div>
        </fetcher.Form>
      ) : (
        <p className="text-sm text-night-400">{whoMay}</p>
      )}
      {review.history.length > 0 && (
        <table className="w-full text-left text-sm" data-testid="review-history">
          <caption className="sr-only">Review history</caption>
          <thead className="text-night-400">
            <tr>
              <th className="py-1 pr-3 font-normal">When</th>
              <th className="py-1 pr-3 font-normal">Who</th>
              <th className="py-1 pr-3 font-normal">Move</th>
              <th className="py-1 pr-3 font-normal">Decision</th>
              <th className="py-1 font-normal">Comment</th>
            </tr>
          </thead>
          <tbody>
            {[...review.history].reverse().map((h, i) => (
              <tr key={i} className="border-t border-night-800 align-top">
                <td className="figure py-1 pr-3 whitespace-nowrap">{formatUtc(h.at)}</td>
                <td className="py-1 pr-3">{h.by}</td>
                <td className="py-1 pr-3 whitespace-nowrap">{h.action === "stale" ? "went stale" : `${h.from} → ${h.to}`}</td>
                <td className="py-1 pr-3">
                  {h.decision ? REVIEW_DECISION_LABELS[h.decision] : ""}
                  {h.decision === "other" || h.decision === "recommended" ? (optionName(h.optionId) ? `: ${optionName(h.optionId)}` : "") : ""}
                </td>
                <td className="py-1 whitespace-pre-wrap">{h.comment}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </section>
  );
}
