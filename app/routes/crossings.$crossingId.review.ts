// The crossing page's review panel posts here (useFetcher); the API calls the same service.
import { data } from "react-router";
import type { Route } from "./+types/crossings.$crossingId.review";
import { requireUser } from "~/utils/auth.server";
import { orNotFound, pageId } from "~/utils/forms.server";
import { moveReview } from "~/services/reviews.server";
import { ReviewMoveError } from "~/services/errors.server";
import { reviewMoveSchema } from "../../shared/review-schemas";

// Only the review panel's POST lands here.
export async function loader() {
  throw new Response("Use the review panel on the crossing page.", { status: 405, headers: { Allow: "POST" } });
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const user = await requireUser(context);
  const form = Object.fromEntries(await request.formData());
  const parsed = reviewMoveSchema.safeParse({ ...form, optionId: form.optionId || undefined, decision: form.decision || undefined });
  if (!parsed.success) {
    const errors: Record<string, string> = {};
    for (const issue of parsed.error.issues) errors[String(issue.path[0] ?? "form")] ??= issue.message;
    return data({ ok: false as const, errors }, { status: 400 });
  }
  try {
    const review = await orNotFound(moveReview(user, pageId(params.crossingId), parsed.data));
    return { ok: true as const, state: review.state, errors: {} as Record<string, string> };
  } catch (error) {
    if (error instanceof ReviewMoveError) return data({ ok: false as const, errors: { [error.path]: error.message } }, { status: error.status });
    throw error;
  }
}
