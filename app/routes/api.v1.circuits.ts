import type { Route } from "./+types/api.v1.circuits";
import { requireApiScope } from "~/utils/auth.server";
import { apiResponse, created, methodNotAllowed, readJson } from "~/utils/api.server";
import { pageOf, pageRequest } from "~/utils/pagination.server";
import { circuitJson, createCircuit, listCircuits } from "~/services/circuits.server";
import { withIdempotency } from "~/services/idempotency.server";
import { circuitSchema } from "../../shared/circuit-schemas";

export const loader = ({ request, context }: Route.LoaderArgs) =>
  apiResponse(async () => {
    const user = await requireApiScope(context, "circuits:read");
    const { items, next } = pageOf(await listCircuits(user.organisationId), pageRequest(request));
    return Response.json({ circuits: items, next });
  });

export const action = ({ request, context }: Route.ActionArgs) =>
  apiResponse(async () => {
    if (request.method !== "POST") return methodNotAllowed(["GET", "POST"]);
    const user = await requireApiScope(context, "circuits:write", "engineer");
    return withIdempotency(request, user.organisationId, async ({ request, save }) => {
      const input = await readJson(request, circuitSchema);
      return save(async (transaction) => {
        const circuit = await createCircuit(user, input, transaction);
        return created(circuitJson(circuit), `/api/v1/circuits/${circuit.id}`);
      });
    });
  });
