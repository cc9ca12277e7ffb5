import type { Route } from "./+types/api.v1.crossings.$crossingId.details";
import { requireApiScope } from "~/utils/auth.server";
import { apiResponse, idParam, methodNotAllowed, readJson } from "~/utils/api.server";
import { crossingDetailsJson, getCircuit, getCrossing } from "~/services/circuits.server";
import { markingPlan, updateCrossingDetails } from "~/services/crossing-marking.server";
import { crossingDetailsSchema } from "../../shared/crossing-details-schemas";
import type { Crossing } from "../../db/models";

async function detailsAnswer(organisationId: number, crossing: Crossing): Promise<Response> {
  const circuit = await getCircuit(organisationId, crossing.circuitId);
  const { plan, litSuitability } = await markingPlan(crossing, circuit);
  return Response.json({ crossingId: crossing.id, details: crossingDetailsJson(crossing), plan, litSuitability });
}

/** Span and marking details, with the marker layout and the wires' suitability for lit markers they give. */
export const loader = ({ params, context }: Route.LoaderArgs) =>
  apiResponse(async () => {
    const user = await requireApiScope(context, "circuits:read");
    return detailsAnswer(user.organisationId, await getCrossing(user.organisationId, idParam(params.crossingId, "Crossing")));
  });

export const action = ({ request, params, context }: Route.ActionArgs) =>
  apiResponse(async () => {
    if (request.method !== "PUT") return methodNotAllowed(["GET", "PUT"]);
    const user = await requireApiScope(context, "circuits:write", "engineer", "consultant");
    const id = idParam(params.crossingId, "Crossing");
    const crossing = await updateCrossingDetails(user, id, await readJson(request, crossingDetailsSchema));
    return detailsAnswer(user.organisationId, crossing);
  });
