import type { Route } from "./+types/api.v1.circuits.$circuitId";
import { requireApiScope } from "~/utils/auth.server";
import { apiResponse, idParam, methodNotAllowed, readJson } from "~/utils/api.server";
import { circuitJson, crossingJson, deleteCircuit, getCircuit, listCrossings, updateCircuit } from "~/services/circuits.server";
import { circuitSchema } from "../../shared/circuit-schemas";

export const loader = ({ params, context }: Route.LoaderArgs) =>
  apiResponse(async () => {
    const user = await requireApiScope(context, "circuits:read");
    const id = idParam(params.circuitId, "Circuit");
    const circuit = await getCircuit(user.organisationId, id);
    const crossings = await listCrossings(user.organisationId, id);
    return Response.json({ ...circuitJson(circuit), crossings: crossings.map(crossingJson) });
  });

export const action = ({ request, params, context }: Route.ActionArgs) =>
  apiResponse(async () => {
    if (request.method !== "PUT" && request.method !== "DELETE") return methodNotAllowed(["GET", "PUT", "DELETE"]);
    const user = await requireApiScope(context, "circuits:write", "engineer");
    const id = idParam(params.circuitId, "Circuit");
    if (request.method === "PUT") return Response.json(circuitJson(await updateCircuit(user, id, await readJson(request, circuitSchema))));
    await deleteCircuit(user, id);
    return new Response(null, { status: 204 });
  });
