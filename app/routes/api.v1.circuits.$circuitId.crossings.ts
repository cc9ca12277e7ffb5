import type { Route } from "./+types/api.v1.circuits.$circuitId.crossings";
import { requireApiScope } from "~/utils/auth.server";
import { apiResponse, created, idParam, methodNotAllowed, readJson } from "~/utils/api.server";
import { pageOf, pageRequest } from "~/utils/pagination.server";
import { createCrossing, crossingJson, listCrossings } from "~/services/circuits.server";
import { withIdempotency } from "~/services/idempotency.server";
import { crossingSchema } from "../../shared/circuit-schemas";

export const loader = ({ request, params, context }: Route.LoaderArgs) =>
  apiResponse(async () => {
    const user = await requireApiScope(context, "circuits:read");
    const page = pageRequest(request);
    const { items, next } = pageOf(await listCrossings(user.organisationId, idParam(params.circuitId, "Circuit")), page);
    return Response.json({ crossings: items.map(crossingJson), next });
  });

export const action = ({ request, params, context }: Route.ActionArgs) =>
  apiResponse(async () => {
    if (request.method !== "POST") return methodNotAllowed(["GET", "POST"]);
    const user = await requireApiScope(context, "circuits:write", "engineer");
    const circuitId = idParam(params.circuitId, "Circuit");
    return withIdempotency(request, user.organisationId, async ({ request, save }) => {
      const input = await readJson(request, crossingSchema);
      return save(async (transaction) => {
        const crossing = await createCrossing(user, circuitId, input, transaction);
        return created(crossingJson(crossing), `/api/v1/crossings/${crossing.id}`);
      });
    });
  });
