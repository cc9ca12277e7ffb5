import type { Route } from "./+types/api.v1.crossings.$crossingId";
import { requireApiUser } from "~/utils/auth.server";
import { apiResponse, idParam, methodNotAllowed, readJson } from "~/utils/api.server";
import { crossingJson, deleteCrossing, getCrossing, updateCrossing } from "~/services/circuits.server";
import { crossingSchema } from "../../shared/circuit-schemas";

export const loader = ({ request, params, context }: Route.LoaderArgs) =>
  apiResponse(async () => {
    const user = await requireApiUser(context);
    return Response.json(crossingJson(await getCrossing(user.organisationId, idParam(params.crossingId, "Crossing"))));
  });

export const action = ({ request, params, context }: Route.ActionArgs) =>
  apiResponse(async () => {
    const user = await requireApiUser(context, "engineer");
    const id = idParam(params.crossingId, "Crossing");
    if (request.method === "PUT") return Response.json(crossingJson(await updateCrossing(user, id, await readJson(request, crossingSchema))));
    if (request.method === "DELETE") {
      await deleteCrossing(user, id);
      return new Response(null, { status: 204 });
    }
    return methodNotAllowed(["GET", "PUT", "DELETE"]);
  });
