import type { Route } from "./+types/api.v1.crossings.$crossingId.review";
import { requireApiScope } from "~/utils/auth.server";
import { withIdempotentWork } from "~/services/idempotency.server";
import { apiResponse, idParam, methodNotAllowed, readJson } from "~/utils/api.server";
import { getCrossing } from "~/services/circuits.server";
import { moveReview, reviewOf } from "~/services/reviews.server";
import { reviewMoveSchema } from "../../shared/review-schemas";

export const loader = ({ params, context }: Route.LoaderArgs) =>
  apiResponse(async () => {
    const user = await requireApiScope(context, "circuits:read");
    const crossing = await getCrossing(user.organisationId, idParam(params.crossingId, "Crossing"));
    return Response.json({ review: await reviewOf(user.organisationId, crossing) });
  });

// Roles are checked by the review service, so a refusal says who may do what.
export const action = ({ request, params, context }: Route.ActionArgs) =>
  apiResponse(async () => {
    if (request.method !== "POST") return methodNotAllowed(["GET", "POST"]);
    const user = await requireApiScope(context, "reviews:write");
    const id = idParam(params.crossingId, "Crossing");
    return withIdempotentWork(
      request,
      user.organisationId,
      (request) => readJson(request, reviewMoveSchema),
      async (move) => Response.json({ review: await moveReview(user, id, move) }),
    );
  });
