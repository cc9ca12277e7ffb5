import type { Route } from "./+types/api.v1.crossings.$crossingId.review";
import { requireApiUser } from "~/utils/auth.server";
import { apiResponse, idParam, methodNotAllowed, readJson } from "~/utils/api.server";
import { getCrossing } from "~/services/circuits.server";
import { moveReview, reviewOf } from "~/services/reviews.server";
import { reviewMoveSchema } from "../../shared/review-schemas";

export const loader = ({ params, context }: Route.LoaderArgs) =>
  apiResponse(async () => {
    const user = await requireApiUser(context);
    const crossing = await getCrossing(user.organisationId, idParam(params.crossingId, "Crossing"));
    return Response.json({ review: await reviewOf(user.organisationId, crossing) });
  });

// Roles are checked by the review service, so a refusal says who may do what.
export const action = ({ request, params, context }: Route.ActionArgs) =>
  apiResponse(async () => {
    const user = await requireApiUser(context);
    if (request.method !== "POST") return methodNotAllowed(["GET", "POST"]);
    const id = idParam(params.crossingId, "Crossing");
    return Response.json({ review: await moveReview(user, id, await readJson(request, reviewMoveSchema)) });
  });
