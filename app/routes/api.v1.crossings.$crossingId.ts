import type { Route } from "./+types/api.v1.crossings.$crossingId";
import { requireApiScope } from "~/utils/auth.server";
import { apiResponse, idParam, methodNotAllowed, readJson } from "~/utils/api.server";
import { crossingJson, deleteCrossing, getCrossing, updateCrossing } from "~/services/circuits.server";
import { reviewOf } from "~/services/reviews.server";
import { crossingSchema } from "../../shared/circuit-schemas";

export const loader = ({ request, params, context }: Route.LoaderArgs) =>
  apiResponse(async () => {
    const user = await requireApiScope(context, "circuits:read");
    const crossing = await getCrossing(user.organisationId, idParam(params.crossingId, "Crossing"));
    return Response.json({ ...crossingJson(crossing), review: await reviewOf(user.organisationId, crossing) });
  });

export const action = ({ request, params, context }: Route.ActionArgs) =>
  apiResponse(async () => {
    if (request.method !== "PUT" && request.method !== "DELETE") return methodNotAllowed(["GET", "PUT", "DELETE"]);
    const user = await requireApiScope(context, "circuits:write", "engineer");
    const id = idParam(params.crossingId, "Crossing");
    if (request.method === "PUT") return Response.json(crossingJson(await updateCrossing(user, id, await readJson(request, crossingSchema))));
    await deleteCrossing(user, id);
    return new Response(null, { status: 204 });
  });
