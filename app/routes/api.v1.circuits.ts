import type { Route } from "./+types/api.v1.circuits";
import { requireApiUser } from "~/utils/auth.server";
import { apiResponse, methodNotAllowed, readJson } from "~/utils/api.server";
import { circuitJson, createCircuit, listCircuits } from "~/services/circuits.server";
import { circuitSchema } from "../../shared/circuit-schemas";

export const loader = ({ request, context }: Route.LoaderArgs) =>
  apiResponse(async () => {
    const user = await requireApiUser(context);
    return Response.json({ circuits: await listCircuits(user.organisationId) });
  });

export const action = ({ request, context }: Route.ActionArgs) =>
  apiResponse(async () => {
    if (request.method !== "POST") return methodNotAllowed(["GET", "POST"]);
    const user = await requireApiUser(context, "engineer");
    const input = await readJson(request, circuitSchema);
    const circuit = await createCircuit(user, input);
    return Response.json(circuitJson(circuit), { status: 201, headers: { Location: `/api/v1/circuits/${circuit.id}` } });
  });
