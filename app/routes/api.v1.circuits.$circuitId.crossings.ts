import type { Route } from "./+types/api.v1.circuits.$circuitId.crossings";
import { requireApiUser } from "~/utils/auth.server";
import { apiResponse, idParam, methodNotAllowed, readJson } from "~/utils/api.server";
import { createCrossing, crossingJson, listCrossings } from "~/services/circuits.server";
import { crossingSchema } from "../../shared/circuit-schemas";

export const loader = ({ request, params, context }: Route.LoaderArgs) =>
  apiResponse(async () => {
    const user = await requireApiUser(context);
    const crossings = await listCrossings(user.organisationId, idParam(params.circuitId, "Circuit"));
    return Response.json({ crossings: crossings.map(crossingJson) });
  });

export const action = ({ request, params, context }: Route.ActionArgs) =>
  apiResponse(async () => {
    if (request.method !== "POST") return methodNotAllowed(["GET", "POST"]);
    const user = await requireApiUser(context, "engineer");
    const circuitId = idParam(params.circuitId, "Circuit");
    const crossing = await createCrossing(user, circuitId, await readJson(request, crossingSchema));
    return Response.json(crossingJson(crossing), { status: 201, headers: { Location: `/api/v1/crossings/${crossing.id}` } });
  });
